/**
 * The layout of a solved steam plant (rankine-feedwater, rankine-cogeneration; the solver is
 * app/domain/thermo/steam/plant.ts): which of its states is which heater's inlet, exit, drain
 * and bleed, the pumps, the process heater, the boiler and the turbine path. Read from the
 * solution's own states in the solver's order (liquid side from the condenser up, each heater
 * from the lowest pressure, the process return, the boiler exit, the turbine stops, the exit),
 * so the worked solution and the diagrams use exactly the numbers of the key. Null when the
 * states do not have that shape, so callers can fall back. Pure.
 */
import type {
  FormattedHeater,
  FormattedRankine,
  FormattedRankineState,
} from '#app/domain/thermo/steam/rankine-template.ts'

type State = FormattedRankineState

export interface PlantHeaterLayout {
  /** 0-based, in the solution's heater order (highest pressure first) */
  readonly index: number
  readonly heater: FormattedHeater
  /** the turbine state the heater's steam is bled from */
  readonly bleed: State
  /** the feedwater state entering the heater (condensate pump exit, a pump exit, a heater exit or a mixing state) */
  readonly feedIn: State
  /** open: saturated liquid leaving the heater; closed: the feedwater leaving the tubes */
  readonly exit: State
  /** open: the pump after it */
  readonly pumpExit: State | null
  /** closed: the drain, saturated liquid at the heater pressure */
  readonly drain: State | null
  /** closed, drains forward: the drain pump exit and the feedwater after the drain joins it */
  readonly drainPumpExit: State | null
  readonly mixed: State | null
  /** the drain arriving from the heater above (closed, drains backward), when it sends any */
  readonly drainsFrom: State | null
  /** what leaves towards the boiler: the pump exit, the mixing state or the tube exit */
  readonly feedOut: State
}

export interface PlantLayout {
  readonly condenserExit: State
  readonly condensatePumpExit: State
  /** in the solution's order (highest pressure first) */
  readonly heaters: readonly PlantHeaterLayout[]
  readonly process: {
    readonly liquid: State
    readonly pumped: State
    readonly mixed: State
    readonly extraction: State
  } | null
  /** the feedwater leaving the top of the train */
  readonly topFeed: State
  readonly boilerExit: State
  /** turbine stops ("turbine at …") and reheater exits, in order */
  readonly path: readonly State[]
  readonly turbineExit: State
}

export function isSteamPlant(sol: FormattedRankine): boolean {
  return Array.isArray(sol.heaters)
}

export function plantLayout(sol: FormattedRankine): PlantLayout | null {
  const heaters = sol.heaters
  if (!Array.isArray(heaters)) return null
  const states = sol.states
  let k = 0
  const take = (prefix: string): State | null => {
    const s = states[k]
    if (!s || !s.description.startsWith(prefix)) return null
    k++
    return s
  }
  const condenserExit = take('condenser exit')
  const condensatePumpExit = take('condensate pump exit')
  if (!condenserExit || !condensatePumpExit) return null
  const byIndex: PlantHeaterLayout[] = []
  let feed = condensatePumpExit
  // lowest pressure first, as the solver lists the liquid side
  const asc = heaters.map((heater, index) => ({ heater, index })).reverse()
  const partial: Omit<PlantHeaterLayout, 'bleed' | 'drainsFrom'>[] = []
  for (const { heater, index } of asc) {
    const name = heater.name
    if (heater.kind === 'open') {
      const exit = take(`${name} exit, saturated liquid`)
      const pumpExit = take(`pump exit after ${name}`)
      if (!exit || !pumpExit) return null
      partial.push({
        index,
        heater,
        feedIn: feed,
        exit,
        pumpExit,
        drain: null,
        drainPumpExit: null,
        mixed: null,
        feedOut: pumpExit,
      })
      feed = pumpExit
    } else {
      const exit = take(`feedwater leaving ${name} (`)
      const drain = take(`${name} drain, saturated liquid`)
      if (!exit || !drain) return null
      let drainPumpExit: State | null = null
      let mixed: State | null = null
      if (heater.drains === 'forward') {
        drainPumpExit = take(`drain pump exit of ${name}`)
        mixed = take(`feedwater after mixing in the drain of ${name}`)
        if (!drainPumpExit || !mixed) return null
      }
      const feedOut = mixed ?? exit
      partial.push({ index, heater, feedIn: feed, exit, pumpExit: null, drain, drainPumpExit, mixed, feedOut })
      feed = feedOut
    }
  }
  const topFeed = feed
  let processStates: { liquid: State; pumped: State; mixed: State } | null = null
  if (sol.totals.processHeat !== undefined) {
    const liquid = take('process heater exit')
    const pumped = take('process-condensate pump exit')
    const mixed = take('boiler inlet')
    if (!liquid || !pumped || !mixed) return null
    processStates = { liquid, pumped, mixed }
  }
  const boilerExit = take('boiler exit')
  if (!boilerExit) return null
  const path: State[] = []
  for (;;) {
    const s = take('turbine at ') ?? take('reheater exit')
    if (!s) break
    path.push(s)
  }
  const turbineExit = take('turbine exit')
  if (!turbineExit || k !== states.length) return null
  const same = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b))
  const stopAt = (p: number) => path.find((s) => s.description.startsWith('turbine at ') && same(s.p.value, p)) ?? null
  for (const h of partial) {
    const bleed = stopAt(h.heater.pressure.value)
    if (!bleed) return null
    byIndex[h.index] = { ...h, bleed, drainsFrom: null }
  }
  // Drains cascade backward from the heater above into this one.
  for (let i = 1; i < byIndex.length; i++) {
    const h = byIndex[i]!
    if (h.heater.drainsIn.value > 0) byIndex[i] = { ...h, drainsFrom: byIndex[i - 1]!.drain }
  }
  if (byIndex.length !== heaters.length || byIndex.some((h) => h === undefined)) return null
  let process: PlantLayout['process'] = null
  if (processStates) {
    const extraction = stopAt(processStates.liquid.p.value)
    if (!extraction) return null
    process = { ...processStates, extraction }
  }
  return { condenserExit, condensatePumpExit, heaters: byIndex, process, topFeed, boilerExit, path, turbineExit }
}

/** One drawn process of a plant: states by index into the solution's states (0-based). */
export interface PlantEdge {
  readonly from: number
  readonly to: number
  readonly process: string
  readonly dashed: boolean
  readonly path: 'isobar' | 'isentrope' | 'straight'
}

/**
 * The processes a T–s (and P–v) diagram of a steam plant draws: the main loop (pumps, heaters'
 * feedwater sides, boiler, turbine sections and reheater, condenser) and, dashed, the streams that
 * leave it (bleed steam condensing or mixing in each heater, drains through traps or pumps, the
 * process heater and its condensate). Null when the states are not in the solver's shape.
 */
export function plantEdges(sol: FormattedRankine): PlantEdge[] | null {
  const layout = plantLayout(sol)
  if (!layout) return null
  const at = new Map(sol.states.map((s, i) => [s, i]))
  const out: PlantEdge[] = []
  const isentropic = (a: State, b: State) =>
    Math.abs(b.s.value - a.s.value) <= 1e-7 * Math.max(Math.abs(a.s.value), Math.abs(b.s.value), 1)
  const edge = (a: State, b: State, process: string, dashed: boolean, path: PlantEdge['path']) =>
    out.push({ from: at.get(a)!, to: at.get(b)!, process, dashed, path })
  const machine = (a: State, b: State, what: 'pump' | 'turbine', name: string) => {
    const ideal = isentropic(a, b)
    const how =
      what === 'pump'
        ? ideal
          ? 'isentropic compression'
          : 'irreversible compression'
        : ideal
          ? 'isentropic expansion'
          : 'irreversible expansion'
    edge(a, b, `${name} (${how})`, !ideal, ideal ? 'isentrope' : 'straight')
  }
  const { condenserExit, condensatePumpExit, heaters, process, topFeed, boilerExit, path, turbineExit } = layout
  machine(condenserExit, condensatePumpExit, 'pump', 'condensate pump')
  for (const hl of [...heaters].reverse()) {
    const name = hl.heater.name
    edge(hl.feedIn, hl.exit, `${name}: feedwater heated (isobaric)`, false, 'isobar')
    if (hl.heater.kind === 'open') {
      edge(hl.bleed, hl.exit, `bleed steam mixing in ${name} (isobaric)`, true, 'isobar')
      if (hl.drainsFrom) edge(hl.drainsFrom, hl.exit, `drains trapped into ${name}`, true, 'straight')
      machine(hl.exit, hl.pumpExit!, 'pump', `pump after ${name}`)
    } else {
      edge(hl.bleed, hl.drain!, `bleed steam condensing in ${name} (isobaric)`, true, 'isobar')
      if (hl.drainsFrom) edge(hl.drainsFrom, hl.drain!, `drains trapped into ${name}`, true, 'straight')
      if (hl.drainPumpExit && hl.mixed) {
        machine(hl.drain!, hl.drainPumpExit, 'pump', `drain pump of ${name}`)
        edge(hl.exit, hl.mixed, `pumped drain mixing after ${name} (isobaric)`, false, 'isobar')
        edge(hl.drainPumpExit, hl.mixed, `pumped drain mixing after ${name} (isobaric)`, true, 'isobar')
      }
    }
  }
  let boilerIn = topFeed
  if (process) {
    edge(process.extraction, process.liquid, 'process heater (isobaric cooling)', true, 'isobar')
    machine(process.liquid, process.pumped, 'pump', 'process-condensate pump')
    edge(topFeed, process.mixed, 'feedwater mixing with the process condensate (isobaric)', false, 'isobar')
    edge(process.pumped, process.mixed, 'process condensate mixing into the feedwater (isobaric)', true, 'isobar')
    boilerIn = process.mixed
  }
  edge(boilerIn, boilerExit, 'boiler (isobaric heating)', false, 'isobar')
  let cur = boilerExit
  for (const s of [...path, turbineExit]) {
    if (s.description.startsWith('reheater exit')) edge(cur, s, 'reheater (isobaric heating)', false, 'isobar')
    else machine(cur, s, 'turbine', 'turbine')
    cur = s
  }
  edge(turbineExit, condenserExit, 'condenser (isobaric cooling)', false, 'isobar')
  const lowest = heaters.at(-1)
  if (lowest?.drain && lowest.heater.drains === 'backward')
    edge(lowest.drain, condenserExit, `drains of ${lowest.heater.name} trapped to the condenser`, true, 'straight')
  return out
}
