/**
 * How a quantity is shown to a student: its typeset symbol (KaTeX) and its plain name. The one
 * place the worked solution (and anything else a student reads) turns a solver output path
 * ('totals.netWork', 'states.3.T', 'steps.2.q') or a given's or find's name ('W_net', 'r_c',
 * 'etaT', 'T3') into something fit to read, so no internal path or raw identifier reaches a
 * student. Paths are read by their own grammar (the solver's output shape, thermo/format.ts),
 * not from a second list of every path: a state's temperature is T with the state's name as
 * subscript, a step's heat is Q or q (by convention) with the two states' names. Pure.
 */
import type { Convention } from '#app/domain/thermo/index.ts'

export interface Quantity {
  /** KaTeX, e.g. W_{\text{net}} */
  readonly tex: string
  /** Plain words, e.g. "net work per unit amount" */
  readonly name: string
}

const GREEK: Readonly<Record<string, string>> = {
  alpha: '\\alpha',
  beta: '\\beta',
  gamma: '\\gamma',
  delta: '\\delta',
  Delta: '\\Delta',
  eps: '\\varepsilon',
  epsilon: '\\varepsilon',
  eta: '\\eta',
  theta: '\\theta',
  kappa: '\\kappa',
  lambda: '\\lambda',
  mu: '\\mu',
  nu: '\\nu',
  pi: '\\pi',
  rho: '\\rho',
  sigma: '\\sigma',
  tau: '\\tau',
  phi: '\\phi',
  omega: '\\omega',
  η: '\\eta',
  γ: '\\gamma',
  ε: '\\varepsilon',
}

/** Short abbreviations written upright rather than as a product of italic letters. */
const UPRIGHT = new Set(['COP', 'MEP', 'bwr', 'cop', 'mep'])

function texText(s: string): string {
  return s.replace(/[\\{}$&#^_%~]/g, (c) => `\\${c === '\\' ? 'backslash ' : c}`)
}

/** A subscript as TeX: digits and single letters italic-free as they are, words in \text. */
function subscriptTex(s: string): string {
  if (/^\d+$/.test(s) || /^[A-Za-z]$/.test(s)) return s
  if (/^[A-Z]{1,3}$/.test(s)) return s
  if (/^[A-Za-z0-9]{1,3}$/.test(s) && /\d/.test(s)) return s
  if (GREEK[s]) return GREEK[s]!
  return `\\text{${texText(s.toLowerCase() === s ? s : s.charAt(0).toLowerCase() + s.slice(1))}}`
}

/**
 * A given's or find's name as a typeset symbol: T3 → T_3, W_net → W_{\text{net}}, r_c → r_c,
 * eta → \eta, etaT → \eta_T, wNet → w_{\text{net}}, qH → q_H, TIT → T_{\text{IT}}, cop → \mathrm{COP},
 * mdot → \dot{m}, Wdot → \dot{W}.
 */
export function symbolTex(name: string): string {
  if (UPRIGHT.has(name)) return `\\mathrm{${name.toUpperCase() === 'BWR' ? 'bwr' : name.toUpperCase()}}`
  if (GREEK[name]) return GREEK[name]!
  const underscore = /^([^_]+)_(.+)$/.exec(name)
  if (underscore) return `${symbolTex(underscore[1]!)}_{${underscore[2]!.split('_').map(subscriptTex).join(',')}}`
  const greek =
    /^(alpha|beta|gamma|delta|Delta|epsilon|eps|eta|theta|kappa|lambda|mu|nu|pi|rho|sigma|tau|phi|omega)([A-Z0-9].*)$/.exec(
      name,
    )
  if (greek) return `${GREEK[greek[1]!]}_{${subscriptTex(greek[2]!)}}`
  if (/^[A-Za-z]$/.test(name)) return name
  // A rate: mdot → \dot{m}, Wdot → \dot{W}, QdotL → \dot{Q}_{L}
  const rate = /^([A-Za-z])dot([A-Z0-9][A-Za-z0-9]*)?$/.exec(name)
  if (rate) return `\\dot{${rate[1]}}${rate[2] ? `_{${subscriptTex(rate[2])}}` : ''}`
  const head = /^([A-Za-z])([A-Z0-9][A-Za-z0-9]*|[a-z]|in|out|net)$/.exec(name)
  // rc → r_c, rp → r_p, qH → q_H, T3 → T_3, wNet → w_net, qin → q_in, TIT → T_IT, pB → p_B
  if (head) return `${head[1]}_{${subscriptTex(head[2]!)}}`
  return `\\mathrm{${texText(name)}}`
}

/** Heat and work symbols of a convention: q, w (chemistry) or Q, W (engineering). */
export function heatWork(convention: Convention): { readonly Q: string; readonly W: string } {
  return convention === 'chemistry' ? { Q: 'q', W: 'w' } : { Q: 'Q', W: 'W' }
}

const sub = (base: string, s: string) => `${base}_{${s}}`
const txt = (s: string) => `\\text{${s}}`

/** Cycle totals by field: symbol and name, per unit amount. */
function totalsQuantity(field: string, convention: Convention): Quantity | null {
  const { Q, W } = heatWork(convention)
  switch (field) {
    case 'netWork':
      return {
        tex: sub(W, txt('net')),
        name:
          convention === 'chemistry'
            ? 'net work done on the gas per unit amount'
            : 'net work done by the gas per unit amount',
      }
    case 'netWorkSigned':
      return { tex: sub(W, txt('net')), name: 'net work per unit amount, in the course convention' }
    case 'heatIn':
      return { tex: sub(Q, txt('in')), name: 'heat added per unit amount' }
    case 'heatOut':
      return { tex: sub(Q, txt('out')), name: 'heat rejected per unit amount' }
    case 'efficiency':
      return { tex: '\\eta', name: 'thermal efficiency' }
    case 'copRefrigerator':
      return { tex: '\\mathrm{COP}_R', name: 'coefficient of performance of the refrigerator' }
    case 'copHeatPump':
      return { tex: '\\mathrm{COP}_{HP}', name: 'coefficient of performance of the heat pump' }
    case 'meanEffectivePressure':
      return { tex: '\\mathrm{MEP}', name: 'mean effective pressure' }
    case 'backWorkRatio':
      return { tex: '\\mathrm{bwr}', name: 'back work ratio' }
    case 'entropyGenerated':
      return { tex: sub('s', txt('gen')), name: 'entropy generated per cycle' }
    // Second law with a dead state (thermo/cycle/second-law.ts).
    case 'exergyDestroyed':
      return { tex: sub('x', txt('dest')), name: 'exergy destroyed per cycle, per unit amount' }
    case 'secondLawEfficiency':
      return { tex: sub('\\eta', txt('II')), name: 'second-law efficiency' }
    case 'exergyEfficiency':
      return { tex: sub('\\eta', txt('ex')), name: 'exergy efficiency' }
    case 'carnotBound':
      return { tex: sub('\\eta', txt('Carnot')), name: 'Carnot bound' }
    case 'Tmax':
      return { tex: sub('T', txt('max')), name: 'highest temperature of the cycle' }
    case 'Tmin':
      return { tex: sub('T', txt('min')), name: 'lowest temperature of the cycle' }
    case 'pumpWork':
      return { tex: sub(W, txt('pump')), name: 'pump work per kg through the boiler' }
    case 'turbineWork':
      return { tex: sub(W, txt('turb')), name: 'turbine work per kg through the boiler' }
    case 'turbineExitQuality':
      return { tex: sub('x', txt('turbine exit')), name: 'quality at the turbine exit' }
    case 'bleedFraction':
      return { tex: 'y', name: 'fraction of the steam bled to the feedwater heater' }
    // Steam plants (rankine-feedwater, rankine-cogeneration): per kg through the boiler.
    case 'processFraction':
      return { tex: sub('y', txt('process')), name: 'fraction of the boiler flow extracted to the process heater' }
    case 'processHeat':
      return { tex: sub(Q, txt('process')), name: 'heat delivered to the process per kg through the boiler' }
    case 'utilisationFactor':
      return { tex: sub('\\varepsilon', 'u'), name: 'utilisation factor (net work and process heat over heat in)' }
    // The throttling calorimeter (steam/calorimeter.ts).
    case 'quality':
      return { tex: 'x_1', name: 'quality of the line steam' }
    case 'enthalpy':
      return { tex: 'h_1', name: 'enthalpy of the line steam (equal to the calorimeter enthalpy)' }
    case 'lineTemperature':
      return { tex: 'T_1', name: 'temperature of the line steam (saturation at the line pressure)' }
    case 'calorimeterSaturationTemperature':
      return { tex: sub('T', txt('sat,2')), name: 'saturation temperature at the calorimeter pressure' }
    case 'superheat':
      return { tex: sub('\\Delta T', txt('sh')), name: 'degree of superheat in the calorimeter' }
    case 'lowestMeasurableQuality':
      return { tex: sub('x', txt('min')), name: 'lowest quality the calorimeter can measure' }
    // The vapour-compression cycle (per kg of refrigerant; sizes, whatever the convention).
    case 'refrigerationEffect':
      return { tex: sub(Q, 'L'), name: 'refrigeration effect per kg of refrigerant (heat taken in by the evaporator)' }
    case 'compressorWork':
      return { tex: sub(W, txt('c,in')), name: 'compressor work input per kg of refrigerant' }
    case 'heatRejected':
      return { tex: sub(Q, 'H'), name: 'heat rejected per kg of refrigerant' }
    case 'carnotCop':
      return { tex: sub('\\mathrm{COP}', txt('Carnot')), name: 'Carnot COP between the two temperatures' }
    case 'throttleQuality':
      return { tex: sub('x', txt('valve exit')), name: 'quality after the throttling valve' }
    case 'massFlow':
      return { tex: '\\dot m', name: 'refrigerant mass flow rate' }
    case 'capacity':
      return { tex: sub('\\dot Q', 'L'), name: 'refrigeration capacity' }
    case 'compressorPower':
      return { tex: sub('\\dot W', txt('c,in')), name: 'compressor power input' }
    case 'heatRejectionRate':
      return { tex: sub('\\dot Q', 'H'), name: 'rate of heat rejection' }
    // Two-stage (flash chamber) and cascade cycles: per kg through the condenser (two-stage) or
    // of the lower cycle's refrigerant (cascade); the works are sizes, done on the refrigerant.
    case 'intermediatePressure':
      return { tex: sub('p', 'i'), name: 'flash chamber (intermediate) pressure' }
    case 'flashVapourFraction':
      return { tex: sub('x', '6'), name: 'fraction of the refrigerant that flashes to vapour in the flash chamber' }
    case 'lowToHighMassRatio':
      return { tex: '1 - x_{6}', name: 'mass flow through the evaporator per kg through the condenser' }
    case 'refrigerationEffectPerKgEvaporator':
      return { tex: sub(Q, txt('L,evap')), name: 'refrigeration effect per kg of refrigerant through the evaporator' }
    case 'lowStageWork':
      return { tex: sub(W, txt('low,in')), name: 'low-stage compressor work input per kg through the condenser' }
    case 'highStageWork':
      return { tex: sub(W, txt('high,in')), name: 'high-stage compressor work input per kg through the condenser' }
    case 'carnotCopRefrigerator':
      return {
        tex: sub('\\mathrm{COP}', txt('R,Carnot')),
        name: 'Carnot COP of a refrigerator between the outer temperatures',
      }
    case 'carnotCopHeatPump':
      return {
        tex: sub('\\mathrm{COP}', txt('HP,Carnot')),
        name: 'Carnot COP of a heat pump between the outer temperatures',
      }
    case 'highStageMassFlow':
      return { tex: sub('\\dot m', txt('high')), name: 'refrigerant mass flow rate through the condenser (high stage)' }
    case 'lowStageMassFlow':
      return { tex: sub('\\dot m', txt('low')), name: 'refrigerant mass flow rate through the evaporator (low stage)' }
    case 'capacityTons':
      return { tex: sub('\\dot Q', 'L'), name: 'refrigeration capacity in tons of refrigeration' }
    case 'lowStagePower':
      return { tex: sub('\\dot W', txt('low,in')), name: 'low-stage compressor power input' }
    case 'highStagePower':
      return { tex: sub('\\dot W', txt('high,in')), name: 'high-stage compressor power input' }
    case 'massFlowRatio':
      return { tex: '\\dot m_A / \\dot m_B', name: 'mass flow of the upper cycle (A) per kg/s of the lower cycle (B)' }
    case 'exchangerTemperatureDifference':
      return { tex: '\\Delta T_{\\text{exch}}', name: 'temperature difference across the cascade heat exchanger' }
    case 'lowerCompressorWork':
      return {
        tex: sub(W, txt('B,in')),
        name: "lower-cycle compressor work input per kg of the lower cycle's refrigerant",
      }
    case 'upperCompressorWork':
      return {
        tex: sub(W, txt('A,in')),
        name: "upper-cycle compressor work input per kg of the lower cycle's refrigerant",
      }
    case 'lowerCycleCop':
      return { tex: sub('\\mathrm{COP}', 'B'), name: 'COP of the lower cycle on its own' }
    case 'upperCycleCop':
      return { tex: sub('\\mathrm{COP}', 'A'), name: 'COP of the upper cycle on its own' }
    case 'lowerMassFlow':
      return { tex: sub('\\dot m', 'B'), name: 'refrigerant mass flow rate in the lower cycle' }
    case 'upperMassFlow':
      return { tex: sub('\\dot m', 'A'), name: 'refrigerant mass flow rate in the upper cycle' }
    case 'lowerCompressorPower':
      return { tex: sub('\\dot W', txt('B,in')), name: 'lower-cycle compressor power input' }
    case 'upperCompressorPower':
      return { tex: sub('\\dot W', txt('A,in')), name: 'upper-cycle compressor power input' }
    default:
      return null
  }
}

const STATE_PROPERTY: Readonly<Record<string, { tex: string; name: string }>> = {
  p: { tex: 'p', name: 'pressure' },
  T: { tex: 'T', name: 'temperature' },
  v: { tex: 'v', name: 'specific volume' },
  V: { tex: 'V', name: 'volume' },
  u: { tex: 'u', name: 'specific internal energy' },
  h: { tex: 'h', name: 'specific enthalpy' },
  s: { tex: 's', name: 'specific entropy' },
  x: { tex: 'x', name: 'quality' },
}

const STEP_PROPERTY: Readonly<Record<string, (c: Convention) => { tex: string; name: string }>> = {
  q: (c) => ({ tex: heatWork(c).Q, name: 'heat' }),
  w: (c) => ({ tex: heatWork(c).W, name: c === 'chemistry' ? 'work done on the gas' : 'work done by the gas' }),
  dU: () => ({ tex: '\\Delta U', name: 'change of internal energy' }),
  dH: () => ({ tex: '\\Delta H', name: 'change of enthalpy' }),
  dS: () => ({ tex: '\\Delta S', name: 'change of entropy' }),
  entropyGenerated: () => ({ tex: '{S_{\\text{gen}}}', name: 'entropy generated' }),
  exergyDestroyed: () => ({ tex: '{X_{\\text{dest}}}', name: 'exergy destroyed' }),
  boundaryTemperature: () => ({ tex: '{T_{\\text{b}}}', name: 'boundary temperature' }),
}

/** Flow cycles with a flow rate: totals.rate.<field>, as rates. */
const RATE_QUANTITY: Readonly<Record<string, Quantity>> = {
  heatIn: { tex: '\\dot Q_{\\text{in}}', name: 'rate of heat added' },
  heatOut: { tex: '\\dot Q_{\\text{out}}', name: 'rate of heat rejected' },
  netPower: { tex: '\\dot W_{\\text{net}}', name: 'net power' },
  entropyGenerated: { tex: '\\dot S_{\\text{gen}}', name: 'rate of entropy generation' },
  exergyDestroyed: { tex: '\\dot X_{\\text{dest}}', name: 'rate of exergy destruction' },
}

/** With a flow rate: steps.<k>.rate.<field>, as rates; `ij` is the step's subscript. */
const STEP_RATE: Readonly<Record<string, { tex: (ij: string) => string; name: string }>> = {
  heat: { tex: (ij) => `\\dot Q_{${ij}}`, name: 'rate of heat into the gas' },
  work: { tex: (ij) => `\\dot W_{${ij}}`, name: 'power' },
  entropyGenerated: { tex: (ij) => `\\dot S_{\\text{gen},${ij}}`, name: 'rate of entropy generation' },
  exergyDestroyed: { tex: (ij) => `\\dot X_{\\text{dest},${ij}}`, name: 'rate of exergy destruction' },
}

export interface PathContext {
  readonly convention: Convention
  /** A steam (Rankine) cycle: its net work is the work delivered, per kg through the boiler. */
  readonly steam?: boolean
  /** Names of the states in order ('1', '2', … or 'A', 'B', …), for subscripts. */
  readonly stateNames?: readonly string[]
  /** Names of the devices in order ('compressor', 'condenser', …) of a steam or refrigeration cycle. */
  readonly deviceNames?: readonly string[]
  /** A steady-flow template (thermo/flow): its totals and states are read by flowQuantity. */
  readonly flow?: 'nozzle' | 'diffuser' | 'turbojet'
  /** The combined gas–steam cycle: totals per kg of gas, gasStates, and the bottoming cycle's paths. */
  readonly combined?: boolean
  /** What a general cycle's working fluid is called in words when it is not a gas ('water'). */
  readonly fluid?: string
}

// ---- The combined gas–steam cycle ---------------------------------------------------

/** Totals of the combined cycle, per kg of gas (sizes, whatever the convention). */
function combinedTotal(field: string, convention: Convention): Quantity | null {
  const { Q, W } = heatWork(convention)
  const table: Readonly<Record<string, Quantity>> = {
    steamPerGas: { tex: 'y', name: 'steam raised per kg of gas' },
    compressorWork: { tex: sub(W, txt('c,in')), name: 'compressor work input per kg of gas' },
    gasTurbineWork: { tex: sub(W, txt('gt,out')), name: 'gas-turbine work output per kg of gas' },
    heatIn: { tex: sub(Q, txt('in')), name: 'heat added in the combustor per kg of gas' },
    gasNetWork: { tex: sub(W, txt('gas,net')), name: 'net work of the gas turbine per kg of gas' },
    steamNetWork: { tex: sub(W, txt('steam,net')), name: 'net work of the steam cycle per kg of gas' },
    netWork: { tex: sub(W, txt('net,out')), name: 'net work of the plant per kg of gas' },
    netWorkSigned: { tex: sub(W, txt('net')), name: 'net work per kg of gas, in the course convention' },
    hrsgHeat: { tex: sub(Q, txt('HRSG')), name: 'heat the exhaust gives the steam, per kg of gas' },
    stackLoss: { tex: sub(Q, txt('stack')), name: 'heat lost with the stack gas, per kg of gas' },
    condenserHeat: { tex: sub(Q, txt('cond')), name: 'heat rejected in the condenser, per kg of gas' },
    efficiency: { tex: '\\eta', name: 'thermal efficiency of the combined cycle' },
    gasEfficiency: { tex: sub('\\eta', txt('gas')), name: 'thermal efficiency of the gas turbine alone' },
    steamEfficiency: { tex: sub('\\eta', txt('steam')), name: 'thermal efficiency of the steam cycle alone' },
    stackTemperature: { tex: 'T_5', name: 'stack temperature' },
    pinchDifference: { tex: sub('\\Delta T', txt('pinch')), name: 'pinch-point temperature difference' },
    hotEndDifference: { tex: sub('\\Delta T', txt('hot end')), name: 'temperature difference at the HRSG hot end' },
    coldEndDifference: { tex: sub('\\Delta T', txt('cold end')), name: 'temperature difference at the HRSG cold end' },
    power: { tex: sub('\\dot W', txt('net')), name: 'net power of the plant' },
  }
  return Object.hasOwn(table, field) ? table[field]! : null
}

function combinedQuantity(parts: readonly string[], ctx: PathContext): Quantity | null {
  if (parts[0] === 'totals' && parts.length === 2) return combinedTotal(parts[1]!, ctx.convention)
  if (parts[0] === 'gasStates' && parts.length === 3) {
    const k = Number(parts[1])
    const prop = STATE_PROPERTY[parts[2]!]
    if (!Number.isInteger(k) || k < 1 || k > 5 || !prop) return null
    return { tex: sub(prop.tex, String(k)), name: `${prop.name} of the gas at state ${k}` }
  }
  if (parts[0] === 'bottoming' && (parts[1] === 'states' || parts[1] === 'totals')) {
    const q = quantityAtPath(parts.slice(1).join('.'), { convention: ctx.convention, steam: true })
    if (!q) return null
    const tex = parts[1] === 'states' ? q.tex.replace(/_\{([^}]*)\}$/, '_{$1,\\text{steam}}') : q.tex
    return { tex, name: `${q.name.replace(/ per kg through the boiler$/, '')} (steam cycle, per kg of steam)` }
  }
  return null
}

// ---- Steady flow (nozzle, diffuser, turbojet) ----------------------------------------

const FLOW_STATE_PROPERTY: Readonly<Record<string, { tex: (n: string) => string; name: string }>> = {
  p: { tex: (n) => sub('p', n), name: 'pressure' },
  T: { tex: (n) => sub('T', n), name: 'temperature' },
  V: { tex: (n) => sub('V', n), name: 'velocity' },
  mach: { tex: (n) => sub('M', n), name: 'Mach number' },
  soundSpeed: { tex: (n) => sub('a', n), name: 'speed of sound' },
  h: { tex: (n) => sub('h', n), name: 'specific enthalpy' },
  s: { tex: (n) => sub('s', n), name: 'specific entropy' },
  density: { tex: (n) => sub('\\rho', n), name: 'density' },
  T0: { tex: (n) => sub('T', `0${n}`), name: 'stagnation temperature' },
  p0: { tex: (n) => sub('p', `0${n}`), name: 'stagnation pressure' },
}

const JET_DEVICE: readonly { tex: string; name: string }[] = [
  { tex: 'd', name: 'diffuser' },
  { tex: 'c', name: 'compressor' },
  { tex: 'b', name: 'burner' },
  { tex: 't', name: 'turbine' },
  { tex: 'n', name: 'nozzle' },
]

/** A nozzle's, diffuser's or turbojet's output path; null for one this grammar does not know. */
function flowQuantity(path: string, ctx: PathContext & { flow: NonNullable<PathContext['flow']> }): Quantity | null {
  const parts = path.split('.')
  const { Q, W } = heatWork(ctx.convention)
  const jet = ctx.flow === 'turbojet'
  const exit = jet ? '6' : '2'
  if (parts[0] === 'states' && parts.length === 3) {
    const k = Number(parts[1])
    const prop = FLOW_STATE_PROPERTY[parts[2]!]
    if (!Number.isInteger(k) || k < 1 || !prop) return null
    return { tex: prop.tex(stateSub(ctx.stateNames, k)), name: `${prop.name} at state ${ctx.stateNames?.[k - 1] ?? k}` }
  }
  if (parts[0] === 'devices' && parts.length === 3) {
    const k = Number(parts[1])
    const d = jet ? JET_DEVICE[k - 1] : k === 1 ? { tex: txt(ctx.flow), name: ctx.flow } : undefined
    if (!Number.isInteger(k) || !d) return null
    const by = ctx.convention === 'chemistry' ? 'done on' : 'done by'
    switch (parts[2]) {
      case 'w':
        return { tex: sub(W, d.tex), name: `work ${by} the gas in the ${d.name}, per kg` }
      case 'q':
        return { tex: sub(Q, d.tex), name: `heat into the gas in the ${d.name}, per kg` }
      case 'wRate':
        return { tex: sub(`\\dot ${W}`, d.tex), name: `power ${by} the gas in the ${d.name}` }
      case 'qRate':
        return { tex: sub(`\\dot ${Q}`, d.tex), name: `rate of heat into the gas in the ${d.name}` }
      default:
        return null
    }
  }
  if (parts[0] !== 'totals' || parts.length !== 2) return null
  const eff = ctx.flow === 'nozzle' ? 'N' : 'D'
  const T: Readonly<Record<string, Quantity>> = {
    exitVelocity: { tex: sub('V', exit), name: jet ? 'jet velocity at the nozzle exit' : 'exit velocity' },
    exitTemperature: { tex: sub('T', exit), name: 'exit temperature' },
    exitPressure: { tex: sub('p', exit), name: 'exit pressure' },
    inletMach: { tex: sub('M', '1'), name: 'inlet Mach number' },
    exitMach: { tex: sub('M', exit), name: jet ? 'Mach number of the jet' : 'exit Mach number' },
    flightMach: { tex: sub('M', '1'), name: 'flight Mach number' },
    efficiency: {
      tex: sub('\\eta', eff),
      name: `isentropic efficiency of the ${ctx.flow}`,
    },
    kineticEnergyChange: { tex: '\\Delta ke', name: 'change of kinetic energy per kg, (V_2² − V_1²)/2' },
    kineticEnergyGain: { tex: '\\Delta ke', name: 'kinetic energy gained per kg of air, (V_6² − V_1²)/2' },
    enthalpyChange: { tex: '\\Delta h', name: 'change of enthalpy per kg' },
    heatIn: jet
      ? { tex: sub(Q, txt('in')), name: 'heat added in the burner per kg of air' }
      : { tex: Q, name: 'heat into the gas per kg (negative: lost to the surroundings)' },
    heatRate: jet
      ? { tex: sub(`\\dot ${Q}`, txt('in')), name: 'rate of heat added in the burner' }
      : { tex: `\\dot ${Q}`, name: 'rate of heat into the gas (negative: lost)' },
    entropyChange: { tex: '\\Delta s', name: 'change of specific entropy' },
    stagnationTemperature: { tex: sub('T', '01'), name: 'stagnation temperature at the inlet' },
    stagnationPressure: { tex: sub('p', '01'), name: 'stagnation pressure at the inlet' },
    exitStagnationPressure: { tex: sub('p', '02'), name: 'stagnation pressure at the exit' },
    stagnationPressureRatio: { tex: 'p_{02}/p_{01}', name: 'ratio of exit to inlet stagnation pressure' },
    isentropicExitTemperature: { tex: sub('T', '2s'), name: 'isentropic exit temperature at the exit pressure' },
    criticalPressure: { tex: 'p^*', name: 'critical (sonic) pressure' },
    criticalPressureRatio: { tex: 'p^*/p_{01}', name: 'critical pressure ratio' },
    criticalTemperature: { tex: 'T^*', name: 'critical (sonic) temperature' },
    backPressure: { tex: sub('p', 'b'), name: 'back pressure' },
    areaRatio: { tex: 'A_2/A_1', name: 'ratio of exit to inlet area' },
    massFlow: { tex: '\\dot m', name: jet ? 'air mass flow rate' : 'mass flow rate' },
    inletArea: { tex: sub('A', '1'), name: 'inlet area' },
    exitArea: { tex: sub('A', '2'), name: 'exit area' },
    kineticEnergyRate: { tex: '\\Delta \\dot{KE}', name: 'rate of kinetic energy change' },
    specificThrust: { tex: 'F/\\dot m', name: 'specific thrust (thrust per kg/s of air)' },
    thrust: { tex: 'F', name: 'thrust' },
    propulsivePower: { tex: sub('\\dot W', 'P'), name: 'propulsive power' },
    compressorPower: { tex: sub('\\dot W', txt('c,in')), name: 'compressor power input' },
    compressorWork: { tex: sub(W, txt('c,in')), name: 'compressor work input per kg of air' },
    turbineWork: { tex: sub(W, txt('t,out')), name: 'turbine work output per kg of air' },
    netShaftWork: {
      tex: sub(W, txt('shaft')),
      name: 'net shaft work per kg of air (zero: the turbine drives the compressor)',
    },
    propulsiveWork: { tex: sub('w', 'P'), name: 'propulsive work per kg of air' },
    propulsiveEfficiency: { tex: sub('\\eta', 'P'), name: 'propulsive efficiency' },
    thermalEfficiency: { tex: sub('\\eta', txt('th')), name: 'thermal efficiency' },
    overallEfficiency: { tex: sub('\\eta', 'o'), name: 'overall efficiency' },
    fuelAirRatio: { tex: 'f', name: 'fuel–air ratio' },
    fuelFlow: { tex: sub('\\dot m', 'f'), name: 'fuel flow rate' },
    tsfc: { tex: '\\mathrm{TSFC}', name: 'thrust-specific fuel consumption' },
  }
  return Object.hasOwn(T, parts[1]!) ? T[parts[1]!]! : null
}

function stateSub(names: readonly string[] | undefined, index: number): string {
  const name = names?.[index - 1] ?? String(index)
  return /^[A-Za-z0-9]{1,3}$/.test(name) ? name : txt(texText(name))
}

/** A steam plant's feedwater heater fields (heaters.N.<field>, 1-based N), per kg through the boiler. */
const HEATER_QUANTITY: Readonly<Record<string, (n: string) => Quantity>> = {
  bleedFraction: (n) => ({ tex: sub('y', n), name: `fraction of the boiler flow bled to feedwater heater ${n}` }),
  pressure: (n) => ({ tex: sub('p', txt(`FWH${n}`)), name: `pressure of feedwater heater ${n}` }),
  bleedTemperature: (n) => ({
    tex: sub('T', txt(`bleed,${n}`)),
    name: `temperature of the steam bled to feedwater heater ${n}`,
  }),
  feedwaterInletEnthalpy: (n) => ({
    tex: sub('h', txt(`FWH${n},in`)),
    name: `enthalpy of the feedwater entering heater ${n}`,
  }),
  feedwaterExitTemperature: (n) => ({
    tex: sub('T', txt(`FWH${n},out`)),
    name: `temperature of the feedwater leaving heater ${n}`,
  }),
  feedwaterExitEnthalpy: (n) => ({
    tex: sub('h', txt(`FWH${n},out`)),
    name: `enthalpy of the feedwater leaving heater ${n}`,
  }),
  feedwaterFlow: (n) => ({
    tex: sub('\\dot m', txt(`FWH${n}`)),
    name: `fraction of the boiler flow heated in heater ${n}`,
  }),
  drainsIn: (n) => ({
    tex: sub('D', n),
    name: `drains cascaded into heater ${n} from the heater above, per kg through the boiler`,
  }),
  heatTransferred: (n) => ({
    tex: sub('Q', txt(`FWH${n}`)),
    name: `heat taken up by the feedwater in heater ${n}, per kg through the boiler`,
  }),
}

/** totals.bleedFractions.N and heaters.N.<field> of a steam plant; undefined for any other path. */
function steamPlantQuantity(parts: readonly string[]): Quantity | null | undefined {
  if (parts[0] === 'totals' && parts[1] === 'bleedFractions') {
    const n = parts[2]
    if (parts.length !== 3 || !n || !/^[1-9]\d?$/.test(n)) return null
    return { tex: sub('y', n), name: `fraction of the boiler flow bled to feedwater heater ${n}` }
  }
  if (parts[0] === 'heaters') {
    const n = parts[1]
    const make = parts.length === 3 ? HEATER_QUANTITY[parts[2]!] : undefined
    if (!n || !make) return null
    return /^[1-9]\d?$/.test(n) ? make(n) : make(texText(n))
  }
  return undefined
}

/**
 * A solver output path as a symbol and a name; null for a path this grammar does not know (the
 * caller then uses the find's own name and label, never the path).
 */
export function quantityAtPath(path: string, ctx: PathContext): Quantity | null {
  if (ctx.fluid) {
    const q = quantityAtPath(path, { ...ctx, fluid: undefined })
    return q && { ...q, name: q.name.replace(/\bthe gas\b/g, `the ${ctx.fluid}`) }
  }
  if (ctx.flow) return flowQuantity(path, { ...ctx, flow: ctx.flow })
  const parts = path.split('.')
  if (ctx.combined) {
    const q = combinedQuantity(parts, ctx)
    if (q !== null || parts[0] !== 'devices') return q
  }
  const plant = steamPlantQuantity(parts)
  if (plant !== undefined) return plant
  if (parts[0] === 'totals' && parts[1] === 'rate') return (parts.length === 3 && RATE_QUANTITY[parts[2]!]) || null
  if (parts[0] === 'totals') {
    const whole = parts[1] === 'total'
    const field = whole ? (parts[2] ?? '') : (parts[1] ?? '')
    if (ctx.steam && field === 'netWork' && !whole)
      return {
        tex: sub(heatWork(ctx.convention).W, txt('net,out')),
        name: 'net work delivered per kg through the boiler',
      }
    const q = totalsQuantity(field, ctx.convention)
    if (!q || parts.length !== (whole ? 3 : 2)) return null
    return whole ? { tex: q.tex, name: q.name.replace(/ per unit amount/, ' for the whole amount') } : q
  }
  if (parts[0] === 'states' && parts.length === 3) {
    const k = Number(parts[1])
    const prop = STATE_PROPERTY[parts[2]!]
    if (!Number.isInteger(k) || k < 1 || !prop) return null
    const s = ctx.stateNames?.[k - 1] ?? String(k)
    return { tex: sub(prop.tex, stateSub(ctx.stateNames, k)), name: `${prop.name} at state ${s}` }
  }
  if (parts[0] === 'devices' && parts.length === 3 && (parts[2] === 'w' || parts[2] === 'q')) {
    // A device's work (in the convention's sign) or heat (into the fluid), per kg.
    const k = Number(parts[1])
    const device = Number.isInteger(k) && k >= 1 ? ctx.deviceNames?.[k - 1] : undefined
    if (device === undefined) return null
    const { Q, W } = heatWork(ctx.convention)
    const word = txt(texText(device))
    return parts[2] === 'w'
      ? {
          tex: sub(W, word),
          name: `work ${ctx.convention === 'chemistry' ? 'done on' : 'done by'} the fluid in the ${device}, per kg`,
        }
      : { tex: sub(Q, word), name: `heat into the fluid in the ${device}, per kg` }
  }
  if (parts[0] === 'steps' && parts.length === 4 && parts[2] === 'rate') {
    // With a flow rate: a step's heat and work as powers, its entropy generation and exergy destruction as rates.
    const k = Number(parts[1])
    const r = STEP_RATE[parts[3]!]
    if (!Number.isInteger(k) || k < 1 || !r) return null
    const n = ctx.stateNames?.length ?? 0
    const ij = `${stateSub(ctx.stateNames, k)}${stateSub(ctx.stateNames, n > 0 && k === n ? 1 : k + 1)}`
    const name =
      parts[3] === 'work'
        ? ctx.convention === 'chemistry'
          ? 'power done on the gas'
          : 'power delivered by the gas'
        : r.name
    const fromName = ctx.stateNames?.[k - 1] ?? String(k)
    const toName = ctx.stateNames?.[n > 0 && k === n ? 0 : k] ?? String(k + 1)
    return { tex: r.tex(ij), name: `${name} in step ${fromName} → ${toName}` }
  }
  if (parts[0] === 'steps' && (parts.length === 3 || (parts.length === 4 && parts[2] === 'total'))) {
    const k = Number(parts[1])
    const make = STEP_PROPERTY[parts.at(-1)!]
    if (!Number.isInteger(k) || k < 1 || !make) return null
    const prop = make(ctx.convention)
    const n = ctx.stateNames?.length ?? 0
    const from = stateSub(ctx.stateNames, k)
    const to = stateSub(ctx.stateNames, n > 0 && k === n ? 1 : k + 1)
    const whole = parts.length === 4
    const fromName = ctx.stateNames?.[k - 1] ?? String(k)
    const toName = ctx.stateNames?.[n > 0 && k === n ? 0 : k] ?? String(k + 1)
    return {
      tex: sub(prop.tex, `${from}${to}`),
      name: `${prop.name} of step ${fromName} → ${toName}${whole ? ', whole amount' : ', per unit amount'}`,
    }
  }
  return null
}

/**
 * Plain text with identifiers a student should see typeset (T_H, W_net, η_t, V2/V1 stays):
 * split into text and math pieces, each math piece as TeX. Used for notes and author labels.
 */
export function splitIdentifiers(text: string): { readonly text?: string; readonly tex?: string }[] {
  const out: { text?: string; tex?: string }[] = []
  const re = /(?<![\p{L}\p{N}_])([\p{L}][\p{L}\p{N}]*_[\p{L}\p{N}]+(?:_[\p{L}\p{N}]+)*)(?![\p{L}\p{N}_])/gu
  let last = 0
  for (const m of text.matchAll(re)) {
    if (m.index > last) out.push({ text: text.slice(last, m.index) })
    out.push({ tex: symbolTex(m[1]!) })
    last = m.index + m[0].length
  }
  if (last < text.length) out.push({ text: text.slice(last) })
  return out
}
