// IAPWS-IF97 reference constants and range limits.
// Source: IAPWS R7-97(2012), Section 3 (reference constants, Eqs. (1)-(3)) and Section 2 /
// Figure 1 (range of validity and region boundaries).
//
// Units inside if97/: pressure MPa, temperature K, density kg/m^3, specific volume m^3/kg,
// energies kJ/kg, entropy and heat capacities kJ/(kg K), speed of sound m/s.

/** Specific gas constant of ordinary water, kJ/(kg K), Eq. (1). */
export const R = 0.461526
/** Critical temperature, K, Eq. (2). */
export const TC = 647.096
/** Critical pressure, MPa, Eq. (3). */
export const PC = 22.064
/** Critical density, kg/m^3, Eq. (4). */
export const RHOC = 322

/** Lowest temperature of the formulation, K (273.15 K). */
export const T_MIN = 273.15
/** Highest temperature of regions 1-3 (and the lower bound of region 5), K. */
export const T_MAX = 1073.15
/** Highest temperature of region 5 (and of the formulation), K. */
export const T_MAX5 = 2273.15
/** Highest pressure of region 5 (1073.15 K < T <= 2273.15 K), MPa. */
export const P_MAX5 = 50
/** Highest pressure of the formulation, MPa. */
export const P_MAX = 100
/** Boundary temperature between regions 1 and 3 (and 2 and 3 at its low end), K. */
export const T_13 = 623.15
/** Temperature at which the B23 line reaches 100 MPa, K. */
export const T_B23_MAX = 863.15
