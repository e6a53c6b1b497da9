/**
 * R-717 (ammonia). Equation of state: R. Tillner-Roth, F. Harms-Watzenberg and H. D. Baehr,
 * "Eine neue Fundamentalgleichung für Ammoniak", DKV-Tagungsbericht 20 (1993) 167–181.
 * This is the equation CoolProp used as its ammonia equation up to version 6.x and still
 * carries as the second EOS in dev/fluids/Ammonia.json (coefficients transcribed from there);
 * newer CoolProp files list first Gao, Park, Lemmon et al., J. Phys. Chem. Ref. Data 49
 * (2020) 023102 (Gao et al. 2020), which is NOT implemented here (see docs/refrigerants.md).
 */
import type { FluidData } from '../model.ts'

const M = 0.01703026
const d = [2, 1, 4, 1, 15, 3, 3, 1, 8, 2, 1, 8, 1, 2, 3, 2, 4, 3, 1, 2, 4]
const l = [0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 2, 2, 3, 3, 3, 3]
const n = [
  0.04554431, 0.7238548, 0.0122947, -1.858814, 2.141882e-11, -0.0143002, 0.3441324, -0.2873571, 2.352589e-5,
  -0.03497111, 0.02397852, 0.001831117, -0.04085375, 0.2379275, -0.03548972, -0.1823729, 0.02281556, -0.006663444,
  -0.008847486, 0.002272635, -0.0005588655,
]
const t = [-0.5, 0.5, 1, 1.5, 3, 0, 3, 4, 4, 5, 3, 5, 6, 8, 8, 10, 10, 5, 7.5, 15, 30]
const rhor = 13211.77715431239

export const R717: FluidData = {
  id: 'R717',
  name: 'R-717 (ammonia)',
  source: 'R. Tillner-Roth, F. Harms-Watzenberg and H. D. Baehr, DKV-Tagungsbericht 20 (1993) 167',
  referenceState:
    'IIR: h = 200 kJ/kg, s = 1 kJ/(kg K) for saturated liquid at 0 °C (as in the SI refrigerant tables of the ASHRAE Handbook — from memory)',
  ref: { T: 273.15, h: 200e3, s: 1000 },
  eos: {
    R: 8.314471,
    M,
    Tr: 405.4,
    rhor,
    ideal: {
      a1: -15.81502,
      a2: 4.255726,
      logTau: -1,
      power: [
        { n: 11.47434, t: 1 / 3 },
        { n: -1.296211, t: -1.5 },
        { n: 0.5706757, t: -1.75 },
      ],
      planck: [],
    },
    power: n.map((ni, i) => ({ n: ni, d: d[i]!, t: t[i]!, l: l[i]! })),
    gauss: [],
    nonAnalytic: [],
  },
  Tc: 405.4,
  pc: 11.333e6,
  rhoc: rhor * M,
  Ttriple: 195.495,
  Tmin: 195.495,
  Tmax: 700,
  pmax: 1000e6,
  rhoL: {
    kind: 'linear',
    Ta: 405.4,
    r: rhor,
    tauR: false,
    n: [
      0.6217530323464998, 116.65648581323893, -116.06575843470785, 2.722640286484237, -2.6080795358675433,
      18.393705416728867,
    ],
    t: [0.217, 0.713, 0.724, 1.557, 3.994, 9.339],
  },
  rhoV: {
    kind: 'exp',
    Ta: 405.4,
    r: rhor,
    tauR: true,
    n: [
      1.2911157089516188, -1.4201786958021996, -145.4871281248165, 140.71212306607288, -3.147462914747211,
      -0.9907144617787934,
    ],
    t: [0.037, 0.04, 0.584, 0.585, 2.858, 6.099],
  },
  pSat: {
    kind: 'exp',
    Ta: 405.4,
    r: 11333000,
    tauR: true,
    n: [
      0.0016131703802769548, 0.01339903644956835, -6.4517151211338994, -4.349105787320862, 1.8295554336003688,
      7.011533373126273,
    ],
    t: [0.108, 0.435, 0.971, 4.023, 4.944, 17.494],
  },
}
