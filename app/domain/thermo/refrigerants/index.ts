// Refrigerant properties from published Helmholtz-energy equations of state. Public entry point.
// Teaching tool: these numbers are for teaching, not design data.
import { buildRefrigerant } from './flash.ts'
import { R134A } from './fluids/r134a.ts'
import { R1234YF } from './fluids/r1234yf.ts'
import { R717 } from './fluids/r717.ts'
import { R744 } from './fluids/r744.ts'
import type { Refrigerant, RefrigerantId } from './types.ts'

export type * from './types.ts'

export const REFRIGERANT_IDS: readonly RefrigerantId[] = ['R134a', 'R1234yf', 'R717', 'R744']

export const REFRIGERANTS: Record<RefrigerantId, Refrigerant> = {
  R134a: buildRefrigerant(R134A),
  R1234yf: buildRefrigerant(R1234YF),
  R717: buildRefrigerant(R717),
  R744: buildRefrigerant(R744),
}

export function getRefrigerant(id: RefrigerantId): Refrigerant {
  return REFRIGERANTS[id]
}
