/**
 * R-134a (1,1,1,2-tetrafluoroethane). Equation of state: R. Tillner-Roth and H. D. Baehr,
 * "An International Standard Formulation for the Thermodynamic Properties of
 * 1,1,1,2-Tetrafluoroethane (HFC-134a) for Temperatures from 170 K to 455 K and Pressures
 * up to 70 MPa", J. Phys. Chem. Ref. Data 23 (1994) 657–729. Coefficients transcribed from
 * the published equation (as tabulated in the CoolProp fluid file dev/fluids/R134a.json).
 * Reducing values: T = 374.18 K, ρ = 508 kg/m³ (not the critical point). Ancillary starting
 * guesses: fitted equations from the same fluid file (used only as Newton starting points).
 */
import type { FluidData } from '../model.ts'

const d = [2, 1, 3, 6, 6, 1, 1, 2, 5, 2, 2, 4, 1, 4, 1, 2, 4, 1, 5, 3, 10]
const l = [0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 2, 2, 2, 2, 2, 2, 3, 3, 3, 4]
const n = [
  0.05586817, 0.498223, 0.02458698, 0.0008570145, 0.0004788584, -1.800808, 0.2671641, -0.04781652, 0.01423987,
  0.3324062, -0.007485907, 0.0001017263, -0.5184567, -0.08692288, 0.2057144, -0.005000457, 0.0004603262, -0.003497836,
  0.006995038, -0.01452184, -0.0001285458,
]
const t = [-0.5, 0, 0, 0, 1.5, 1.5, 2, 2, 1, 3, 5, 1, 5, 5, 6, 10, 10, 10, 18, 22, 50]

const M = 0.102032

export const R134A: FluidData = {
  id: 'R134a',
  name: 'R-134a (1,1,1,2-tetrafluoroethane)',
  source: 'R. Tillner-Roth and H. D. Baehr, J. Phys. Chem. Ref. Data 23 (1994) 657',
  referenceState: 'IIR: h = 200 kJ/kg, s = 1 kJ/(kg K) for saturated liquid at 0 °C',
  ref: { T: 273.15, h: 200e3, s: 1000 },
  eos: {
    R: 8.314471,
    M,
    Tr: 374.18,
    rhor: 4978.830171,
    ideal: {
      a1: -1.019535,
      a2: 9.047135,
      logTau: -1.629789,
      power: [
        { n: -9.723916, t: -0.5 },
        { n: -3.92717, t: -0.75 },
      ],
      planck: [],
    },
    power: n.map((ni, i) => ({ n: ni, d: d[i]!, t: t[i]!, l: l[i]! })),
    gauss: [],
    nonAnalytic: [],
  },
  Tc: 374.21,
  pc: 4.05928e6,
  rhoc: 5017.053 * M,
  Ttriple: 169.85,
  Tmin: 169.85,
  Tmax: 455,
  pmax: 70e6,
  rhoL: {
    kind: 'linear',
    Ta: 374.21,
    r: 5017.053,
    tauR: false,
    n: [
      18.772731940930015, -51.49939472178225, 40.793536440596085, -1481.6500471538966, 1600.534434298925,
      -67338.52423732559,
    ],
    t: [0.673, 0.994, 1.257, 5.783, 5.943, 19.94],
  },
  rhoV: {
    kind: 'exp',
    Ta: 374.21,
    r: 5017.053,
    tauR: true,
    n: [-5.147386240766544, 5.34618043286371, -7.611015272838434, -28.85436432788653, -9.079306067130748, 64.0],
    t: [0.476, 0.966, 1.321, 8.491, 13.463, 13.463],
  },
  pSat: {
    kind: 'exp',
    Ta: 374.21,
    r: 4059280,
    tauR: true,
    n: [
      0.4331478287291047, -9.090302559074352, 2.1476074125217703, -1.557687007603464, -3.5020328972698604,
      14.958442337201044,
    ],
    t: [0.845, 0.99, 1.14, 2.651, 4.507, 17.235],
  },
}
