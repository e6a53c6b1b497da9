/**
 * Reading a class list: a CSV (or a paste from a spreadsheet) with a student ID, family
 * name, given name, e-mail address and optionally a section per line. This module only
 * reads and checks the text itself; what the database already holds is checked in
 * roster.server.ts. Nothing here writes anything.
 */
import { CsvError, parse } from 'csv-parse/sync'
import { z } from 'zod'
import { MAX_ROSTER_BYTES, MAX_ROSTER_ROWS, rosterLimits } from '#app/lib/roster-limits.ts'
import { normaliseEmail } from './users.server.ts'

export { MAX_ROSTER_BYTES, MAX_ROSTER_ROWS, rosterLimits }

const ROSTER_COLUMNS = ['studentNumber', 'familyName', 'givenName', 'email', 'section'] as const
export type RosterColumn = (typeof ROSTER_COLUMNS)[number]

export const columnWords: Record<RosterColumn, string> = {
  studentNumber: 'student ID',
  familyName: 'family name',
  givenName: 'given name',
  email: 'e-mail',
  section: 'section',
}

/**
 * Header spellings, compared after lower-casing and removing everything but letters and
 * digits ("E-mail address" → "emailaddress", "Student_ID" → "studentid").
 */
const HEADER_SPELLINGS: Record<RosterColumn, string[]> = {
  studentNumber: [
    'studentid',
    'studentnumber',
    'studentno',
    'studentnr',
    'id',
    'idnumber',
    'sid',
    'number',
    'matriculationnumber',
    'matriculation',
    'matricno',
    'matric',
    'registrationnumber',
    'universityid',
  ],
  familyName: ['familyname', 'lastname', 'surname', 'family', 'last', 'familynames', 'lastnames'],
  givenName: [
    'givenname',
    'firstname',
    'givennames',
    'firstnames',
    'forename',
    'forenames',
    'given',
    'first',
    'preferredname',
  ],
  email: ['email', 'emailaddress', 'mail', 'emailid', 'universityemail', 'studentemail'],
  section: ['section', 'sectionname', 'group', 'groupname', 'lab', 'labgroup', 'tutorial', 'tutorialgroup'],
}

const REQUIRED: RosterColumn[] = ['studentNumber', 'familyName', 'givenName', 'email']

export function headerKey(header: string): string {
  return header
    .normalize('NFKC')
    .toLowerCase()
    .replace(/[^\p{L}\p{N}]/gu, '')
}

function columnOf(header: string): RosterColumn | null {
  const key = headerKey(header)
  for (const column of ROSTER_COLUMNS) if (HEADER_SPELLINGS[column].includes(key)) return column
  return null
}

export type RosterRow = {
  /** the line of the text where the row ends (the header is line 1) */
  line: number
  studentNumber: string
  familyName: string
  givenName: string
  /** normalised: trimmed and lower-cased */
  email: string
  section: string
  errors: string[]
}

export type ParsedRoster =
  | {
      ok: true
      rows: RosterRow[]
      hasSection: boolean
      ignoredColumns: string[]
      delimiter: string
    }
  | { ok: false; formError: string }

const EmailCheck = z.email()

/** The separator of the header line: the one of ; , and tab seen most often outside quotes. */
export function detectDelimiter(text: string): string {
  let inQuotes = false
  const counts: Record<string, number> = { ',': 0, ';': 0, '\t': 0 }
  for (const ch of text) {
    if (ch === '"') inQuotes = !inQuotes
    else if (!inQuotes && (ch === '\n' || ch === '\r')) break
    else if (!inQuotes && ch in counts) counts[ch]!++
  }
  let best = ','
  for (const d of [';', '\t']) if (counts[d]! > counts[best]!) best = d
  return best
}

function describeParseError(e: unknown): string {
  if (!(e instanceof CsvError)) return 'The text could not be read as a CSV. Save it again as CSV (UTF-8) and retry.'
  const where = typeof e.lines === 'number' ? ` on line ${e.lines}` : ''
  if (e.code === 'CSV_QUOTE_NOT_CLOSED')
    return `A quotation mark opened${where} is never closed. Check that line, or remove the quotation mark.`
  return `The text could not be read as a CSV${where}. Check that line for stray quotation marks.`
}

const RecordsWithInfo = z.array(z.object({ record: z.array(z.string()), info: z.object({ lines: z.number() }) }))

/**
 * Reads the text of a class list. A file-level problem (no header, a missing column, too
 * many rows, broken quoting) is one formError; problems of single rows are listed on the
 * row, so the preview can show every one at once.
 */
export function parseRosterCsv(input: string): ParsedRoster {
  const text = input.replace(/^\uFEFF/, '')
  if (text.trim() === '')
    return {
      ok: false,
      formError: 'The class list is empty. Choose a CSV file or paste its lines.',
    }
  if (Buffer.byteLength(text, 'utf8') > MAX_ROSTER_BYTES) return { ok: false, formError: tooLarge() }
  const delimiter = detectDelimiter(text)
  let parsed: unknown
  try {
    parsed = parse(text, {
      delimiter,
      relax_column_count: true,
      relax_quotes: true,
      skip_empty_lines: true,
      skip_records_with_empty_values: true,
      trim: true,
      info: true,
    })
  } catch (e) {
    return { ok: false, formError: describeParseError(e) }
  }
  // With `info: true` each record is { record, info }; csv-parse's typings do not follow that
  // option, so its output is checked rather than assumed.
  const checked = RecordsWithInfo.safeParse(parsed)
  if (!checked.success) return { ok: false, formError: describeParseError(null) }
  const records = checked.data
  const [header, ...body] = records
  if (!header)
    return {
      ok: false,
      formError: 'The class list is empty. Choose a CSV file or paste its lines.',
    }
  const index: Partial<Record<RosterColumn, number>> = {}
  const ignoredColumns: string[] = []
  header.record.forEach((name, i) => {
    const column = columnOf(name)
    if (column && index[column] === undefined) index[column] = i
    else if (name.trim() !== '') ignoredColumns.push(name.replace(/\0/g, '').slice(0, 60))
  })
  const missing = REQUIRED.filter((c) => index[c] === undefined)
  if (missing.length > 0) {
    const found = header.record.filter((h) => h.trim() !== '').map((h) => `“${h.replace(/\0/g, '').slice(0, 40)}”`)
    return {
      ok: false,
      formError:
        `The first line must name the columns. Missing: ${missing.map((c) => columnWords[c]).join(', ')}. ` +
        (found.length > 0 ? `Found: ${found.join(', ')}. ` : '') +
        'Use headings such as Student ID, Family name, Given name, E-mail and (optionally) Section.',
    }
  }
  if (body.length === 0)
    return {
      ok: false,
      formError: 'The class list has a header line but no students under it.',
    }
  if (body.length > MAX_ROSTER_ROWS)
    return {
      ok: false,
      formError: `The class list has ${body.length.toLocaleString('en')} students; at most ${MAX_ROSTER_ROWS.toLocaleString('en')} can be imported at once. Split the file.`,
    }

  const cell = (record: string[], column: RosterColumn) => {
    const i = index[column]
    return i === undefined ? '' : (record[i] ?? '').trim()
  }
  const rows: RosterRow[] = body.map(({ record, info }) => {
    const errors: string[] = []
    const raw = {
      studentNumber: cell(record, 'studentNumber'),
      familyName: cell(record, 'familyName'),
      givenName: cell(record, 'givenName'),
      email: cell(record, 'email'),
      section: cell(record, 'section'),
    }
    for (const column of ROSTER_COLUMNS) {
      const value = raw[column]
      if (/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/.test(value))
        errors.push(`The ${columnWords[column]} contains a control character (such as a NUL byte). Retype it.`)
      else if (value.length > rosterLimits[column])
        errors.push(`The ${columnWords[column]} is longer than ${rosterLimits[column]} characters.`)
    }
    if (raw.studentNumber === '') errors.push('The student ID is missing.')
    else if (/\s/.test(raw.studentNumber)) errors.push('The student ID contains a space.')
    if (raw.familyName === '' && raw.givenName === '')
      errors.push('The name is missing: give a family name, a given name or both.')
    if (raw.email === '') errors.push('The e-mail address is missing.')
    else if (raw.email.length <= rosterLimits.email && !EmailCheck.safeParse(raw.email).success)
      errors.push('The e-mail address is not valid (expected something like name@example.org).')
    const dropControl = (s: string) => s.replace(/\p{Cc}/gu, '')
    return {
      line: info.lines,
      studentNumber: dropControl(raw.studentNumber).slice(0, rosterLimits.studentNumber + 1),
      familyName: dropControl(raw.familyName).slice(0, rosterLimits.familyName + 1),
      givenName: dropControl(raw.givenName).slice(0, rosterLimits.givenName + 1),
      email: normaliseEmail(dropControl(raw.email)).slice(0, rosterLimits.email + 1),
      section: dropControl(raw.section).slice(0, rosterLimits.section + 1),
      errors,
    }
  })

  // The same person twice in one file: every copy after the first is an error.
  const firstById = new Map<string, number>()
  const firstByEmail = new Map<string, number>()
  for (const row of rows) {
    if (row.studentNumber) {
      const key = row.studentNumber.toUpperCase()
      const first = firstById.get(key)
      if (first !== undefined) row.errors.push(`The student ID ${row.studentNumber} is also on line ${first}.`)
      else firstById.set(key, row.line)
    }
    if (row.email) {
      const first = firstByEmail.get(row.email)
      if (first !== undefined) row.errors.push(`The e-mail address ${row.email} is also on line ${first}.`)
      else firstByEmail.set(row.email, row.line)
    }
  }
  return {
    ok: true,
    rows,
    hasSection: index.section !== undefined,
    ignoredColumns,
    delimiter,
  }
}

export function tooLarge(): string {
  return `The class list is larger than ${MAX_ROSTER_BYTES / 1024 / 1024} MB. Split it into smaller files (at most ${MAX_ROSTER_ROWS.toLocaleString('en')} students each).`
}

/** "Given Family", the form shown everywhere in the app. */
export function displayName(row: { givenName: string; familyName: string }): string {
  return [row.givenName, row.familyName].filter((s) => s !== '').join(' ')
}
