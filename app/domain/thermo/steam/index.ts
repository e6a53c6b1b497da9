// Water and steam (IAPWS-IF97 regions 1-5) and Rankine cycles. Public entry point.
// Units at this API are SI (Pa, K, J/kg, J/(kg K), m^3/kg); see properties.ts.
export * from './errors.ts'
export * from './properties.ts'
export * from './rankine.ts'
export * from './rankine-template.ts'
export * from './plant.ts'
export * from './calorimeter.ts'
export * from './steam-cycle.ts'
