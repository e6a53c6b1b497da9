/**
 * The problem editor's form ⇄ a problem definition. Field names ARE the definition's dotted
 * paths ('givens.0.rule.min', 'finds.1.tolerance.value'), so the issues that the shape check
 * (problem-schema.ts) and the lint (domain/authoring/lint.ts) report by path land on the field
 * that caused them without a translation table. Pure and isomorphic: the browser reads its
 * own form with the same code to draft the live preview.
 *
 * Table rows: a row whose text fields are all blank is dropped (the editor always shows one
 * blank row to type into), a row named by a "Remove" button (a `_remove` field) is dropped, and the rows that
 * stay are renumbered 0, 1, 2… both in the draft and in the refilled values, so an issue
 * path and a field name always agree.
 */
import {
  DEFINITION_FORMAT,
  HEATER_FIELDS,
  MAX_HEATERS,
  type HeaterInput,
  type ProblemDefinition,
} from '#app/domain/authoring/definition.ts'

export interface FormIssue {
  readonly path: string
  readonly message: string
}

export type RowTable = 'givens' | 'constraints' | 'finds'
export type EditorRows = Record<RowTable, number>

/** What the editor renders: the typed values by field name and how many rows each table shows. */
export interface EditorState {
  readonly values: Readonly<Record<string, string>>
  readonly rows: EditorRows
  /** Rows the heater list shows (heaters typed + one blank); absent: counted from the values. */
  readonly heaterRows?: number
}

/** Option value of the physics select that stands for a general state-and-process cycle. */
export const GENERAL_CYCLE = 'general-cycle'

export const RULE_KINDS = ['range', 'choice', 'expression'] as const
export const CONSTRAINT_OPS = ['<', '<=', '>', '>=', '!='] as const

/** Solver outputs authors ask for most, for the find path's suggestions. */
export const COMMON_OUTPUT_PATHS: readonly { readonly path: string; readonly label: string }[] = [
  { path: 'totals.netWork', label: 'net work per unit amount' },
  { path: 'totals.heatIn', label: 'heat added per unit amount' },
  { path: 'totals.heatOut', label: 'heat rejected per unit amount' },
  { path: 'totals.efficiency', label: 'thermal efficiency' },
  { path: 'totals.copRefrigerator', label: 'coefficient of performance, refrigerator' },
  { path: 'totals.copHeatPump', label: 'coefficient of performance, heat pump' },
  { path: 'totals.meanEffectivePressure', label: 'mean effective pressure' },
  { path: 'totals.backWorkRatio', label: 'back work ratio' },
  { path: 'totals.entropyGenerated', label: 'entropy generated' },
  { path: 'totals.Tmax', label: 'highest temperature' },
  { path: 'totals.total.netWork', label: 'net work for the whole amount' },
  { path: 'states.2.T', label: 'temperature at state 2' },
  { path: 'states.2.p', label: 'pressure at state 2' },
  { path: 'states.3.T', label: 'temperature at state 3' },
  { path: 'states.4.T', label: 'temperature at state 4' },
  { path: 'steps.1.w', label: 'work of step 1' },
  { path: 'steps.2.q', label: 'heat of step 2' },
  { path: 'totals.pumpWork', label: 'pump work (steam)' },
  { path: 'totals.turbineWork', label: 'turbine work (steam)' },
  { path: 'totals.turbineExitQuality', label: 'turbine exit quality (steam)' },
  { path: 'totals.bleedFraction', label: 'bled steam fraction (steam)' },
  { path: 'heaters.1.bleedFraction', label: 'fraction bled to feedwater heater 1 (steam plant)' },
  { path: 'heaters.1.heatTransferred', label: 'heat taken up by the feedwater in heater 1 (steam plant)' },
  { path: 'totals.processHeat', label: 'process heat per kg through the boiler (cogeneration)' },
  { path: 'totals.utilisationFactor', label: 'utilisation factor (cogeneration)' },
  { path: 'totals.refrigerationEffect', label: 'refrigeration effect per kg (refrigerator)' },
  { path: 'totals.compressorWork', label: 'compressor work per kg (refrigerator)' },
  { path: 'totals.heatRejected', label: 'heat rejected in the condenser per kg (refrigerator)' },
  { path: 'totals.exergyDestroyed', label: 'exergy destroyed (with a dead state)' },
  { path: 'totals.rate.netPower', label: 'net power (with a mass flow)' },
  { path: 'totals.quality', label: 'quality of the line steam (throttling calorimeter)' },
  { path: 'totals.steamPerGas', label: 'steam raised per kg of gas (combined cycle)' },
  { path: 'totals.exitVelocity', label: 'exit velocity (nozzle, diffuser, turbojet)' },
  { path: 'totals.thrust', label: 'thrust (turbojet)' },
]

// ---- Template and pitfall lists for the editor (built on the server, sent as data) ------

export interface TemplateChoice {
  readonly id: string
  readonly title: string
  readonly description: string
  readonly inputs: readonly {
    readonly name: string
    readonly unit: string
    readonly description: string
    readonly required: boolean
    /** 'heater list' for a list of feedwater heaters (shown as rows); other inputs are one text */
    readonly dimension?: string
  }[]
}

export interface EditorOptions {
  readonly templateGroups: readonly { readonly label: string; readonly templates: readonly TemplateChoice[] }[]
  readonly pitfalls: readonly { readonly id: string; readonly title: string }[]
}

/**
 * The editor's choices as plain data. The server passes the bank's templates in, grouped by
 * family (from the solver's catalog), so the browser bundle never has to carry the solver (and
 * mathjs) just to list template inputs.
 */
export function buildEditorOptions(
  groups: readonly { readonly label: string; readonly templates: readonly TemplateChoice[] }[],
  pitfalls: readonly { readonly id: string; readonly title: string }[],
): EditorOptions {
  const pick = (t: TemplateChoice): TemplateChoice => ({
    id: t.id,
    title: t.title,
    description: t.description,
    inputs: t.inputs.map((i) => ({
      name: i.name,
      unit: i.unit,
      description: i.description,
      required: i.required,
      ...(i.dimension === HEATER_LIST ? { dimension: HEATER_LIST } : {}),
    })),
  })
  return {
    templateGroups: groups
      .filter((g) => g.templates.length > 0)
      .map((g) => ({ label: g.label, templates: g.templates.map(pick) })),
    pitfalls: pitfalls.map((p) => ({ id: p.id, title: p.title })),
  }
}

// ---- Heater lists (a steam plant's feedwater heaters) --------------------------------

/** The dimension of a template input that is a list of feedwater heaters. */
export const HEATER_LIST = 'heater list'

/** A heater row's field: physics.inputs.<input>.<row>.<field>. */
const HEATER_KEY = /^physics\.inputs\.([A-Za-z][A-Za-z0-9_]*)\.(\d{1,2})\.(kind|pressure|name|ttd|drains|_remove)$/

/** The fields whose text decides whether a heater row is blank (kind and drains are selects). */
const HEATER_CONTENT: readonly string[] = ['pressure', 'name', 'ttd']

/** The value of a heater row's "Remove" button: `remove-heater:heaters:1`. */
export function removeHeaterIntent(input: string, index: number): string {
  return `remove-heater:${input}:${index}`
}
/** The value of the "Add a heater" button. */
export function addHeaterIntent(input: string): string {
  return `add-heater:${input}`
}
const REMOVE_HEATER = /^remove-heater:([A-Za-z][A-Za-z0-9_]*):(\d{1,2})$/
const ADD_HEATER = /^add-heater:([A-Za-z][A-Za-z0-9_]*)$/

/** A heater-row button's value, or null. */
export function readHeaterIntent(
  intent: unknown,
): { action: 'add'; input: string } | { action: 'remove'; input: string; index: number } | null {
  if (typeof intent !== 'string') return null
  const r = REMOVE_HEATER.exec(intent)
  if (r) return { action: 'remove', input: r[1]!, index: Number(r[2]) }
  const a = ADD_HEATER.exec(intent)
  return a ? { action: 'add', input: a[1]! } : null
}

/** Heater rows present in the form per input, kept ones in order, removed and blank ones left out. */
function readHeaterRows(form: FormData): Map<string, { kept: number[]; blank: number }> {
  const seen = new Map<string, Set<number>>()
  for (const key of form.keys()) {
    const m = HEATER_KEY.exec(key)
    if (!m) continue
    const set = seen.get(m[1]!) ?? new Set<number>()
    set.add(Number(m[2]))
    seen.set(m[1]!, set)
  }
  const out = new Map<string, { kept: number[]; blank: number }>()
  for (const [input, set] of seen) {
    const kept: number[] = []
    let blank = 0
    for (const i of [...set].sort((a, b) => a - b)) {
      const p = `physics.inputs.${input}.${i}`
      if (allText(form, `${p}._remove`) !== '') continue
      if (HEATER_CONTENT.every((f) => allText(form, `${p}.${f}`).trim() === '')) blank++
      else kept.push(i)
    }
    out.set(input, { kept, blank })
  }
  return out
}

/** The heater lists the form describes, by input name (rows renumbered from 0). */
function heaterListsFromForm(form: FormData): Map<string, HeaterInput[]> {
  const out = new Map<string, HeaterInput[]>()
  for (const [input, rows] of readHeaterRows(form)) {
    const list = rows.kept.map((i) => {
      const p = `physics.inputs.${input}.${i}`
      const get = (f: string) => allText(form, `${p}.${f}`).trim()
      const h: { -readonly [K in keyof HeaterInput]: HeaterInput[K] } = { kind: get('kind'), pressure: get('pressure') }
      for (const f of ['name', 'ttd', 'drains'] as const) if (get(f) !== '') h[f] = get(f)
      return h
    })
    if (list.length > 0) out.set(input, list)
  }
  return out
}

/** How many rows a heater list shows for these values: the rows typed and one blank. */
export function heaterRowCount(values: Readonly<Record<string, string>>, input: string): number {
  let n = 0
  for (const k of Object.keys(values)) {
    const m = HEATER_KEY.exec(k)
    if (m && m[1] === input) n = Math.max(n, Number(m[2]) + 1)
  }
  return Math.min(n + 1, MAX_HEATERS + 1)
}

export function findTemplate(options: EditorOptions, id: string): TemplateChoice | undefined {
  for (const g of options.templateGroups) for (const t of g.templates) if (t.id === id) return t
  return undefined
}

// ---- Reading a form ----------------------------------------------------------------

/** The fields whose text decides whether a row is blank; selects always carry a value. */
const CONTENT_FIELDS: Record<RowTable, readonly string[]> = {
  givens: [
    'name',
    'label',
    'unit',
    'rule.min',
    'rule.max',
    'rule.step',
    'rule.values',
    'rule.expression',
    'display.decimals',
    'display.sigFigs',
  ],
  constraints: ['left', 'right', 'message'],
  finds: [
    'name',
    'label',
    'source.path',
    'source.expression',
    'unit',
    'points',
    'tolerance.value',
    'tolerance.unit',
    'sigFigs.min',
    'sigFigs.max',
    'pitfalls',
    'isDifference',
    'allowBareNumber',
  ],
}

const ROW_KEY = /^(givens|constraints|finds)\.(\d{1,4})\.(.+)$/

function isRowTable(x: string | undefined): x is RowTable {
  return x === 'givens' || x === 'constraints' || x === 'finds'
}

/** A row field's form name ("finds.2.unit") read into its table, row and field, or null. */
function matchRowKey(key: string): { table: RowTable; index: number; field: string } | null {
  const m = ROW_KEY.exec(key)
  const table = m?.[1]
  return m && isRowTable(table) ? { table, index: Number(m[2]), field: m[3] ?? '' } : null
}

/** All values of a form field, joined with "," when it repeats (pitfall checkboxes). */
function allText(form: FormData, key: string): string {
  return form
    .getAll(key)
    .filter((v): v is string => typeof v === 'string')
    .join(',')
}

/** Row indices present in the form per table, in order, with removed and blank rows told apart. */
function readRows(form: FormData): Record<RowTable, { kept: number[]; blank: number }> {
  const seen: Record<RowTable, Set<number>> = { givens: new Set(), constraints: new Set(), finds: new Set() }
  for (const key of form.keys()) {
    const row = matchRowKey(key)
    if (row) seen[row.table].add(row.index)
  }
  const read = (table: RowTable): { kept: number[]; blank: number } => {
    const kept: number[] = []
    let blank = 0
    for (const i of [...seen[table]].sort((a, b) => a - b)) {
      const p = `${table}.${i}`
      if (allText(form, `${p}._remove`) !== '') continue
      if (CONTENT_FIELDS[table].every((f) => allText(form, `${p}.${f}`).trim() === '')) blank++
      else kept.push(i)
    }
    return { kept, blank }
  }
  return { givens: read('givens'), constraints: read('constraints'), finds: read('finds') }
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i

/** A typed number: spaces and a typographic minus allowed ("101 325", "−40"). */
function parseNumber(text: string): number | null {
  const t = text.replace(/[\s\u00a0\u2009\u202f]/g, '').replace(/\u2212/g, '-')
  return NUMBER.test(t) ? Number(t) : null
}

function splitList(text: string): string[] {
  return text
    .split(',')
    .map((s) => s.trim())
    .filter((s) => s !== '')
}

/** Drops undefined members, so a draft holds only what was typed. */
function compact<T extends Record<string, unknown>>(o: T): T {
  for (const k of Object.keys(o)) if (o[k] === undefined) delete o[k]
  return o
}

/**
 * The definition the form describes, as far as it can be read. Never throws: numbers that are
 * not numbers and a cycle that is not JSON come back as `formIssues` by field name (and keep
 * the raw text in the draft, so the shape check refuses the draft too). The draft is checked
 * by definitionIssues / lintDefinition afterwards; nothing here decides validity.
 */
export function definitionFromForm(form: FormData): { draft: unknown; visibility: string; formIssues: FormIssue[] } {
  const formIssues: FormIssue[] = []
  const text = (key: string) => allText(form, key).replace(/\r\n?/g, '\n')
  const trimmed = (key: string) => text(key).trim()
  const optionalText = (key: string) => trimmed(key) || undefined
  const num = (key: string): number | string | undefined => {
    const raw = trimmed(key)
    if (raw === '') return undefined
    const n = parseNumber(raw)
    if (n !== null) return n
    formIssues.push({ path: key, message: `“${raw}” is not a number. Type digits, such as 300 or 1.5e5.` })
    return raw
  }
  const checked = (key: string) => (allText(form, key) !== '' ? true : undefined)
  const rows = readRows(form)

  const givens = rows.givens.kept.map((i) => {
    const p = `givens.${i}`
    const kind = trimmed(`${p}.rule.kind`)
    let rule: Record<string, unknown>
    if (kind === 'range')
      rule = compact({ kind, min: num(`${p}.rule.min`), max: num(`${p}.rule.max`), step: num(`${p}.rule.step`) })
    else if (kind === 'choice') {
      const items = splitList(text(`${p}.rule.values`))
      const numbers = items.map(parseNumber)
      const allNumbers = numbers.filter((n): n is number => n !== null)
      rule = { kind, values: allNumbers.length === items.length ? allNumbers : items }
    } else if (kind === 'expression') rule = { kind, expression: trimmed(`${p}.rule.expression`) }
    else rule = { kind }
    const display = compact({ decimals: num(`${p}.display.decimals`), sigFigs: num(`${p}.display.sigFigs`) })
    return compact({
      name: trimmed(`${p}.name`),
      label: trimmed(`${p}.label`),
      unit: trimmed(`${p}.unit`),
      rule,
      display: Object.keys(display).length > 0 ? display : undefined,
    })
  })

  const constraints = rows.constraints.kept.map((i) => {
    const p = `constraints.${i}`
    return compact({
      left: trimmed(`${p}.left`),
      op: trimmed(`${p}.op`),
      right: trimmed(`${p}.right`),
      message: optionalText(`${p}.message`),
    })
  })

  const template = trimmed('physics.template')
  const kind = trimmed('physics.kind') || (template === GENERAL_CYCLE ? 'cycle' : 'template')
  let physics: Record<string, unknown>
  if (kind === 'cycle') {
    const raw = text('physics.cycle').trim()
    let cycle: unknown
    if (raw !== '') {
      try {
        cycle = JSON.parse(raw)
      } catch (e) {
        const why = e instanceof Error ? e.message : 'it could not be read'
        formIssues.push({ path: 'physics.cycle', message: `The cycle is not valid JSON: ${why}.` })
        cycle = raw
      }
    }
    physics = compact({ kind, cycle })
  } else {
    const inputs: Record<string, string | HeaterInput[]> = {}
    for (const key of new Set(form.keys())) {
      if (!key.startsWith('physics.inputs.') || HEATER_KEY.test(key)) continue
      const value = trimmed(key)
      if (value !== '') inputs[key.slice('physics.inputs.'.length)] = value
    }
    for (const [input, list] of heaterListsFromForm(form)) inputs[input] = list
    physics = { kind, template, inputs }
  }

  const finds = rows.finds.kept.map((i) => {
    const p = `finds.${i}`
    const sourceKind = trimmed(`${p}.source.kind`)
    const source =
      sourceKind === 'output'
        ? { kind: sourceKind, path: trimmed(`${p}.source.path`) }
        : sourceKind === 'expression'
          ? { kind: sourceKind, expression: trimmed(`${p}.source.expression`) }
          : { kind: sourceKind }
    const tolKind = trimmed(`${p}.tolerance.kind`)
    let tolerance: Record<string, unknown>
    if (tolKind === 'relative') {
      const raw = trimmed(`${p}.tolerance.value`)
      const percent = /^(.*?)\s*%$/.exec(raw)
      if (percent) {
        const n = parseNumber(percent[1]!)
        if (n === null)
          formIssues.push({
            path: `${p}.tolerance.value`,
            message: `“${raw}” is not a percentage. Type a fraction (0.01) or a percentage (1 %).`,
          })
        tolerance = { kind: tolKind, value: n === null ? raw : n / 100 }
      } else tolerance = compact({ kind: tolKind, value: num(`${p}.tolerance.value`) })
    } else
      tolerance = compact({
        kind: tolKind,
        value: num(`${p}.tolerance.value`),
        unit: optionalText(`${p}.tolerance.unit`),
      })
    const sigFigs = compact({ min: num(`${p}.sigFigs.min`), max: num(`${p}.sigFigs.max`) })
    return compact({
      name: trimmed(`${p}.name`),
      label: trimmed(`${p}.label`),
      source,
      unit: trimmed(`${p}.unit`),
      points: num(`${p}.points`),
      tolerance,
      sigFigs: Object.keys(sigFigs).length > 0 ? sigFigs : undefined,
      isDifference: checked(`${p}.isDifference`),
      allowBareNumber: checked(`${p}.allowBareNumber`),
      pitfalls: splitList(allText(form, `${p}.pitfalls`)),
      sense: optionalText(`${p}.sense`),
    })
  })

  const draft = {
    format: DEFINITION_FORMAT,
    title: trimmed('title'),
    tags: {
      topics: splitList(text('tags.topics')).map((t) => t.toLowerCase()),
      difficulty: trimmed('tags.difficulty'),
      level: trimmed('tags.level'),
    },
    convention: trimmed('convention'),
    prompt: text('prompt'),
    givens,
    constraints,
    physics,
    finds,
  }
  return { draft, visibility: trimmed('visibility'), formIssues }
}

// ---- Filling a form ----------------------------------------------------------------

function numberText(n: number | undefined): string {
  return n === undefined ? '' : String(n)
}

/** The form values that describe a definition (the reverse of definitionFromForm). */
export function formValuesFromDefinition(def: ProblemDefinition): Record<string, string> {
  const v: Record<string, string> = {
    title: def.title,
    'tags.topics': def.tags.topics.join(', '),
    'tags.difficulty': def.tags.difficulty,
    'tags.level': def.tags.level,
    convention: def.convention,
    prompt: def.prompt,
  }
  def.givens.forEach((g, i) => {
    const p = `givens.${i}`
    v[`${p}.name`] = g.name
    v[`${p}.label`] = g.label
    v[`${p}.unit`] = g.unit
    v[`${p}.rule.kind`] = g.rule.kind
    if (g.rule.kind === 'range') {
      v[`${p}.rule.min`] = numberText(g.rule.min)
      v[`${p}.rule.max`] = numberText(g.rule.max)
      v[`${p}.rule.step`] = numberText(g.rule.step)
    } else if (g.rule.kind === 'choice') v[`${p}.rule.values`] = g.rule.values.join(', ')
    else v[`${p}.rule.expression`] = g.rule.expression
    if (g.display?.decimals !== undefined) v[`${p}.display.decimals`] = numberText(g.display.decimals)
    if (g.display?.sigFigs !== undefined) v[`${p}.display.sigFigs`] = numberText(g.display.sigFigs)
  })
  def.constraints.forEach((c, i) => {
    const p = `constraints.${i}`
    v[`${p}.left`] = c.left
    v[`${p}.op`] = c.op
    v[`${p}.right`] = c.right
    if (c.message !== undefined) v[`${p}.message`] = c.message
  })
  if (def.physics.kind === 'template') {
    v['physics.template'] = def.physics.template
    for (const [name, value] of Object.entries(def.physics.inputs)) {
      if (typeof value === 'string') v[`physics.inputs.${name}`] = value
      else
        value.forEach((h, i) => {
          for (const f of HEATER_FIELDS) if (h[f] !== undefined) v[`physics.inputs.${name}.${i}.${f}`] = h[f]
        })
    }
  } else {
    v['physics.template'] = GENERAL_CYCLE
    v['physics.cycle'] = def.physics.cycle === undefined ? '' : JSON.stringify(def.physics.cycle, null, 2)
  }
  def.finds.forEach((f, i) => {
    const p = `finds.${i}`
    v[`${p}.name`] = f.name
    v[`${p}.label`] = f.label
    v[`${p}.source.kind`] = f.source.kind
    if (f.source.kind === 'output') v[`${p}.source.path`] = f.source.path
    else v[`${p}.source.expression`] = f.source.expression
    v[`${p}.unit`] = f.unit
    v[`${p}.points`] = numberText(f.points)
    v[`${p}.tolerance.kind`] = f.tolerance.kind
    v[`${p}.tolerance.value`] = numberText(f.tolerance.value)
    if (f.tolerance.kind === 'absolute' && f.tolerance.unit !== undefined) v[`${p}.tolerance.unit`] = f.tolerance.unit
    if (f.sigFigs?.min !== undefined) v[`${p}.sigFigs.min`] = numberText(f.sigFigs.min)
    if (f.sigFigs?.max !== undefined) v[`${p}.sigFigs.max`] = numberText(f.sigFigs.max)
    if (f.isDifference) v[`${p}.isDifference`] = 'on'
    if (f.allowBareNumber) v[`${p}.allowBareNumber`] = 'on'
    if (f.pitfalls.length > 0) v[`${p}.pitfalls`] = f.pitfalls.join(',')
    if (f.sense !== undefined) v[`${p}.sense`] = f.sense
  })
  return v
}

/** The editor for an existing definition: its values and one blank row per table. */
export function editorStateFromDefinition(def: ProblemDefinition, visibility: string): EditorState {
  return {
    values: { ...formValuesFromDefinition(def), visibility },
    rows: { givens: def.givens.length + 1, constraints: def.constraints.length + 1, finds: def.finds.length + 1 },
  }
}

/** A new problem: one blank given, constraint and find, the Otto template chosen. */
export function emptyEditorState(): EditorState {
  return {
    values: {
      visibility: 'private',
      convention: 'course',
      'tags.difficulty': 'standard',
      'tags.level': 'second-year',
      'physics.template': 'otto',
    },
    rows: { givens: 1, constraints: 1, finds: 1 },
  }
}

/**
 * The form as typed, renumbered as definitionFromForm numbers it (blank and removed rows out),
 * to refill the editor. `add` shows one more blank row in that table than were sent.
 */
export function editorStateFromForm(form: FormData, add?: RowTable | { heaters: string }): EditorState {
  const rows = readRows(form)
  const heaterRows = readHeaterRows(form)
  const heaterRenumber = new Map(
    [...heaterRows].map(([input, r]) => [input, new Map(r.kept.map((old, i) => [old, i]))]),
  )
  const renumber: Record<RowTable, Map<number, number>> = {
    givens: new Map(rows.givens.kept.map((old, i) => [old, i])),
    constraints: new Map(rows.constraints.kept.map((old, i) => [old, i])),
    finds: new Map(rows.finds.kept.map((old, i) => [old, i])),
  }
  const values: Record<string, string> = {}
  for (const key of new Set(form.keys())) {
    if (key === 'intent') continue
    const h = HEATER_KEY.exec(key)
    if (h) {
      const index = heaterRenumber.get(h[1]!)?.get(Number(h[2]))
      if (index !== undefined && h[3] !== '_remove')
        values[`physics.inputs.${h[1]}.${index}.${h[3]}`] = allText(form, key)
      continue
    }
    const row = matchRowKey(key)
    if (!row) {
      values[key] = allText(form, key)
      continue
    }
    const index = renumber[row.table].get(row.index)
    if (index === undefined || row.field === '_remove') continue
    values[`${row.table}.${index}.${row.field}`] = allText(form, key)
  }
  const count = (t: RowTable) => rows[t].kept.length + (add === t ? Math.max(1, rows[t].blank) + 1 : 1)
  const addHeaters = typeof add === 'object' ? add.heaters : null
  const heaterInput = addHeaters ?? [...heaterRows.keys()][0]
  const heaterCount =
    heaterInput === undefined
      ? undefined
      : Math.min(
          MAX_HEATERS + 1,
          (heaterRows.get(heaterInput)?.kept.length ?? 0) +
            (addHeaters !== null ? Math.max(1, heaterRows.get(heaterInput)?.blank ?? 0) + 1 : 1),
        )
  return {
    values,
    rows: { givens: count('givens'), constraints: count('constraints'), finds: count('finds') },
    ...(heaterCount !== undefined ? { heaterRows: heaterCount } : {}),
  }
}

/** The value of a row's "Remove" button: `remove:givens:2`. */
export function removeIntent(table: RowTable, index: number): string {
  return `remove:${table}:${index}`
}

const REMOVE_INTENT = /^remove:(givens|constraints|finds):(\d{1,4})$/

/** The row a "Remove" button's value names, or null. */
export function readRemoveIntent(intent: unknown): { table: RowTable; index: number } | null {
  const m = typeof intent === 'string' ? REMOVE_INTENT.exec(intent) : null
  const table = m?.[1]
  return m && isRowTable(table) ? { table, index: Number(m[2]) } : null
}

/**
 * The form as typed without one row, renumbered, to refill the editor: what the "Remove"
 * button does, on the server without JavaScript and in the browser with it.
 */
export function editorStateWithout(form: FormData, table: RowTable, index: number): EditorState {
  const copy = new FormData()
  for (const [k, v] of form.entries()) if (k !== 'intent') copy.append(k, v)
  copy.set(`${table}.${index}._remove`, 'on')
  return editorStateFromForm(copy)
}

/**
 * The form as typed without one heater row, renumbered: what a heater's "Remove" button does.
 */
export function editorStateWithoutHeater(form: FormData, input: string, index: number): EditorState {
  const copy = new FormData()
  for (const [k, v] of form.entries()) if (k !== 'intent') copy.append(k, v)
  copy.set(`physics.inputs.${input}.${index}._remove`, 'on')
  return editorStateFromForm(copy)
}

/** After the template changed: keep only the inputs the new template takes (shared ones stay filled, heater rows too). */
export function keepTemplateInputs(
  values: Readonly<Record<string, string>>,
  inputNames: readonly string[],
): Record<string, string> {
  const keep = new Set(inputNames.map((n) => `physics.inputs.${n}`))
  return Object.fromEntries(
    Object.entries(values).filter(
      ([k]) => !k.startsWith('physics.inputs.') || keep.has(k.split('.').slice(0, 3).join('.')),
    ),
  )
}

// ---- Issues ------------------------------------------------------------------------

/**
 * Adds `later` issues to `first`, leaving out those about a field `first` already speaks of
 * ("not a number" from the form, then "expected a number" from the shape check, is one issue).
 */
export function mergeIssues(first: readonly FormIssue[], later: readonly FormIssue[]): FormIssue[] {
  const covered = first.map((i) => fieldPathForIssue(i.path))
  const out = [...first]
  for (const issue of later) {
    if (covered.includes(fieldPathForIssue(issue.path))) continue
    if (out.some((o) => o.path === issue.path && o.message === issue.message)) continue
    out.push(issue)
  }
  return out
}

const ROW_FIELD_FALLBACK: Record<RowTable, Record<string, string>> = {
  givens: { '': 'name', rule: 'rule.kind', display: 'display.decimals' },
  constraints: { '': 'left' },
  finds: { '': 'name', source: 'source.kind', tolerance: 'tolerance.kind', sigFigs: 'sigFigs.min' },
}
const ROW_FIELDS: Record<RowTable, readonly string[]> = {
  givens: [...CONTENT_FIELDS.givens, 'rule.kind'],
  constraints: [...CONTENT_FIELDS.constraints, 'op'],
  finds: [...CONTENT_FIELDS.finds, 'source.kind', 'tolerance.kind'],
}

/**
 * The form field an issue belongs to: the path itself when it names a field, else the
 * nearest field above it ('givens.0.rule' → 'givens.0.rule.kind', 'physics.cycle.states.1'
 * → 'physics.cycle'), else a section name ('givens').
 */
export function fieldPathForIssue(path: string): string {
  const m = ROW_KEY.exec(path) ?? /^(givens|constraints|finds)\.(\d{1,4})()$/.exec(path)
  const table = m?.[1]
  if (m && isRowTable(table)) {
    const rest = m[3] ?? ''
    const prefix = `${table}.${m[2]}`
    const field = ROW_FIELDS[table].find((f) => rest === f || rest.startsWith(`${f}.`))
    if (field) return `${prefix}.${field}`
    const head = rest.split('.')[0] ?? ''
    return `${prefix}.${ROW_FIELD_FALLBACK[table][head] ?? ROW_FIELD_FALLBACK[table]['']}`
  }
  if (path.startsWith('tags.topics')) return 'tags.topics'
  if (path.startsWith('physics.cycle')) return 'physics.cycle'
  const heater = /^physics\.inputs\.([A-Za-z][A-Za-z0-9_]*)\.(\d{1,2})(?:\.([A-Za-z_]+))?/.exec(path)
  if (heater) {
    const field = HEATER_FIELDS.some((f) => f === heater[3]) ? heater[3] : 'kind'
    return `physics.inputs.${heater[1]}.${heater[2]}.${field}`
  }
  if (path.startsWith('physics.inputs.')) return path.split('.').slice(0, 3).join('.')
  if (path === 'physics' || path === 'physics.kind' || path === 'physics.inputs') return 'physics.template'
  if (path === 'tags' || path === 'format') return 'title'
  return path
}

/** The id of the element a field path is rendered as (links in the error summary go there). */
export function fieldId(path: string): string {
  return `field-${path.replace(/[^A-Za-z0-9_-]/g, '-')}`
}

const TABLE_WORD: Record<RowTable, string> = { givens: 'Given', constraints: 'Constraint', finds: 'Find' }
const ROW_FIELD_WORDS: Record<string, string> = {
  name: 'name',
  label: 'label',
  unit: 'unit',
  'rule.kind': 'how it is drawn',
  'rule.min': 'lowest value',
  'rule.max': 'highest value',
  'rule.step': 'step',
  'rule.values': 'values',
  'rule.expression': 'expression',
  'display.decimals': 'decimals shown',
  'display.sigFigs': 'significant figures shown',
  left: 'left side',
  op: 'comparison',
  right: 'right side',
  message: 'message',
  'source.kind': 'where the answer comes from',
  'source.path': 'output path',
  'source.expression': 'expression',
  points: 'points',
  'tolerance.kind': 'tolerance kind',
  'tolerance.value': 'tolerance',
  'tolerance.unit': 'tolerance unit',
  'sigFigs.min': 'fewest significant figures',
  'sigFigs.max': 'most significant figures',
  pitfalls: 'pitfalls',
  sense: 'sense',
  isDifference: 'temperature difference',
  allowBareNumber: 'numbers without a unit',
}
const HEATER_FIELD_WORDS: Record<string, string> = {
  kind: 'kind',
  pressure: 'pressure',
  name: 'name',
  ttd: 'terminal temperature difference',
  drains: 'drains',
}
const FIELD_WORDS: Record<string, string> = {
  title: 'Title',
  'tags.topics': 'Topics',
  'tags.difficulty': 'Difficulty',
  'tags.level': 'Level',
  convention: 'Sign convention',
  visibility: 'Who can use it',
  prompt: 'Prompt',
  givens: 'Givens',
  constraints: 'Constraints',
  finds: 'Finds',
  'physics.template': 'Cycle',
  'physics.cycle': 'Cycle description (JSON)',
  _basedOn: 'Saved elsewhere',
}

/** Words for the field an issue is about, for the error summary ("Given 2, step"). */
export function describeField(path: string): string {
  const field = fieldPathForIssue(path)
  const row = matchRowKey(field)
  if (row) return `${TABLE_WORD[row.table]} ${row.index + 1}, ${ROW_FIELD_WORDS[row.field] ?? row.field}`
  const heater = /^physics\.inputs\.[A-Za-z0-9_]+\.(\d{1,2})\.([A-Za-z_]+)$/.exec(field)
  if (heater) return `Heater ${Number(heater[1]) + 1}, ${HEATER_FIELD_WORDS[heater[2]!] ?? heater[2]}`
  if (field.startsWith('physics.inputs.')) return `Template input ${field.slice('physics.inputs.'.length)}`
  return FIELD_WORDS[field] ?? field
}
