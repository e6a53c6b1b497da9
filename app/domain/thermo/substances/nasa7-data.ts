/**
 * NASA 7-coefficient polynomials (cp/R = a1 + a2 T + a3 T² + a4 T³ + a5 T⁴;
 * h/(R T) = a1 + a2 T/2 + a3 T²/3 + a4 T³/4 + a5 T⁴/5 + a6/T;
 * s°/R = a1 ln T + a2 T + a3 T²/2 + a4 T³/3 + a5 T⁴/4 + a7), two ranges split at 1000 K.
 *
 * SOURCE (all five species, transcribed digit for digit): Cantera's data file
 * `data/nasa_gas.yaml` (Cantera/cantera on GitHub, commit 0b950018976eb74733986daf6bb7052691ebe3a9),
 * which converts the NASA Glenn database of
 *   B. J. McBride, S. Gordon, M. A. Reno, "Coefficients for Calculating Thermodynamic and
 *   Transport Properties of Individual Species", NASA TM-4513, October 1993,
 * and S. Gordon, B. J. McBride, NASA SP-273 (1971). Standard-state pressure 1 bar.
 * Checked against NIST-JANAF (4th ed., 1998) table values in nasa7.test.ts.
 *
 * Molar masses from the IUPAC standard atomic weights (H 1.00794, C 12.0107, N 14.0067,
 * O 15.9994, Ar 39.948; from memory).
 */

export interface Nasa7Species {
  readonly id: string
  readonly formula: string
  readonly name: string
  /** kg/mol */
  readonly molarMass: number
  readonly Tmin: number
  readonly Tmid: number
  readonly Tmax: number
  /** Coefficients a1…a7 for Tmin ≤ T ≤ Tmid. */
  readonly low: readonly [number, number, number, number, number, number, number]
  /** Coefficients a1…a7 for Tmid ≤ T ≤ Tmax. */
  readonly high: readonly [number, number, number, number, number, number, number]
  readonly source: string
}

const TM4513 = 'NASA TM-4513 (McBride, Gordon & Reno 1993) via Cantera data/nasa_gas.yaml'

export const NASA7_SPECIES = {
  N2: {
    id: 'N2',
    formula: 'N2',
    name: 'nitrogen',
    molarMass: 0.0280134,
    Tmin: 200,
    Tmid: 1000,
    Tmax: 6000,
    low: [3.53100528, -1.23660987e-4, -5.02999437e-7, 2.43530612e-9, -1.40881235e-12, -1046.97628, 2.96747468],
    high: [2.95257626, 1.39690057e-3, -4.92631691e-7, 7.86010367e-11, -4.60755321e-15, -923.948645, 5.87189252],
    source: TM4513,
  },
  O2: {
    id: 'O2',
    formula: 'O2',
    name: 'oxygen',
    molarMass: 0.0319988,
    Tmin: 200,
    Tmid: 1000,
    Tmax: 6000,
    low: [3.78245636, -2.99673415e-3, 9.847302e-6, -9.68129508e-9, 3.24372836e-12, -1063.94356, 3.65767573],
    high: [3.66096083, 6.56365523e-4, -1.41149485e-7, 2.05797658e-11, -1.29913248e-15, -1215.97725, 3.41536184],
    source: TM4513,
  },
  Ar: {
    id: 'Ar',
    formula: 'Ar',
    name: 'argon',
    molarMass: 0.039948,
    Tmin: 200,
    Tmid: 1000,
    Tmax: 6000,
    low: [2.5, 0, 0, 0, 0, -745.375, 4.37967491],
    high: [2.5, 0, 0, 0, 0, -745.375, 4.37967491],
    source: TM4513,
  },
  CO2: {
    id: 'CO2',
    formula: 'CO2',
    name: 'carbon dioxide',
    molarMass: 0.0440095,
    Tmin: 200,
    Tmid: 1000,
    Tmax: 6000,
    low: [2.35677352, 8.98459677e-3, -7.12356269e-6, 2.45919022e-9, -1.43699548e-13, -48371.9697, 9.90105222],
    high: [4.63659493, 2.74131991e-3, -9.95828531e-7, 1.60373011e-10, -9.16103468e-15, -49024.9341, -1.93534855],
    source: TM4513,
  },
  H2O: {
    id: 'H2O',
    formula: 'H2O',
    name: 'water vapour (ideal gas)',
    molarMass: 0.01801528,
    Tmin: 200,
    Tmid: 1000,
    Tmax: 6000,
    low: [4.19864056, -2.0364341e-3, 6.52040211e-6, -5.48797062e-9, 1.77197817e-12, -30293.7267, -0.849032208],
    high: [2.67703787, 2.97318329e-3, -7.7376969e-7, 9.44336689e-11, -4.26900959e-15, -29885.8938, 6.88255571],
    source: TM4513,
  },
} as const satisfies Record<string, Nasa7Species>

export type Nasa7SpeciesId = keyof typeof NASA7_SPECIES

/**
 * Dry air as an ideal mixture, mole fractions N2 0.7808, O2 0.2095, Ar 0.0093, CO2 0.0004.
 * Source: the U.S. Standard Atmosphere 1976 composition table (N2 0.78084, O2 0.209476,
 * Ar 0.00934), rounded to four decimals, with CO2 raised from its 1976 value (0.000314) to
 * the present ≈ 400 ppm; from memory. The fractions sum to exactly 1.
 */
export const DRY_AIR_COMPOSITION: Readonly<Record<'N2' | 'O2' | 'Ar' | 'CO2', number>> = {
  N2: 0.7808,
  O2: 0.2095,
  Ar: 0.0093,
  CO2: 0.0004,
}
