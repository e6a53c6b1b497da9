/**
 * Physical constants and the reference state of the thermo package.
 */

/**
 * Molar gas constant R = N_A·k = 8.314462618… J/(mol·K). Since the 2019 redefinition of the
 * SI, N_A and k are exact, so R is exact too (CODATA 2018 gives 8.314 462 618… and the
 * digits here are the conventional truncation).
 */
export const R_MOLAR = 8.314462618

/** Reference temperature for h and s (the usual thermochemical 298.15 K). */
export const T_REF = 298.15

/** Standard pressure p° = 1 bar, as in the NIST-JANAF tables (4th ed., 1998) and NASA TM-4513. */
export const P_REF = 1e5
