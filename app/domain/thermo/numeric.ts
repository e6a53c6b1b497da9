/**
 * Root finding for the places where a property has no closed-form inverse (T from h, u or s°
 * of a NASA polynomial gas). Brent's method: bisection's guarantee with inverse quadratic /
 * secant speed, after R. P. Brent, "Algorithms for Minimization without Derivatives" (1973),
 * ch. 4 (the classic zeroin). Always stays inside the bracket, so a bad guess cannot throw it
 * off into a temperature range where the polynomials mean nothing.
 */

export class NoBracketError extends Error {
  constructor(message: string) {
    super(message)
    this.name = 'NoBracketError'
  }
}

/**
 * Find x in [a, b] with f(x) = 0. f(a) and f(b) must differ in sign (or one be 0), else
 * returns NaN (callers turn that into a result-union error). Converges to |Δx| ≤ xtol.
 */
export function brent(f: (x: number) => number, a: number, b: number, xtol = 1e-12, maxIter = 200): number {
  let fa = f(a)
  let fb = f(b)
  if (fa === 0) return a
  if (fb === 0) return b
  if (!(fa * fb < 0)) return NaN
  let c = a
  let fc = fa
  let d = b - a
  let e = d
  for (let i = 0; i < maxIter; i++) {
    if (fb * fc > 0) {
      c = a
      fc = fa
      d = b - a
      e = d
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b
      b = c
      c = a
      fa = fb
      fb = fc
      fc = fa
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 0.5 * xtol
    const m = 0.5 * (c - b)
    if (Math.abs(m) <= tol || fb === 0) return b
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      // Try interpolation: secant when only two points, inverse quadratic otherwise.
      const s = fb / fa
      let p: number
      let q: number
      if (a === c) {
        p = 2 * m * s
        q = 1 - s
      } else {
        const qa = fa / fc
        const r = fb / fc
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1))
        q = (qa - 1) * (r - 1) * (s - 1)
      }
      if (p > 0) q = -q
      else p = -p
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d
        d = p / q
      } else {
        d = m
        e = m
      }
    } else {
      d = m
      e = m
    }
    a = b
    fa = fb
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol
    fb = f(b)
  }
  return b
}

/**
 * Solve g(x) = target for an increasing function g on [lo, hi] (the NASA property ranges).
 * Returns NaN when the target lies outside g's range on that interval.
 */
export function solveIncreasing(
  g: (x: number) => number,
  target: number,
  lo: number,
  hi: number,
  xtol = 1e-10,
): number {
  return brent((x) => g(x) - target, lo, hi, xtol)
}
