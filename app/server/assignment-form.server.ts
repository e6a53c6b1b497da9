/**
 * The assignment form as the new and edit pages show it: every field as text (so nothing
 * typed is lost on an error), reading it from the posted form, starting values, adding and
 * removing problem rows, the settings' checks, and one submission of the form (add a row,
 * remove one, or save through the caller's `save`). No database: checking the problem rows
 * against the bank and saving are in assignments.server.ts.
 */
import { z } from 'zod'
import { toLocalDateTimeValue } from '#app/lib/dates.ts'
import type { FieldErrors } from '#app/lib/form.ts'
import type { VersionCheck } from './assignment-items.server.ts'
import type { Assignment } from './db/schema.server.ts'

/** One row of the problems table as typed: the chosen version, the points, and the item it edits. */
export type ItemRow = {
  itemId: string
  versionId: string
  points: string
  /** the id of the version the instructor assigns although its check failed, could not run, is running or never ran; an override of another version counts for nothing */
  override?: string
}

/** What the assignment form shows: every field as text, so that nothing typed is lost on an error. */
export type AssignmentFormState = {
  values: {
    title: string
    instructions: string
    opensAt: string
    dueAt: string
    attemptsPerFind: string
    latePolicy: string
    latePenaltyPercentPerDay: string
    lateDaysAllowed: string
    keyRelease: string
    /** days after the grades' release during which students may dispute; blank or missing: 7 for a new assignment, unchanged on edit */
    disputeDays: string
  }
  items: ItemRow[]
}

/** A bank problem the instructor may choose, with its versions (newest first). */
export type BankChoice = {
  problemId: number
  title: string
  versions: { id: number; number: number; savedAt: Date; author: string; check: VersionCheck }[]
}

/** An item students have answered: only a regrade changes its version or points. */
export type LockedItem = { itemId: number; position: number; title: string; versionNumber: number; points: number }

const ITEM_KEY = /^items\.(\d{1,3})\.(itemId|versionId|points|override)$/
export const MAX_ITEMS = 50

function text(form: FormData, name: string): string {
  const v = form.get(name)
  return typeof v === 'string' ? v : ''
}

const ITEM_FIELDS = ['itemId', 'versionId', 'points', 'override'] as const satisfies readonly (keyof ItemRow)[]

function isItemField(name: string | undefined): name is (typeof ITEM_FIELDS)[number] {
  return ITEM_FIELDS.some((f) => f === name)
}

/** The form's fields as typed (rows in the order of their index). */
export function assignmentFormFromData(form: FormData): AssignmentFormState {
  const rows = new Map<number, ItemRow>()
  for (const [key, value] of form.entries()) {
    const m = ITEM_KEY.exec(key)
    if (!m || typeof value !== 'string') continue
    const i = Number(m[1])
    const field = m[2]
    if (!isItemField(field)) continue
    const row = rows.get(i) ?? { itemId: '', versionId: '', points: '' }
    row[field] = value
    rows.set(i, row)
  }
  return {
    values: {
      title: text(form, 'title'),
      instructions: text(form, 'instructions'),
      opensAt: text(form, 'opensAt'),
      dueAt: text(form, 'dueAt'),
      attemptsPerFind: text(form, 'attemptsPerFind'),
      latePolicy: text(form, 'latePolicy'),
      latePenaltyPercentPerDay: text(form, 'latePenaltyPercentPerDay'),
      lateDaysAllowed: text(form, 'lateDaysAllowed'),
      keyRelease: text(form, 'keyRelease'),
      disputeDays: text(form, 'disputeDays'),
    },
    items: [...rows.entries()].sort((x, y) => x[0] - y[0]).map(([, r]) => r),
  }
}

/** A new assignment's starting values: opens at the next full hour, due a week later at 23:59, in the course's zone. */
export function newAssignmentForm(timeZone: string, now = new Date()): AssignmentFormState {
  const nextHour = new Date(Math.ceil(now.getTime() / 3_600_000) * 3_600_000)
  const opens = toLocalDateTimeValue(nextHour, timeZone)
  const due = toLocalDateTimeValue(new Date(nextHour.getTime() + 7 * 86_400_000), timeZone).slice(0, 10) + 'T23:59'
  return {
    values: {
      title: '',
      instructions: '',
      opensAt: opens,
      dueAt: due,
      attemptsPerFind: '3',
      latePolicy: 'closed',
      latePenaltyPercentPerDay: '10',
      lateDaysAllowed: '3',
      keyRelease: 'after-due',
      disputeDays: String(DEFAULT_DISPUTE_DAYS),
    },
    items: [{ itemId: '', versionId: '', points: '10' }],
  }
}

export function formOfAssignment(
  a: Assignment,
  items: { id: number; problemVersionId: number; points: number }[],
  timeZone: string,
): AssignmentFormState {
  return {
    values: {
      title: a.title,
      instructions: a.instructions,
      opensAt: toLocalDateTimeValue(a.opensAt, timeZone),
      dueAt: toLocalDateTimeValue(a.dueAt, timeZone),
      attemptsPerFind: String(a.attemptsPerFind),
      latePolicy: a.latePolicy,
      latePenaltyPercentPerDay: String(a.latePenaltyPercentPerDay),
      lateDaysAllowed: String(a.lateDaysAllowed),
      keyRelease: a.keyRelease,
      disputeDays: String(a.disputeDays),
    },
    items: items.map((i) => ({
      itemId: String(i.id),
      versionId: String(i.problemVersionId),
      points: String(i.points),
    })),
  }
}

/** Adds an empty row, or removes row `index` (an answered item stays: it is refused with a message). */
export function changeRows(
  state: AssignmentFormState,
  change: { add: true } | { remove: number },
  locked: readonly LockedItem[] = [],
): { state: AssignmentFormState; fieldErrors: FieldErrors } {
  if ('add' in change) {
    if (state.items.length >= MAX_ITEMS)
      return { state, fieldErrors: { items: `An assignment holds at most ${MAX_ITEMS} problems.` } }
    return {
      state: { ...state, items: [...state.items, { itemId: '', versionId: '', points: '10' }] },
      fieldErrors: {},
    }
  }
  const row = state.items[change.remove]
  if (!row) return { state, fieldErrors: {} }
  if (locked.some((l) => String(l.itemId) === row.itemId)) {
    return {
      state,
      fieldErrors: {
        [`items.${change.remove}.versionId`]: 'Students have answered this problem, so it stays in the assignment.',
      },
    }
  }
  return { state: { ...state, items: state.items.filter((_, i) => i !== change.remove) }, fieldErrors: {} }
}

/** Days after the grades' release during which students may dispute a verdict (issue #7). */
export const DEFAULT_DISPUTE_DAYS = 7
export const MAX_DISPUTE_DAYS = 60

const LocalDateTime = z.string().trim().min(1, 'Enter a date and time.')
const Int = (label: string, min: number, max: number) =>
  z
    .string()
    .trim()
    .min(1, `Enter ${label}.`)
    .regex(/^\d+$/, `Enter ${label} as a whole number.`)
    .transform(Number)
    .pipe(
      z
        .number()
        .min(min, `${label[0]!.toUpperCase()}${label.slice(1)} must be at least ${min}.`)
        .max(max, `${label[0]!.toUpperCase()}${label.slice(1)} must be at most ${max}.`),
    )
export const Num = (label: string, min: number, max: number) =>
  z
    .string()
    .trim()
    .min(1, `Enter ${label}.`)
    .regex(/^\d+(\.\d+)?$/, `Enter ${label} as a number such as 10 or 2.5.`)
    .transform(Number)
    .pipe(
      z
        .number()
        .min(min, `${label[0]!.toUpperCase()}${label.slice(1)} must be at least ${min}.`)
        .max(max, `${label[0]!.toUpperCase()}${label.slice(1)} must be at most ${max}.`),
    )

export const AssignmentSettingsSchema = z
  .object({
    title: z.string().trim().min(1, 'Give the assignment a title.').max(200, 'Keep the title under 200 characters.'),
    instructions: z.string().max(20_000, 'Keep the instructions under 20,000 characters.'),
    opensAt: LocalDateTime,
    dueAt: LocalDateTime,
    attemptsPerFind: Int('the attempts per find', 1, 100),
    latePolicy: z.enum(['closed', 'penalty'], { message: 'Choose what happens after the due date.' }),
    latePenaltyPercentPerDay: z.string(),
    lateDaysAllowed: z.string(),
    keyRelease: z.enum(['after-due', 'manual'], { message: 'Choose when the key is released.' }),
    disputeDays: z.string().optional(),
  })
  .superRefine((v, ctx) => {
    if (v.disputeDays !== undefined && v.disputeDays.trim() !== '') {
      const d = Int('the days for disputes', 0, MAX_DISPUTE_DAYS).safeParse(v.disputeDays)
      if (!d.success) ctx.addIssue({ code: 'custom', path: ['disputeDays'], message: d.error.issues[0]!.message })
    }
    if (v.latePolicy !== 'penalty') return
    const pct = Num('the penalty per day', 0, 100).safeParse(v.latePenaltyPercentPerDay)
    if (!pct.success)
      ctx.addIssue({ code: 'custom', path: ['latePenaltyPercentPerDay'], message: pct.error.issues[0]!.message })
    const days = Int('the days late accepted', 0, 60).safeParse(v.lateDaysAllowed)
    if (!days.success)
      ctx.addIssue({ code: 'custom', path: ['lateDaysAllowed'], message: days.error.issues[0]!.message })
  })

export type SaveResult = { ok: true; assignmentId: number } | { ok: false; fieldErrors: FieldErrors; formError: string }

export const SUMMARY = 'The assignment was not saved. Correct the fields marked below.'

// ---- The form's action (new and edit pages) ------------------------------------------------

export type AssignmentFormAnswer = {
  state: AssignmentFormState
  fieldErrors: FieldErrors
  formError?: string
  nonce: string
}

const IntentSchema = z.union([z.literal('save'), z.literal('add-item'), z.string().regex(/^remove-item:\d{1,3}$/)])

function formAnswer(
  state: AssignmentFormState,
  fieldErrors: FieldErrors = {},
  formError?: string,
): AssignmentFormAnswer {
  // A fresh nonce remounts the form, so refilled values replace what the browser kept.
  return { state, fieldErrors, ...(formError ? { formError } : {}), nonce: crypto.randomUUID() }
}

/**
 * One submission of the assignment form: adding or removing a row answers with the form as
 * typed; saving calls `save` and answers with the id, or with the errors (status 400).
 * Permission errors from `save` propagate (the route turns them into 403/404 pages).
 */
export async function runAssignmentFormAction(
  form: FormData,
  opts: { locked: readonly LockedItem[]; save: (state: AssignmentFormState) => Promise<SaveResult> },
): Promise<{ status: 200 | 400; answer: AssignmentFormAnswer } | { status: 'saved'; assignmentId: number }> {
  const state = assignmentFormFromData(form)
  const intent = IntentSchema.safeParse(form.get('intent'))
  if (!intent.success)
    return { status: 400, answer: formAnswer(state, { title: 'Use one of the buttons of the form.' }, SUMMARY) }
  if (intent.data === 'add-item') {
    const changed = changeRows(state, { add: true }, opts.locked)
    return { status: 200, answer: formAnswer(changed.state, changed.fieldErrors) }
  }
  if (intent.data.startsWith('remove-item:')) {
    const changed = changeRows(state, { remove: Number(intent.data.slice('remove-item:'.length)) }, opts.locked)
    return { status: 200, answer: formAnswer(changed.state, changed.fieldErrors) }
  }
  const result = await opts.save(state)
  if (result.ok) return { status: 'saved', assignmentId: result.assignmentId }
  return { status: 400, answer: formAnswer(state, result.fieldErrors, result.formError) }
}
