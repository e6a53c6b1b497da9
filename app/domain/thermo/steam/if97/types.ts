// Property record of the IF97 core (release units: MPa, K, kJ/kg, kJ/(kg K), m^3/kg, m/s).

export interface If97Props {
  /** Region of IAPWS-IF97 whose basic equation produced the values. */
  region: 1 | 2 | 3 | 5
  /** Pressure, MPa. */
  p: number
  /** Temperature, K. */
  T: number
  /** Specific volume, m^3/kg. */
  v: number
  /** Density, kg/m^3. */
  rho: number
  /** Specific enthalpy, kJ/kg. */
  h: number
  /** Specific internal energy, kJ/kg. */
  u: number
  /** Specific entropy, kJ/(kg K). */
  s: number
  /** Specific isobaric heat capacity, kJ/(kg K). */
  cp: number
  /** Specific isochoric heat capacity, kJ/(kg K). */
  cv: number
  /** Speed of sound, m/s. */
  w: number
}
