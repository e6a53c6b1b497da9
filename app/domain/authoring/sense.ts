/**
 * The sense of a work or heat find: which way its key counts positive. The solver states work
 * in the variant's convention (chemistry: w done ON the system; engineering: W done BY it) and
 * heat always as heat into the system, except the cycle totals, which are sizes (heat in, heat
 * out, the Rankine net, turbine and pump work, the refrigeration effect, compressor work and
 * heat rejected of a vapour-compression cycle). A find that states its sense gets the sign its
 * words promise in both conventions (variant.ts negates the solver's value when they differ);
 * one that states none keeps the solver's sign, as before.
 *
 * Also the word checks the lint uses: what a find's question says ("work done by the air",
 * "heat rejected") against the key's sign in each convention. Pure and light (no solver), so
 * the editor can run the warnings in the browser.
 */
import type { Convention } from '#app/domain/thermo/conventions.ts'
import type { FindSense, ProblemConvention, ProblemDefinition } from './definition.ts'
import { FIND_SENSE_WORDS } from './definition.ts'

export type SenseKind = 'work' | 'heat'

export function senseKind(sense: FindSense): SenseKind {
  return sense.startsWith('work') ? 'work' : 'heat'
}

/** The sense of the other direction: by ⇄ on, into ⇄ out of. */
export function oppositeSense(sense: FindSense): FindSense {
  switch (sense) {
    case 'work-by-system':
      return 'work-on-system'
    case 'work-on-system':
      return 'work-by-system'
    case 'heat-into-system':
      return 'heat-out-of-system'
    case 'heat-out-of-system':
      return 'heat-into-system'
  }
}

/** What a solver output path holds: work in the convention's sign, or a fixed sense, or neither. */
export type OutputSense =
  { readonly kind: 'convention-work' } | { readonly kind: 'fixed'; readonly sense: FindSense } | null

function isRankine(templateId: string | null): boolean {
  return templateId !== null && templateId.startsWith('rankine')
}

/** The refrigeration templates' result (refrigerants/refrigeration-template.ts): totals are sizes. */
function isRefrigeration(templateId: string | null): boolean {
  return (
    templateId === 'vapour-compression' ||
    templateId === 'vapour-compression-two-stage' ||
    templateId === 'vapour-compression-cascade'
  )
}

/** Totals of the refrigeration templates (single-stage, two-stage, cascade) that are sizes, by sense. */
const REFRIGERATION_TOTALS: Readonly<Record<string, FindSense>> = {
  compressorWork: 'work-on-system',
  compressorPower: 'work-on-system',
  lowStageWork: 'work-on-system',
  highStageWork: 'work-on-system',
  lowStagePower: 'work-on-system',
  highStagePower: 'work-on-system',
  lowerCompressorWork: 'work-on-system',
  upperCompressorWork: 'work-on-system',
  lowerCompressorPower: 'work-on-system',
  upperCompressorPower: 'work-on-system',
  refrigerationEffect: 'heat-into-system',
  refrigerationEffectPerKgEvaporator: 'heat-into-system',
  capacity: 'heat-into-system',
  heatRejected: 'heat-out-of-system',
  heatRejectionRate: 'heat-out-of-system',
}

/** The steady-flow templates (thermo/flow/flow-template.ts). */
function isSteadyFlow(templateId: string | null): boolean {
  return templateId === 'nozzle' || templateId === 'diffuser' || templateId === 'turbojet'
}

/**
 * Nozzle, diffuser, turbojet. Each device's q (and qRate) is heat into the gas; its w (and
 * wRate) is in the convention's sign, but only the turbojet's compressor (device 2) and turbine
 * (device 4) do work: the others' is zero in every convention, so a sense there would promise
 * nothing. The totals are sizes: compressor work and power are done on the air, turbine work by
 * it, the burner's heat goes in; a duct's heatIn and heatRate are heat into the gas (negative
 * when heat is lost). Thrust, velocities, kinetic-energy changes, propulsive power and the
 * efficiencies have no convention sign (null), nor does the net shaft work, which is zero.
 */
function steadyFlowSense(p: string, jet: boolean): OutputSense {
  const device = /^devices\.([^.]+)\.(w|q|wRate|qRate)$/.exec(p)
  if (device) {
    if (device[2] === 'q' || device[2] === 'qRate') return { kind: 'fixed', sense: 'heat-into-system' }
    return jet && (device[1] === '2' || device[1] === '4') ? { kind: 'convention-work' } : null
  }
  if (p === 'totals.heatIn' || p === 'totals.heatRate') return { kind: 'fixed', sense: 'heat-into-system' }
  if (jet && (p === 'totals.compressorWork' || p === 'totals.compressorPower'))
    return { kind: 'fixed', sense: 'work-on-system' }
  if (jet && p === 'totals.turbineWork') return { kind: 'fixed', sense: 'work-by-system' }
  return null
}

/**
 * The combined cycle (combined/combined-template.ts), per kg of gas: each device's w is in the
 * convention's sign and its q is heat into the working fluid; the totals are sizes — the gas
 * turbine's, the steam cycle's and the plant's net work and the power are done by the plant,
 * the compressor work on the gas, the combustor heat goes in, the stack loss and the condenser
 * heat leave. `netWorkSigned` keeps the convention's sign. The bottoming cycle's own paths
 * (bottoming.…, per kg of steam) read as a Rankine cycle's.
 */
const COMBINED_TOTALS: Readonly<Record<string, FindSense>> = {
  gasTurbineWork: 'work-by-system',
  gasNetWork: 'work-by-system',
  steamNetWork: 'work-by-system',
  netWork: 'work-by-system',
  power: 'work-by-system',
  compressorWork: 'work-on-system',
  heatIn: 'heat-into-system',
  hrsgHeat: 'heat-into-system',
  stackLoss: 'heat-out-of-system',
  condenserHeat: 'heat-out-of-system',
}

function combinedSense(p: string): OutputSense {
  if (p.startsWith('bottoming.')) return outputSense(p.slice('bottoming.'.length), 'rankine')
  if (/^devices\.[^.]+\.w$/.test(p) || p === 'totals.netWorkSigned') return { kind: 'convention-work' }
  if (/^devices\.[^.]+\.q$/.test(p)) return { kind: 'fixed', sense: 'heat-into-system' }
  const total = /^totals\.([A-Za-z]+)$/.exec(p)?.[1]
  const sense = total !== undefined && Object.hasOwn(COMBINED_TOTALS, total) ? COMBINED_TOTALS[total] : undefined
  return sense ? { kind: 'fixed', sense } : null
}

/**
 * The sense of the number at an output path. `templateId` is the physics template (null for a
 * general cycle): the Rankine templates state the net, turbine and pump work as sizes.
 */
export function outputSense(path: string, templateId: string | null): OutputSense {
  const p = path.trim()
  if (isSteadyFlow(templateId)) return steadyFlowSense(p, templateId === 'turbojet')
  if (templateId === 'combined-cycle') return combinedSense(p)
  if (isRefrigeration(templateId)) {
    // Each device's w is in the convention's sign (the compressor's is negative in the
    // engineering convention: work is done ON the refrigerant), its q is heat into the
    // refrigerant (the condenser's is negative). The totals are sizes: the compressor work and
    // power are done on the refrigerant, the refrigeration effect and capacity are heat taken
    // in from the cold space, the heat rejected leaves it.
    if (/^devices\.[^.]+\.w$/.test(p)) return { kind: 'convention-work' }
    if (/^devices\.[^.]+\.q$/.test(p)) return { kind: 'fixed', sense: 'heat-into-system' }
    // Two-stage and cascade: each compressor's work and power are done on the refrigerant too.
    const total = /^totals\.([A-Za-z]+)$/.exec(p)?.[1]
    const sense =
      total !== undefined && Object.hasOwn(REFRIGERATION_TOTALS, total) ? REFRIGERATION_TOTALS[total] : undefined
    return sense ? { kind: 'fixed', sense } : null
  }
  if (isRankine(templateId)) {
    if (/^devices\.[^.]+\.w$/.test(p) || p === 'totals.netWorkSigned') return { kind: 'convention-work' }
    if (p === 'totals.netWork' || p === 'totals.turbineWork') return { kind: 'fixed', sense: 'work-by-system' }
    if (p === 'totals.pumpWork') return { kind: 'fixed', sense: 'work-on-system' }
    if (/^devices\.[^.]+\.q$/.test(p) || p === 'totals.heatIn') return { kind: 'fixed', sense: 'heat-into-system' }
    if (p === 'totals.heatOut') return { kind: 'fixed', sense: 'heat-out-of-system' }
    // Cogeneration: the heat the process takes leaves the water (a size).
    if (p === 'totals.processHeat') return { kind: 'fixed', sense: 'heat-out-of-system' }
    return null
  }
  if (/^steps\.[^.]+\.(total\.)?w$/.test(p) || /^totals\.(total\.)?netWork$/.test(p)) return { kind: 'convention-work' }
  if (/^steps\.[^.]+\.(total\.)?q$/.test(p) || /^totals\.(total\.)?heatIn$/.test(p))
    return { kind: 'fixed', sense: 'heat-into-system' }
  if (/^totals\.(total\.)?heatOut$/.test(p)) return { kind: 'fixed', sense: 'heat-out-of-system' }
  // With a flow rate, the powers have the senses of the per-unit quantities they are ṁ times.
  if (/^steps\.[^.]+\.rate\.work$/.test(p) || p === 'totals.rate.netPower') return { kind: 'convention-work' }
  if (/^steps\.[^.]+\.rate\.heat$/.test(p) || p === 'totals.rate.heatIn')
    return { kind: 'fixed', sense: 'heat-into-system' }
  if (p === 'totals.rate.heatOut') return { kind: 'fixed', sense: 'heat-out-of-system' }
  return null
}

export function outputSenseKind(o: OutputSense): SenseKind | null {
  if (o === null) return null
  return o.kind === 'convention-work' ? 'work' : senseKind(o.sense)
}

/** The sense the solver's number has in one convention. */
export function solverSenseIn(o: NonNullable<OutputSense>, convention: Convention): FindSense {
  if (o.kind === 'fixed') return o.sense
  return convention === 'chemistry' ? 'work-on-system' : 'work-by-system'
}

/**
 * −1 when the key must be the solver's value negated to keep the stated sense, else 1 (no
 * sense, an expression find, a path that holds no work or heat, or a sense of the other kind:
 * the lint reports those last two).
 */
export function senseFactor(
  sense: FindSense | undefined,
  path: string | null,
  templateId: string | null,
  convention: Convention,
): 1 | -1 {
  if (sense === undefined || path === null) return 1
  const o = outputSense(path, templateId)
  if (o === null || outputSenseKind(o) !== senseKind(sense)) return 1
  return solverSenseIn(o, convention) === sense ? 1 : -1
}

// ---- Words --------------------------------------------------------------------------

const SYSTEM = String.raw`(?:gas|air|system|working fluid|fluid|steam|water|refrigerant|mixture|engine|cycle)`

const WORDS: Readonly<Record<FindSense, readonly RegExp[]>> = {
  'work-by-system': [
    new RegExp(String.raw`\bby (?:the )?${SYSTEM}\b`, 'i'),
    /\bwork (?:output|produced|delivered|developed)\b/i,
    /\b(?:produced|delivered|developed) by\b/i,
  ],
  'work-on-system': [
    new RegExp(String.raw`\b(?:done )?on (?:the )?${SYSTEM}\b`, 'i'),
    /\bdone on\b/i,
    /\bwork (?:input|required|consumed|supplied|added)\b/i,
    /\b(?:required|consumed) by\b/i,
  ],
  'heat-into-system': [
    /\b(?:added|supplied|absorbed|received)\b/i,
    new RegExp(String.raw`\b(?:into|to) (?:the )?${SYSTEM}\b`, 'i'),
    /\bheat input\b/i,
  ],
  'heat-out-of-system': [
    /\b(?:rejected|removed|released|lost|given off|extracted)\b/i,
    new RegExp(String.raw`\b(?:out of|from) (?:the )?${SYSTEM}\b`, 'i'),
    /\bheat output\b/i,
  ],
}

/** The phrase of `text` that states a sense of `kind`, or null when it states none or both ways. */
export function senseInWords(
  text: string,
  kind: SenseKind,
): { readonly sense: FindSense; readonly phrase: string } | null {
  const candidates: FindSense[] =
    kind === 'work' ? ['work-by-system', 'work-on-system'] : ['heat-into-system', 'heat-out-of-system']
  const hits: { sense: FindSense; phrase: string }[] = []
  for (const sense of candidates) {
    for (const re of WORDS[sense]) {
      const m = re.exec(text)
      if (m) {
        hits.push({ sense, phrase: m[0] })
        break
      }
    }
  }
  return hits.length === 1 ? hits[0]! : null
}

/** The kind a question's words are about, for finds whose path does not say ("Net work", "Heat added"). */
export function kindInWords(text: string): SenseKind | null {
  const work = /\bwork\b/i.test(text)
  const heat = /\bheat\b/i.test(text)
  return work === heat ? null : work ? 'work' : 'heat'
}

// ---- Warnings -----------------------------------------------------------------------

export type ProblemVisibility = 'private' | 'department' | 'installation'

export interface SenseFinding {
  readonly path: string
  readonly message: string
}

function conventionsOf(c: ProblemConvention): readonly Convention[] {
  return c === 'course' ? ['engineering', 'chemistry'] : [c]
}

const CONVENTION_WORDS: Readonly<Record<Convention, string>> = {
  chemistry: 'a chemistry-convention course',
  engineering: 'an engineering-convention course',
}

/**
 * A stated sense on a path it cannot apply to: these would silently leave the key unchanged,
 * so the lint refuses them.
 */
export function senseErrors(def: ProblemDefinition): SenseFinding[] {
  const out: SenseFinding[] = []
  const templateId = def.physics.kind === 'template' ? def.physics.template : null
  def.finds.forEach((f, i) => {
    if (f.sense === undefined || f.source.kind !== 'output') return
    const o = outputSense(f.source.path, templateId)
    const kind = outputSenseKind(o)
    if (kind === null) {
      out.push({
        path: `finds.${i}.sense`,
        message: `A sense is for work and heat only, and "${f.source.path}" is neither: choose "No sense stated".`,
      })
    } else if (kind !== senseKind(f.sense)) {
      out.push({
        path: `finds.${i}.sense`,
        message: `"${f.source.path}" is ${kind === 'work' ? 'a work' : 'a heat'} output, but the sense says ${FIND_SENSE_WORDS[f.sense]}: choose a ${kind} sense or none.`,
      })
    }
  })
  return out
}

/**
 * Warnings that do not stop a save: a question whose words and key disagree in some
 * convention, and a work or heat find with no sense in a problem shared across courses.
 */
export function senseWarnings(
  def: ProblemDefinition,
  options: { readonly visibility?: ProblemVisibility } = {},
): SenseFinding[] {
  const out: SenseFinding[] = []
  const templateId = def.physics.kind === 'template' ? def.physics.template : null
  const shared = options.visibility === 'department' || options.visibility === 'installation'
  def.finds.forEach((f, i) => {
    const o = f.source.kind === 'output' ? outputSense(f.source.path, templateId) : null
    const pathKind = outputSenseKind(o)
    if (f.sense !== undefined && pathKind !== null && pathKind !== senseKind(f.sense)) return // an error already
    const kind: SenseKind | null = f.sense !== undefined ? senseKind(f.sense) : (pathKind ?? kindInWords(f.label))
    if (kind === null) return
    const words = senseInWords(f.label, kind)
    if (words !== null) {
      if (f.sense !== undefined) {
        if (f.sense !== words.sense) {
          out.push({
            path: `finds.${i}.sense`,
            message: `The question says "${words.phrase}" (${FIND_SENSE_WORDS[words.sense]}), but the find's sense is ${FIND_SENSE_WORDS[f.sense]}, so the key has the opposite sign to the words.`,
          })
        }
      } else if (o !== null) {
        const wrong = conventionsOf(def.convention).find((c) => solverSenseIn(o, c) !== words.sense)
        if (wrong !== undefined) {
          const where =
            o.kind === 'fixed'
              ? `the key ("${f.source.kind === 'output' ? f.source.path : ''}") is the ${FIND_SENSE_WORDS[o.sense]} in every convention`
              : `${def.convention === 'course' ? `in ${CONVENTION_WORDS[wrong]}` : `in the ${wrong} convention this problem uses`} the key is the ${FIND_SENSE_WORDS[solverSenseIn(o, wrong)]}`
          out.push({
            path: `finds.${i}.sense`,
            message: `The question says "${words.phrase}" (${FIND_SENSE_WORDS[words.sense]}), but ${where}, with the opposite sign. State the sense "${FIND_SENSE_WORDS[words.sense]}" so the key keeps the sign the words promise.`,
          })
          return
        }
      }
    }
    if (shared && f.sense === undefined) {
      const flips = o !== null && o.kind === 'convention-work' && def.convention === 'course'
      out.push({
        path: `finds.${i}.sense`,
        message: flips
          ? `This problem is shared with other courses, and this find's key changes sign with the course's convention (work done on the system in chemistry-convention courses, by it in engineering ones). State its sense so every course gets the sign the question means.`
          : `This problem is shared with other courses: state this ${kind} find's sense so the sign of its key is written down, whatever convention a course uses.`,
      })
    }
  })
  return out
}
