// Errors of the steam module.
//
// Every public function of the steam module that can meet bad input returns a result union
// `SteamResult<T>` ({ ok: true, value } | { ok: false, error }). The few fast numeric entry
// points (hsFromPT, enthalpyFromPT, entropyFromPT) throw `SteamRangeError` instead, which
// carries the same `SteamError` record in `.detail`. Nothing is ever extrapolated.

export type SteamErrorCode =
  /** A state outside IAPWS-IF97's range (regions 1-5): the message names the bound. */
  | 'out-of-range'
  /** A non-finite or otherwise meaningless input (NaN, x outside [0, 1], ...). */
  | 'invalid-input'
  /** qualityFrom*: the state at that pressure is not inside the two-phase dome. */
  | 'not-two-phase'
  /** An internal iteration did not converge (not expected inside the range; please report). */
  | 'no-convergence'

export interface SteamBound {
  /** Which limit, e.g. 'p <= 100 MPa', 'T >= 273.15 K'. */
  name: string
  /** The limit's value in the unit given. */
  value: number
  unit: string
}

export interface SteamError {
  code: SteamErrorCode
  message: string
  /** The input property concerned: 'p', 'T', 'h', 's', 'x'. */
  property?: string
  bound?: SteamBound
  /** A short description of the requested state, e.g. 'p = 1.2e8 Pa, T = 500 K'. */
  state?: string
}

export type SteamResult<T> = { ok: true; value: T } | { ok: false; error: SteamError }

/** Thrown only by the fast numeric entry points; `.detail` is the SteamError. */
export class SteamRangeError extends Error {
  readonly detail: SteamError
  constructor(detail: SteamError) {
    super(detail.message)
    this.name = 'SteamRangeError'
    this.detail = detail
  }
}

export function fail<T>(error: SteamError): SteamResult<T> {
  return { ok: false, error }
}

export function ok<T>(value: T): SteamResult<T> {
  return { ok: true, value }
}
