/**
 * R-1234yf (2,3,3,3-tetrafluoroprop-1-ene). Equation of state: M. Richter, M. O. McLinden
 * and E. W. Lemmon, "Thermodynamic Properties of 2,3,3,3-Tetrafluoroprop-1-ene (R1234yf):
 * Vapor Pressure and p-ρ-T Measurements and an Equation of State", J. Chem. Eng. Data 56
 * (2011) 3254–3264. Coefficients as tabulated in CoolProp's dev/fluids/R1234yf.json.
 */
import type { FluidData } from '../model.ts'

const M = 0.1140415928
const pw = {
  n: [
    0.04592563, 1.546958, -2.355237, -0.4827835, 0.1758022, -1.210006, -0.6177084, 0.6805262, -0.6968555, -0.02695779,
  ],
  d: [4, 1, 1, 2, 3, 1, 3, 2, 2, 7],
  t: [1, 0.32, 0.929, 0.94, 0.38, 2.28, 1.76, 0.97, 2.44, 1.05],
  l: [0, 0, 0, 0, 0, 2, 2, 1, 2, 1],
}
const g = {
  n: [1.389966, -0.4777136, -0.1975184, -1.147646, 0.0003428541],
  d: [1, 1, 3, 3, 2],
  t: [1.4, 3, 3.5, 1, 3.5],
  eta: [1.02, 1.336, 1.055, 5.84, 16.2],
  epsilon: [0.712, 0.91, 0.677, 0.718, 1.64],
  beta: [1.42, 2.31, 0.89, 80, 108],
  gamma: [1.13, 0.67, 0.46, 1.28, 1.2],
}

export const R1234YF: FluidData = {
  id: 'R1234yf',
  name: 'R-1234yf (2,3,3,3-tetrafluoropropene)',
  source: 'M. Richter, M. O. McLinden and E. W. Lemmon, J. Chem. Eng. Data 56 (2011) 3254',
  referenceState: 'IIR: h = 200 kJ/kg, s = 1 kJ/(kg K) for saturated liquid at 0 °C',
  ref: { T: 273.15, h: 200e3, s: 1000 },
  eos: {
    R: 8.314472,
    M,
    Tr: 367.85,
    rhor: 4170,
    ideal: {
      a1: -12.837928,
      a2: 8.042605,
      logTau: 4.944,
      power: [],
      planck: [
        { n: 7.549, t: 1.951882560826424 },
        { n: 1.537, t: 2.384123963572108 },
        { n: 2.03, t: 12.13809976892755 },
        { n: 7.455, t: 4.770966426532554 },
      ],
    },
    power: pw.n.map((n, i) => ({ n, d: pw.d[i]!, t: pw.t[i]!, l: pw.l[i]! })),
    gauss: g.n.map((n, i) => ({
      n,
      d: g.d[i]!,
      t: g.t[i]!,
      eta: g.eta[i]!,
      epsilon: g.epsilon[i]!,
      beta: g.beta[i]!,
      gamma: g.gamma[i]!,
    })),
    nonAnalytic: [],
  },
  Tc: 367.85,
  pc: 3.3822e6,
  rhoc: 4170 * M,
  Ttriple: 220,
  Tmin: 220,
  Tmax: 410,
  pmax: 30e6,
  rhoL: {
    kind: 'linear',
    Ta: 367.85,
    r: 4170,
    tauR: false,
    n: [
      2.321825326575359, -3.520638555089873, 20.18646332917161, -160.37050775728997, 147.68109685289284,
      -63578.64918999199,
    ],
    t: [0.365, 1.247, 1.765, 2.484, 2.593, 16.586],
  },
  rhoV: {
    kind: 'exp',
    Ta: 367.85,
    r: 4170,
    tauR: true,
    n: [
      -3.24158284550283, 2.612924555839616, -26.216566273272992, 115.70400813769207, -101.3078910128961,
      9.031472717572315,
    ],
    t: [0.398, 0.952, 1.466, 2.053, 2.242, 4.989],
  },
  pSat: {
    kind: 'exp',
    Ta: 367.85,
    r: 3382200,
    tauR: true,
    n: [
      -6.127206406335995, -0.9044431324757645, 2.0918728211333275, -3.396385591501546, -1.9071219386505223,
      -47.15549606822473,
    ],
    t: [0.978, 1.128, 1.875, 2.579, 5.3, 12.869],
  },
}
