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

export interface PathContext {
  readonly convention: Convention
  /** A steam (Rankine) cycle: its net work is the work delivered, per kg through the boiler. */
  readonly steam?: boolean
  /** Names of the states in order ('1', '2', … or 'A', 'B', …), for subscripts. */
  readonly stateNames?: readonly string[]
  /** Names of the devices in order ('compressor', 'condenser', …) of a steam or refrigeration cycle. */
  readonly deviceNames?: readonly string[]
}

function stateSub(names: readonly string[] | undefined, index: number): string {
  const name = names?.[index - 1] ?? String(index)
  return /^[A-Za-z0-9]{1,3}$/.test(name) ? name : txt(texText(name))
}

/**
 * A solver output path as a symbol and a name; null for a path this grammar does not know (the
 * caller then uses the find's own name and label, never the path).
 */
export function quantityAtPath(path: string, ctx: PathContext): Quantity | null {
  const parts = path.split('.')
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
