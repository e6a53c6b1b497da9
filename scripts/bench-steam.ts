// npm run bench:steam
//
// 100,000 (p, T) -> (h, s) evaluations with our IAPWS-IF97 solver (hsFromPT) and the same
// 100,000 points through Debian's python3-iapws (IAPWS97 class, the library's public API) in
// the same run. The Python side is ONE process that times its own loop (time.perf_counter)
// and reports the elapsed time; for a stricter comparison it also times the library's
// low-level region functions (_Region1/_Region2 after _Bound_TP; region 3 points still go
// through the class, which is how the library inverts region 3).
//
// Prints both rates, their ratio and whether the target "at least 50 x faster than the Python
// reference" is met. A benchmark, not a test.
//
// Teaching tool: steam values here are for teaching, not design data; defer to the applicable
// codes and licensed engineering practice.
import { spawnSync } from 'node:child_process'
import { existsSync } from 'node:fs'
import { mulberry32 as prng } from '#app/domain/random.ts'
import { hsFromPT } from '../app/domain/thermo/steam/index.ts'

const N = 100_000
const PYTHON = '/usr/bin/python3'

// Seeded points over the range both libraries accept: 280..1070 K, 0.0007..100 MPa
// (iapws rejects p below 611.2 Pa), and one point in ten in region 5 (1080..2270 K,
// 0.0007..50 MPa). Regions 1, 2, 3 and 5 all occur.
const rnd = prng(20260)
const P = new Float64Array(N) // Pa
const T = new Float64Array(N) // K
for (let i = 0; i < N; i++) {
  const r5 = i % 10 === 9
  T[i] = r5 ? 1080 + 1190 * rnd() : 280 + 790 * rnd()
  P[i] = Math.exp(Math.log(700) + (Math.log(r5 ? 50e6 : 100e6) - Math.log(700)) * rnd())
}

// --- ours ---------------------------------------------------------------------------------
const out = new Float64Array(2)
const H = new Float64Array(N)
const S = new Float64Array(N)
for (let i = 0; i < 20_000; i++) hsFromPT(P[i]!, T[i]!, out) // warm-up (JIT)
const t0 = process.hrtime.bigint()
for (let i = 0; i < N; i++) {
  hsFromPT(P[i]!, T[i]!, out)
  H[i] = out[0]!
  S[i] = out[1]!
}
const oursSeconds = Number(process.hrtime.bigint() - t0) / 1e9
const oursRate = N / oursSeconds

console.log('IAPWS-IF97 (p, T) -> h, s benchmark, %d points (regions 1, 2, 3, 5)', N)
console.log('  ours (TypeScript, hsFromPT):   %s calls/s  (%s s)', oursRate.toExponential(3), oursSeconds.toFixed(3))

// --- python3-iapws ------------------------------------------------------------------------
const SCRIPT = String.raw`
import json, sys, time
from iapws import IAPWS97
from iapws.iapws97 import _Region1, _Region2, _Region5, _Bound_TP
pts = json.load(sys.stdin)
PT = [(p / 1e6, t) for p, t in pts]
t0 = time.perf_counter()
hs = []
for p, t in PT:
    st = IAPWS97(P=p, T=t)
    hs.append((st.h, st.s))
t_class = time.perf_counter() - t0
t0 = time.perf_counter()
for p, t in PT:
    r = _Bound_TP(t, p)
    if r == 1: d = _Region1(t, p)
    elif r == 2: d = _Region2(t, p)
    elif r == 5: d = _Region5(t, p)
    else:
        st = IAPWS97(P=p, T=t); d = {"h": st.h, "s": st.s}
    d["h"]; d["s"]
t_low = time.perf_counter() - t0
print(json.dumps({"class_seconds": t_class, "low_seconds": t_low, "h": [x[0] for x in hs[::97]], "s": [x[1] for x in hs[::97]]}))
`

if (!existsSync(PYTHON)) {
  console.log('  python3-iapws is not installed: apt-get install -y python3-iapws')
  process.exit(1)
}
const pts: [number, number][] = []
for (let i = 0; i < N; i++) pts.push([P[i]!, T[i]!])
console.log('  running the same points through python3-iapws (one process, about 10-20 s) ...')
const r = spawnSync(PYTHON, ['-c', SCRIPT], {
  input: JSON.stringify(pts),
  encoding: 'utf8',
  maxBuffer: 64 * 1024 * 1024,
})
if (r.status !== 0) {
  console.log(`  python3-iapws run failed (is it installed? apt-get install -y python3-iapws):\n${r.stderr}`)
  process.exit(1)
}
const py = JSON.parse(r.stdout) as { class_seconds: number; low_seconds: number; h: number[]; s: number[] }
const classRate = N / py.class_seconds
const lowRate = N / py.low_seconds

// Sanity: the two implementations agree on the sampled points.
let worst = 0
py.h.forEach((h, k) => {
  const i = k * 97
  worst = Math.max(
    worst,
    Math.abs(H[i]! / 1000 - h) / Math.abs(h),
    Math.abs(S[i]! / 1000 - py.s[k]!) / Math.max(Math.abs(py.s[k]!), 1e-3),
  )
})

const ratio = oursRate / classRate
const ratioLow = oursRate / lowRate
console.log(
  '  python3-iapws IAPWS97(P, T):   %s calls/s  (%s s)',
  classRate.toExponential(3),
  py.class_seconds.toFixed(3),
)
console.log('  python3-iapws region functions: %s calls/s  (%s s)', lowRate.toExponential(3), py.low_seconds.toFixed(3))
console.log('  ratio ours / IAPWS97 class:      %s x', ratio.toFixed(1))
console.log('  ratio ours / region functions:   %s x', ratioLow.toFixed(1))
console.log('  max relative difference in h, s on %d sampled points: %s', py.h.length, worst.toExponential(2))
console.log(
  '  target (at least 50 x faster than the Python reference, IAPWS97 class): %s',
  ratio >= 50 ? 'MET' : 'NOT MET',
)
console.log('  stricter target (50 x the low-level region functions): %s', ratioLow >= 50 ? 'MET' : 'NOT MET')
console.log('  Teaching tool: not design data; defer to the applicable codes and licensed engineering practice.')
