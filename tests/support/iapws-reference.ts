// Independent reference for water/steam properties: Debian's python3-iapws package (module
// iapws, class IAPWS97), called through Debian's own /usr/bin/python3 (another python3 on PATH
// may not see Debian's dist-packages).
//
// One Python process per batch: the points go to the child's stdin as one JSON list and the
// results come back on stdout as one JSON list (never one process per point).
//
// Units at this helper's API are SI, like app/domain/thermo/steam: p in Pa, T in K, h and u in
// J/kg, s, cp, cv in J/(kg K), v in m^3/kg, w in m/s. (The helper converts to iapws's MPa and
// kJ/kg.)
//
// Missing reference: referenceAvailable() reports it and every query throws an Error whose
// message is exactly REFERENCE_MISSING_MESSAGE, so a test that relies on the reference fails
// with that message; it never skips silently.
import { spawnSync } from 'node:child_process'
import { existsSync } from 'node:fs'

export const PYTHON = '/usr/bin/python3'
export const REFERENCE_MISSING_MESSAGE = 'python3-iapws is not installed: apt-get install -y python3-iapws'

export type RefQuery =
  | { kind: 'PT'; p: number; T: number }
  | { kind: 'Px'; p: number; x: number }
  | { kind: 'Tx'; T: number; x: number }
  | { kind: 'Ph'; p: number; h: number }
  | { kind: 'Ps'; p: number; s: number }
  /** Saturated liquid (x = 0) or vapour (x = 1) in region 3 (623.15 K < T < 647.096 K):
   *  iapws's region-3 equation solved for rho at p = p_s(T) by Newton from iapws's own
   *  backward-equation estimate, exactly as iapws does for (P, T) input in region 3 (its
   *  own saturated-state routine above 623.15 K uses the backward equation without
   *  iteration, which is not accurate to 1e-7). */
  | { kind: 'sat3'; T: number; x: 0 | 1 }
  | { kind: 'psat'; T: number }
  | { kind: 'tsat'; p: number }

export interface RefState {
  ok: true
  region: number | null
  p: number
  T: number
  v: number
  h: number
  u: number
  s: number
  cp: number | null
  cv: number | null
  w: number | null
  x: number | null
}
export interface RefValue {
  ok: true
  value: number
}
export interface RefFailure {
  ok: false
  error: string
}
export type RefResult = RefState | RefValue | RefFailure

const SCRIPT = String.raw`
import json, sys, math
try:
    from iapws import IAPWS97
    from iapws.iapws97 import _PSat_T, _TSat_P, _Region3, _Backward3_sat_v_P
    from scipy.optimize import newton
except Exception as e:
    print(json.dumps({"missing": str(e)})); sys.exit(0)

def num(v):
    if v is None: return None
    try:
        f = float(v)
    except Exception:
        return None
    return f if math.isfinite(f) else None

def get(st, name, scale=1.0):
    v = num(getattr(st, name, None))
    return None if v is None else v * scale

def state(st):
    return {"ok": True, "region": getattr(st, "region", None), "p": get(st, "P", 1e6), "T": get(st, "T"),
            "v": get(st, "v"), "h": get(st, "h", 1e3), "u": get(st, "u", 1e3), "s": get(st, "s", 1e3),
            "cp": get(st, "cp", 1e3), "cv": get(st, "cv", 1e3), "w": get(st, "w"), "x": get(st, "x")}

def sat3(T, x):
    P = _PSat_T(T)
    rho = newton(lambda r: _Region3(r, T)["P"] - P, 1 / _Backward3_sat_v_P(P, T, x), tol=1e-12, maxiter=200)
    r = _Region3(rho, T)
    return {"ok": True, "region": 3, "p": P * 1e6, "T": T, "v": r["v"], "h": r["h"] * 1e3,
            "u": (r["h"] - P * 1e3 * r["v"]) * 1e3, "s": r["s"] * 1e3, "cp": r["cp"] * 1e3,
            "cv": r["cv"] * 1e3, "w": r["w"], "x": float(x)}

def one(q):
    k = q["kind"]
    if k == "PT": return state(IAPWS97(P=q["p"] / 1e6, T=q["T"]))
    if k == "Px": return state(IAPWS97(P=q["p"] / 1e6, x=q["x"]))
    if k == "Tx": return state(IAPWS97(T=q["T"], x=q["x"]))
    if k == "Ph": return state(IAPWS97(P=q["p"] / 1e6, h=q["h"] / 1e3))
    if k == "Ps": return state(IAPWS97(P=q["p"] / 1e6, s=q["s"] / 1e3))
    if k == "sat3": return sat3(q["T"], q["x"])
    if k == "psat": return {"ok": True, "value": _PSat_T(q["T"]) * 1e6}
    if k == "tsat": return {"ok": True, "value": _TSat_P(q["p"] / 1e6)}
    return {"ok": False, "error": "unknown kind " + str(k)}

out = []
for q in json.load(sys.stdin):
    try:
        out.append(one(q))
    except Exception as e:
        out.append({"ok": False, "error": type(e).__name__ + ": " + str(e)})
print(json.dumps({"results": out}))
`

/** True when /usr/bin/python3 exists and can import iapws. */
export function referenceAvailable(python: string = PYTHON): boolean {
  if (!existsSync(python)) return false
  const r = spawnSync(python, ['-c', 'import iapws, scipy'], { encoding: 'utf8' })
  return r.status === 0
}

/**
 * Evaluate a batch of queries in ONE Python process. Throws REFERENCE_MISSING_MESSAGE if absent.
 * `python` is only for testing this helper's failure path.
 */
export function referenceBatch(queries: readonly RefQuery[], python: string = PYTHON): RefResult[] {
  if (!existsSync(python)) throw new Error(`${REFERENCE_MISSING_MESSAGE} (${python} not found)`)
  const r = spawnSync(python, ['-c', SCRIPT], {
    input: JSON.stringify(queries),
    encoding: 'utf8',
    maxBuffer: 256 * 1024 * 1024,
  })
  if (r.error) throw new Error(`${REFERENCE_MISSING_MESSAGE} (${r.error.message})`)
  if (r.status !== 0) throw new Error(`iapws reference process failed (exit ${r.status}): ${r.stderr}`)
  const parsed = JSON.parse(r.stdout) as { missing?: string; results?: RefResult[] }
  if (parsed.missing !== undefined) throw new Error(`${REFERENCE_MISSING_MESSAGE} (${parsed.missing})`)
  const results = parsed.results ?? []
  if (results.length !== queries.length) throw new Error('iapws reference returned a wrong number of results')
  return results
}

/** Like referenceBatch, but every result must be a state; throws with the query otherwise. */
export function referenceStates(queries: readonly RefQuery[]): RefState[] {
  return referenceBatch(queries).map((r, i) => {
    if (!r.ok || !('h' in r))
      throw new Error(`iapws reference failed for ${JSON.stringify(queries[i])}: ${JSON.stringify(r)}`)
    return r
  })
}
