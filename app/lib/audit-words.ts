/**
 * The audit log in people's words: what each entry did ("Regrade of “Net work per unit mass”
 * (problem 2), version 1 → 2") and what it changed ("incorrect → correct; score 0 → 3 of 3",
 * "due Sun 12 Oct 2026, 17:00 → Tue 14 Oct 2026, 17:00"), with the question's label instead of
 * its internal name, people and terms by name, and times in the course's zone.
 *
 * Pure and isomorphic: the server looks up the names an entry refers to (the question, the
 * student, the term, the problem versions) and hands them in; nothing here reads a database.
 * Every kind of entry written today has its own wording; a kind this module does not know
 * gets a generic line built from its before and after values, so nothing is ever hidden.
 */
import { formatInZone } from './dates.ts'
import { isKeyOf, isRecord } from './guards.ts'
import { DISPUTE_STATUS_LABELS, inSentence, verdictLabel } from './labels.ts'
import { formatPoints } from './points.ts'

/** Each kind of entry written today, as a short label (the page's filter lists these). */
export const AUDIT_KIND_WORDS: Readonly<Record<string, string>> = {
  regrade: 'Regrade',
  'dispute-raised': 'Dispute raised',
  dispute: 'Score changed by a dispute',
  'dispute-resolved': 'Dispute resolved',
  extension: 'Extension',
  'key-released': 'Key released',
  'grades-released': 'Grades released',
  'assignment-changed': 'Assignment changed',
  'assignment-check-overridden': 'Version assigned over its check',
  'assignment-deleted': 'Assignment deleted',
  'course-created': 'Course created',
  'course-settings-changed': 'Course settings changed',
  'course-copied': 'Course copied',
  'instructor-added': 'Instructor added',
  'roster-import': 'Class list imported',
  'invitation-resent': 'Invitation sent again',
  'invitation-revoked': 'Invitation revoked',
  'student-dropped': 'Student dropped',
  'student-undropped': 'Drop undone',
  'section-created': 'Section added',
  'section-renamed': 'Section renamed',
  'section-deleted': 'Section deleted',
  'student-section': 'Student’s section changed',
  'section-staff': 'TA of a section changed',
}

/** What the server found out about an entry: the names behind its ids. */
export type AuditEntryFacts = {
  kind: string
  before: unknown
  after: unknown
  note: string
  /** the person the entry is about (a student, a TA, an instructor), by name */
  subject: string | null
  assignmentTitle: string | null
  /** the assignment's own due date (ISO), the "before" of a first extension */
  assignmentDueAt: string | null
  /** the question (find) the entry is about: its label from the problem definition */
  question: { label: string; position: number | null } | null
  /** the most that question's answer can earn */
  maxScore: number | null
  /** a regrade's versions, by their numbers */
  regrade: { fromVersion: number | null; toVersion: number | null } | null
}

/** Names for ids inside before/after values, keyed by the id as text. */
export type AuditLookups = {
  timeZone: string
  terms?: Readonly<Record<string, string>>
  /** problem version id → its problem's title and version number */
  versions?: Readonly<Record<string, { title: string; number: number }>>
}

export type AuditWords = {
  /** the kind as a short label */
  kind: string
  /** what happened, in a sentence */
  what: string
  /** before → after, in words; null when the entry is an event with nothing before it */
  change: string | null
  /** why (the note staff wrote, or the system's reason in words) */
  note: string
}

// ---- Small pieces --------------------------------------------------------------------------

/** Verdicts and dispute statuses in the product's one set of words (labels.ts), inside a sentence. */
const disputeStatusText = (v: unknown): string =>
  isKeyOf(DISPUTE_STATUS_LABELS, v) ? inSentence(DISPUTE_STATUS_LABELS[v]) : String(v ?? 'resolved')
const LATE_POLICY_WORDS: Readonly<Record<string, string>> = {
  closed: 'no late answers',
  penalty: 'late answers with a penalty',
}
const KEY_RELEASE_WORDS: Readonly<Record<string, string>> = { 'after-due': 'after the due date', manual: 'by hand' }
const CONVENTION_WORDS: Readonly<Record<string, string>> = {
  chemistry: 'chemistry (work done on the system is positive)',
  engineering: 'engineering (work done by the system is positive)',
}
const ROLE_WORDS: Readonly<Record<string, string>> = {
  instructor: 'instructor',
  ta: 'teaching assistant',
  student: 'student',
}

const rec = (v: unknown): Record<string, unknown> => (isRecord(v) ? v : {})
const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null)
const str = (v: unknown): string | null => (typeof v === 'string' ? v : null)
const plural = (n: number, one: string, many = `${one}s`) =>
  `${Number.isInteger(n) ? n : formatPoints(n)} ${n === 1 ? one : many}`
const quoted = (s: string) => `“${s}”`
const ISO = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/

function when(iso: unknown, timeZone: string): string {
  if (typeof iso !== 'string' || Number.isNaN(new Date(iso).getTime())) return 'none'
  return formatInZone(iso, timeZone, { withZone: false })
}

function arrow(a: string, b: string): string {
  return `${a} → ${b}`
}

/** "“Net work per unit mass” (problem 2)", or "a question" when the entry names none. */
function questionText(q: AuditEntryFacts['question']): string {
  if (!q) return 'a question'
  return q.position === null ? quoted(q.label) : `${quoted(q.label)} (problem ${q.position})`
}

function verdictText(v: unknown): string {
  return inSentence(verdictLabel(v))
}

/** "score 1.5 → 3 of 3" (or "score 3 of 3" when it stayed), with "of max" when known. */
export function scoreChange(before: number | null, after: number | null, max: number | null): string {
  const of = max !== null ? ` of ${formatPoints(max)}` : ''
  const b = before === null ? 'none' : formatPoints(before)
  const a = after === null ? 'none' : formatPoints(after)
  if (b === a) return `score ${a}${of}`
  return `score ${b} → ${a}${of}`
}

/** A grade's change: "incorrect → correct; score 0 → 3 of 3". */
function gradeChange(before: unknown, after: unknown, max: number | null): string {
  const b = rec(before)
  const a = rec(after)
  const parts: string[] = []
  if ('verdict' in b || 'verdict' in a) {
    const vb = verdictText(b.verdict)
    const va = verdictText(a.verdict)
    parts.push(vb === va ? va : arrow(vb, va))
  }
  parts.push(scoreChange(num(b.score), num(a.score), max))
  return parts.join('; ')
}

// ---- Generic wording (kinds this module does not know) -----------------------------------

/** "lateDaysAllowed" → "late days allowed". */
export function keyWords(key: string): string {
  return key
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/[_-]+/g, ' ')
    .toLowerCase()
    .trim()
}

function valueWords(v: unknown, timeZone: string): string {
  if (v === null || v === undefined) return 'none'
  if (typeof v === 'number') return Number.isFinite(v) ? String(Number(v.toPrecision(6))) : 'none'
  if (typeof v === 'boolean') return v ? 'yes' : 'no'
  if (typeof v === 'string') return ISO.test(v) ? when(v, timeZone) : v === '' ? 'empty' : quoted(v)
  if (Array.isArray(v))
    return v.every((x) => typeof x === 'string')
      ? v.map((x) => quoted(String(x))).join(', ') || 'none'
      : plural(v.length, 'entry', 'entries')
  return 'a value'
}

/** Ids mean nothing to a reader: keys naming one are left out of generic wording. */
const isIdKey = (k: string) => /(^id$|Id$|Ids$)/.test(k)

/** Every key of either side, "key a → b" where they differ, "key b" where only after has it. */
export function genericChange(before: unknown, after: unknown, timeZone: string): string | null {
  if (!isRecord(before) && !isRecord(after)) {
    if ((before === null || before === undefined) && (after === null || after === undefined)) return null
    return arrow(valueWords(before, timeZone), valueWords(after, timeZone))
  }
  const b = rec(before)
  const a = rec(after)
  const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])].filter((k) => !isIdKey(k))
  const parts: string[] = []
  for (const k of keys) {
    const vb = valueWords(b[k], timeZone)
    const va = valueWords(a[k], timeZone)
    if (!(k in b) || !isRecord(before)) parts.push(`${keyWords(k)} ${va}`)
    else if (!(k in a) || !isRecord(after)) parts.push(`${keyWords(k)} ${vb} → removed`)
    else if (vb !== va) parts.push(`${keyWords(k)} ${arrow(vb, va)}`)
  }
  return parts.length ? parts.join('; ') : null
}

/** "something-new" → "Something new". */
function kindLabel(kind: string): string {
  const known = AUDIT_KIND_WORDS[kind]
  if (known) return known
  const words = keyWords(kind)
  return words ? words[0]!.toUpperCase() + words.slice(1) : 'Change'
}

// ---- Assignment settings ------------------------------------------------------------------

function itemsWords(v: unknown, lookups: AuditLookups): string {
  if (!Array.isArray(v) || v.length === 0) return 'no problems'
  return v
    .map((raw, i) => {
      const it = rec(raw)
      const version = it.versionId !== undefined ? lookups.versions?.[String(it.versionId)] : undefined
      const name = version ? `${version.title} (version ${version.number})` : 'a problem'
      return `${i + 1}. ${name}, ${plural(num(it.points) ?? 0, 'point')}`
    })
    .join('; ')
}

function settingChange(key: string, b: unknown, a: unknown, lookups: AuditLookups): string {
  const tz = lookups.timeZone
  switch (key) {
    case 'title':
      return `title ${arrow(valueWords(b, tz), valueWords(a, tz))}`
    case 'instructions':
      return 'instructions changed'
    case 'opensAt':
      return `opens ${arrow(when(b, tz), when(a, tz))}`
    case 'dueAt':
      return `due ${arrow(when(b, tz), when(a, tz))}`
    case 'attemptsPerFind':
      return `attempts per question ${arrow(valueWords(b, tz), valueWords(a, tz))}`
    case 'latePolicy':
      return `late answers: ${arrow(LATE_POLICY_WORDS[String(b)] ?? String(b), LATE_POLICY_WORDS[String(a)] ?? String(a))}`
    case 'latePenaltyPercentPerDay':
      return `late penalty ${arrow(`${valueWords(b, tz)} %`, `${valueWords(a, tz)} %`)} per day`
    case 'lateDaysAllowed':
      return `late days allowed ${arrow(valueWords(b, tz), valueWords(a, tz))}`
    case 'keyRelease':
      return `key released ${arrow(KEY_RELEASE_WORDS[String(b)] ?? String(b), KEY_RELEASE_WORDS[String(a)] ?? String(a))}`
    case 'disputeDays':
      return `disputes allowed for ${arrow(valueWords(b, tz), valueWords(a, tz))} days after grades are released`
    case 'items':
      return `problems: ${arrow(itemsWords(b, lookups), itemsWords(a, lookups))}`
    default:
      return `${keyWords(key)} ${arrow(valueWords(b, tz), valueWords(a, tz))}`
  }
}

function courseSettingChange(key: string, b: unknown, a: unknown, tz: string): string {
  switch (key) {
    case 'code':
      return `code ${arrow(String(b), String(a))}`
    case 'title':
      return `title ${arrow(valueWords(b, tz), valueWords(a, tz))}`
    case 'timeZone':
      return `time zone ${arrow(String(b), String(a))}`
    case 'signConvention':
      return `sign convention ${arrow(CONVENTION_WORDS[String(b)] ?? String(b), CONVENTION_WORDS[String(a)] ?? String(a))}`
    default:
      return `${keyWords(key)} ${arrow(valueWords(b, tz), valueWords(a, tz))}`
  }
}

// ---- Extensions ---------------------------------------------------------------------------

function extensionSide(side: Record<string, unknown>, fallbackDue: string | null, tz: string): string {
  const due = str(side.dueAt)
    ? `due ${when(side.dueAt, tz)}`
    : fallbackDue
      ? `due ${when(fallbackDue, tz)} (the assignment’s)`
      : 'the assignment’s due date'
  const extra = num(side.extraAttempts) ?? 0
  return extra > 0 ? `${due}, ${plural(extra, 'extra attempt')}` : due
}

function extensionWords(f: AuditEntryFacts, tz: string): { what: string; change: string | null } {
  const who = f.subject ?? 'a student'
  const b = isRecord(f.before) ? f.before : null
  const a = isRecord(f.after) ? f.after : null
  if (!a && b)
    return {
      what: `Extension of ${who} removed`,
      change: arrow(extensionSide(b, f.assignmentDueAt, tz), extensionSide({}, f.assignmentDueAt, tz)),
    }
  if (a && !b)
    return {
      what: `Extension given to ${who}`,
      change: arrow(extensionSide({}, f.assignmentDueAt, tz), extensionSide(a, f.assignmentDueAt, tz)),
    }
  if (a && b) {
    const parts: string[] = []
    if (str(b.dueAt) !== str(a.dueAt)) {
      const side = (s: Record<string, unknown>) =>
        str(s.dueAt)
          ? when(s.dueAt, tz)
          : f.assignmentDueAt
            ? `${when(f.assignmentDueAt, tz)} (the assignment’s)`
            : 'the assignment’s'
      parts.push(`due ${arrow(side(b), side(a))}`)
    }
    if ((num(b.extraAttempts) ?? 0) !== (num(a.extraAttempts) ?? 0))
      parts.push(`extra attempts ${arrow(String(num(b.extraAttempts) ?? 0), String(num(a.extraAttempts) ?? 0))}`)
    if ((str(b.reason) ?? '') !== (str(a.reason) ?? '')) parts.push('reason changed')
    return { what: `Extension of ${who} changed`, change: parts.length ? parts.join('; ') : 'nothing changed' }
  }
  return { what: `Extension of ${who}`, change: null }
}

// ---- The one entry point -------------------------------------------------------------------

/** An audit entry in words. Never throws: unexpected shapes fall back to generic wording. */
export function describeAuditEntry(f: AuditEntryFacts, lookups: AuditLookups): AuditWords {
  try {
    return { kind: kindLabel(f.kind), ...words(f, lookups) }
  } catch {
    return {
      kind: kindLabel(f.kind),
      what: kindLabel(f.kind),
      change: genericChange(f.before, f.after, lookups.timeZone),
      note: f.note,
    }
  }
}

function words(f: AuditEntryFacts, lookups: AuditLookups): { what: string; change: string | null; note: string } {
  const tz = lookups.timeZone
  const b = rec(f.before)
  const a = rec(f.after)
  const who = f.subject ?? 'a student'
  const q = questionText(f.question)
  switch (f.kind) {
    case 'regrade': {
      const versions =
        f.regrade && f.regrade.fromVersion !== null && f.regrade.toVersion !== null
          ? f.regrade.fromVersion === f.regrade.toVersion
            ? `, version ${f.regrade.toVersion} with a new tolerance`
            : `, version ${arrow(String(f.regrade.fromVersion), String(f.regrade.toVersion))}`
          : ''
      const removed = a.verdict === 'removed' || /not part of the new version/.test(f.note)
      return {
        what: `Regrade of ${q}${versions} for ${who}`,
        change: gradeChange(f.before, removed ? { ...a, verdict: 'removed' } : f.after, removed ? null : f.maxScore),
        note: removed ? 'The new version no longer asks this question.' : '',
      }
    }
    case 'dispute':
      return {
        what: `Score of ${who} on ${q} changed on review of a dispute`,
        change: gradeChange(f.before, f.after, f.maxScore),
        note: f.note,
      }
    case 'dispute-raised':
      return { what: `${who} disputed the grade on ${q}`, change: null, note: f.note }
    case 'dispute-resolved': {
      const status = disputeStatusText(a.status)
      const changed = num(a.changed)
      const others = changed !== null && changed > 0 ? `; ${plural(changed, 'answer')} changed` : ''
      return {
        what: `Dispute of ${who} on ${q} resolved: ${status}`,
        change: `${scoreChange(num(b.score), num(a.score), f.maxScore)}${others}`,
        note: f.note,
      }
    }
    case 'extension':
      return { ...extensionWords(f, tz), note: f.note }
    case 'key-released':
      return {
        what: `Key and worked solutions of ${f.assignmentTitle ? quoted(f.assignmentTitle) : 'the assignment'} released`,
        change: str(a.keyReleasedAt) ? `released ${when(a.keyReleasedAt, tz)}` : null,
        note: f.note,
      }
    case 'grades-released': {
      const mailed = num(a.mailed)
      const parts = [
        mailed !== null ? `${plural(mailed, 'student')} e-mailed` : null,
        a.early === true ? 'released before every student’s window closed' : null,
      ].filter(Boolean)
      return {
        what: `Grades of ${f.assignmentTitle ? quoted(f.assignmentTitle) : 'the assignment'} released${a.early === true ? ' early' : ''}`,
        change: parts.length ? parts.join('; ') : null,
        note: f.note,
      }
    }
    case 'assignment-check-overridden': {
      const list = (Array.isArray(a.items) ? a.items : []).filter(isRecord)
      return {
        what: `${f.assignmentTitle ? quoted(f.assignmentTitle) : 'An assignment'}: ${list.length === 1 ? 'a version' : `${list.length} versions`} assigned although the check did not pass`,
        change: list.length ? list.map((x) => `problem ${String(x.position)}: ${String(x.check)}`).join('; ') : null,
        note: f.note,
      }
    }
    case 'assignment-deleted': {
      // The assignment is gone, so its title comes from the row itself.
      const title = str(b.title) ?? f.assignmentTitle
      const items = num(b.items)
      const extensions = num(b.extensions)
      const parts = [
        str(b.opensAt) ? `opened ${when(b.opensAt, tz)}` : null,
        str(b.dueAt) ? `due ${when(b.dueAt, tz)}` : null,
        items !== null ? plural(items, 'problem') : null,
        extensions ? `${plural(extensions, 'extension')} removed with it` : null,
      ].filter(Boolean)
      return {
        what: `Assignment ${title ? quoted(title) : 'without a title'} deleted (nobody had answered it)`,
        change: parts.length ? parts.join('; ') : null,
        note: f.note,
      }
    }
    case 'assignment-changed': {
      const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])]
      return {
        what: `${f.assignmentTitle ? quoted(f.assignmentTitle) : 'An assignment'} changed`,
        change: keys.length ? keys.map((k) => settingChange(k, b[k], a[k], lookups)).join('; ') : null,
        note: f.note,
      }
    }
    case 'course-created': {
      const term = num(a.termId) !== null ? lookups.terms?.[String(a.termId)] : undefined
      const parts = [
        term ? `in ${term}` : null,
        str(a.signConvention) ? `${str(a.signConvention)} sign convention` : null,
        str(a.timeZone) ? `times in ${str(a.timeZone)}` : null,
      ].filter(Boolean)
      return {
        what: `Course ${str(a.code) ?? ''} ${str(a.title) ? quoted(str(a.title)!) : ''} created`
          .replace(/\s+/g, ' ')
          .trim(),
        change: parts.length ? parts.join(', ') : null,
        note: f.note,
      }
    }
    case 'course-settings-changed': {
      const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])]
      return {
        what: 'Course settings changed',
        change: keys.length ? keys.map((k) => courseSettingChange(k, b[k], a[k], tz)).join('; ') : null,
        note: f.note,
      }
    }
    case 'course-copied': {
      const fromTerm = num(b.termId) !== null ? lookups.terms?.[String(b.termId)] : undefined
      const toTerm = num(a.termId) !== null ? lookups.terms?.[String(a.termId)] : undefined
      const offset = num(a.offsetDays)
      const n = Array.isArray(a.assignments) ? a.assignments.length : null
      const staff = num(a.instructors)
      const parts = [
        n !== null ? `${plural(n, 'assignment')} copied` : null,
        offset !== null
          ? offset === 0
            ? 'dates kept'
            : `dates moved ${offset > 0 ? 'later' : 'earlier'} by ${plural(Math.abs(offset), 'day')}`
          : null,
        staff !== null ? `${plural(staff, 'instructor')}` : null,
      ].filter(Boolean)
      const from = `${str(b.code) ?? 'another course'}${fromTerm ? ` (${fromTerm})` : ''}`
      const to = `${str(a.code) ?? 'this course'}${toTerm ? ` (${toTerm})` : ''}`
      // The stored note repeats the same facts in system words; the line above says them.
      return { what: `Copied from ${from} to ${to}`, change: parts.length ? parts.join(', ') : null, note: '' }
    }
    case 'instructor-added': {
      const was = str(b.role)
      return {
        what: `${who} made an instructor`,
        change: was ? `role ${arrow(ROLE_WORDS[was] ?? was, 'instructor')}` : 'added to the course as instructor',
        note: f.note,
      }
    }
    case 'roster-import': {
      const count = (k: string) => num(a[k]) ?? 0
      const sections = Array.isArray(a.newSections)
        ? a.newSections.filter((s): s is string => typeof s === 'string')
        : []
      const parts = [
        `${plural(count('rows'), 'row')} read`,
        count('new') ? `${plural(count('new'), 'new account')}` : null,
        count('add') ? `${plural(count('add'), 'existing account')} added` : null,
        count('update') ? `${plural(count('update'), 'student')} updated` : null,
        count('unchanged') ? `${count('unchanged')} unchanged` : null,
        count('invited') ? `${plural(count('invited'), 'invitation')} sent` : null,
        sections.length
          ? `new ${sections.length === 1 ? 'section' : 'sections'} ${sections.map(quoted).join(', ')}`
          : null,
      ].filter(Boolean)
      return { what: 'Class list imported', change: parts.join(', '), note: f.note }
    }
    case 'invitation-resent':
      return {
        what: `Invitation to ${str(a.email) ?? 'someone'} sent again`,
        change: str(b.lastSentAt) ? `last sent ${arrow(when(b.lastSentAt, tz), 'now')}` : null,
        note: f.note,
      }
    case 'invitation-revoked':
      return { what: `Invitation to ${str(a.email) ?? 'someone'} withdrawn`, change: null, note: f.note }
    case 'student-dropped':
      return {
        what: `${who} dropped from the course`,
        change: 'on the roster → dropped (answers kept, in no total)',
        note: f.note,
      }
    case 'student-undropped':
      return {
        what: `${who} back on the roster`,
        change: `dropped${str(b.droppedAt) ? ` on ${when(b.droppedAt, tz)}` : ''} → on the roster`,
        note: f.note,
      }
    case 'section-created': {
      const names = Array.isArray(a.names)
        ? a.names.filter((s): s is string => typeof s === 'string')
        : str(a.name)
          ? [str(a.name)!]
          : []
      return {
        what:
          names.length === 1 ? `Section ${quoted(names[0]!)} added` : `Sections added: ${names.map(quoted).join(', ')}`,
        change: null,
        note: f.note,
      }
    }
    case 'section-renamed': {
      const moved = num(a.students)
      return {
        what: `Section ${quoted(str(b.name) ?? '?')} renamed`,
        change: `name ${arrow(quoted(str(b.name) ?? '?'), quoted(str(a.name) ?? '?'))}${moved ? `; ${plural(moved, 'student')} moved with it` : ''}`,
        note: f.note,
      }
    }
    case 'section-deleted': {
      const left = num(a.studentsWithoutSection)
      return {
        what: `Section ${quoted(str(b.name) ?? '?')} deleted`,
        change: left ? `${plural(left, 'student')} now without a section` : null,
        note: f.note,
      }
    }
    case 'student-section': {
      const side = (v: unknown) => (str(v) ? `section ${quoted(str(v)!)}` : 'no section')
      return { what: `Section of ${who} changed`, change: arrow(side(b.section), side(a.section)), note: f.note }
    }
    case 'section-staff': {
      const section = quoted(str(a.name) ?? str(b.name) ?? '?')
      const ta = f.subject ?? 'a teaching assistant'
      return a.assigned === true
        ? { what: `${ta} now looks after section ${section}`, change: null, note: f.note }
        : { what: `${ta} no longer looks after section ${section}`, change: null, note: f.note }
    }
    default:
      return {
        what: `${kindLabel(f.kind)}${f.subject ? ` (${f.subject})` : ''}${f.question ? ` on ${q}` : ''}`,
        change: genericChange(f.before, f.after, tz),
        note: f.note,
      }
  }
}
