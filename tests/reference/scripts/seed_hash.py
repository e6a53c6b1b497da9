#!/usr/bin/env python3
"""An independent implementation of the variant seed recipe (app/domain/authoring/seed.ts),
written from the published constants, not from the TypeScript:

- FNV-1a, 32 bit: offset basis 0x811C9DC5, prime 0x01000193 (Fowler, Noll, Vo; the FNV
  reference at isthe.com/chongo/tech/comp/fnv, from memory);
- then murmur3's 32-bit finaliser fmix32: h ^= h >> 16; h *= 0x85EBCA6B; h ^= h >> 13;
  h *= 0xC2B2AE35; h ^= h >> 16 (Appleby, MurmurHash3.cpp, from memory);
- over the UTF-8 bytes of "len:part|len:part|…", where a number part is written as its
  decimal text and len is the part's length in UTF-16 code units (JavaScript's length).

Reads a JSON array of part lists on stdin, writes a JSON array of seeds on stdout. This is
the script that produced the values pinned in app/domain/authoring/seed.test.ts.
"""
import json
import sys

MASK = 0xFFFFFFFF


def js_length(s: str) -> int:
    return len(s.encode("utf-16-le")) // 2


def part_text(p) -> str:
    if isinstance(p, bool):
        raise ValueError("booleans are not parts")
    if isinstance(p, int):
        return str(p)
    if isinstance(p, float):
        return str(int(p)) if p.is_integer() else repr(p)
    return p


def canonical(parts) -> str:
    return "|".join(f"{js_length(t)}:{t}" for t in (part_text(p) for p in parts))


def fmix32(h: int) -> int:
    h &= MASK
    h ^= h >> 16
    h = (h * 0x85EBCA6B) & MASK
    h ^= h >> 13
    h = (h * 0xC2B2AE35) & MASK
    h ^= h >> 16
    return h


def seed_from(parts) -> int:
    h = 0x811C9DC5
    for b in canonical(parts).encode("utf-8"):
        h ^= b
        h = (h * 0x01000193) & MASK
    return fmix32(h)


if __name__ == "__main__":
    print(json.dumps([seed_from(parts) for parts in json.load(sys.stdin)]))
