import type { FluidErrorCode, FluidResult } from './types.ts'
export const ok = <T>(value: T): FluidResult<T> => ({ ok: true, value })
export const fail = <T>(code: FluidErrorCode, message: string): FluidResult<T> => ({
  ok: false,
  error: { code, message },
})
