import { parse } from 'csv-parse/sync'
import { stringify } from 'csv-stringify/sync'
import { describe, expect, test } from 'vitest'
import {
  courseCsvFileName,
  courseGradeTable,
  CSV_OPTIONS,
  fileSlug,
  neutraliseCell,
  readStoredExport,
  termExportFileName,
} from './exports.server.ts'

describe('neutraliseCell', () => {
  test.each([
    ['=HYPERLINK("http://x.example","click")', `'=HYPERLINK("http://x.example","click")`],
    ['+1', `'+1`],
    ['-2', `'-2`],
    ['\u22123', `'\u22123`],
    ['@SUM(A1:A2)', `'@SUM(A1:A2)`],
    ['\tx', `'\tx`],
    ['\rx', `'\rx`],
    ['\uFF1D1+1', `'\uFF1D1+1`],
    ['\uFF0B1', `'\uFF0B1`],
    ['\uFF0D1', `'\uFF0D1`],
    ['\uFF20SUM', `'\uFF20SUM`],
  ])('%j starts like a formula and gets a leading quote', (input, expected) => {
    expect(neutraliseCell(input)).toBe(expected)
  })

  test.each([
    ['Ada Lovelace'],
    ['ada@test.example'],
    ['a=b'],
    ['1-2'],
    [' =x'],
    [''],
    ["'=already"],
    ['Section A'],
    ['\nnew line first'],
  ])('%j is left as it is', (input) => {
    expect(neutraliseCell(input)).toBe(input)
  })
})

describe('the shared CSV options', () => {
  test('neutralise every text cell, keep numbers as numbers, quote and escape through the library', () => {
    const csv = stringify(
      [
        ['=1+1', 'say "hi", then go', -3, 2.5, true, false],
        ['plain', 'line\nbreak', 0, 10, '', '-x'],
      ],
      CSV_OPTIONS,
    )
    expect(csv.startsWith('\uFEFF')).toBe(true)
    expect(csv).toContain(`"'=1+1","say ""hi"", then go",-3,2.5,yes,\r\n"plain","line\nbreak",0,10,"","'-x"\r\n`)
    const back = parse(csv, { bom: true, relax_column_count: false }) as string[][]
    expect(back).toEqual([
      ["'=1+1", 'say "hi", then go', '-3', '2.5', 'yes', ''],
      ['plain', 'line\nbreak', '0', '10', '', "'-x"],
    ])
  })
})

describe('file names', () => {
  test.each([
    ['Fall 2026', 'fall-2026'],
    ['  ME 301 / Thermo  ', 'me-301-thermo'],
    ['Été — Thermodynamique', 'ete-thermodynamique'],
    ['../../etc/passwd', 'etc-passwd'],
    ['"; rm -rf', 'rm-rf'],
    ['————', 'export'],
  ])('%j → %j', (input, expected) => {
    expect(fileSlug(input)).toBe(expected)
  })

  test('a course file is dated in the course’s zone', () => {
    // 2026-12-02 03:00 UTC is still 1 December in Chicago.
    const at = new Date('2026-12-02T03:00:00Z')
    expect(courseCsvFileName('TH 101', 'America/Chicago', at)).toBe('th-101-grades-2026-12-01.csv')
    expect(courseCsvFileName('TH 101', 'UTC', at)).toBe('th-101-grades-2026-12-02.csv')
  })
})

describe('the course table from a gradebook', () => {
  const gradebook = {
    course: { id: 1, timeZone: 'UTC' },
    assignments: [
      {
        id: 10,
        title: 'Week 3 — Otto cycle',
        opensAt: '2026-10-01T00:00:00Z',
        dueAt: '2026-10-08T23:59:00Z',
        points: 30 / 7,
        stage: 'due',
        counted: true,
      },
      {
        id: 11,
        title: '=Week 9',
        opensAt: '2026-12-20T00:00:00Z',
        dueAt: '2026-12-27T23:59:00Z',
        points: 5,
        stage: 'not-open',
        counted: false,
      },
    ],
    points: 30 / 7,
    students: [
      {
        userId: 5,
        studentNumber: 'S-1',
        familyName: 'Adams',
        givenName: 'Ada',
        name: 'Ada Adams',
        email: 'ada@test.example',
        section: null,
        total: 20 / 7,
        pending: 0,
        assignments: [
          { assignmentId: 10, score: 20 / 7, counted: true },
          { assignmentId: 11, score: 5, counted: false },
        ],
      },
    ],
  } as unknown as Parameters<typeof courseGradeTable>[0]

  test('possible points in each header, not-counted columns say so and stay empty, numbers rounded to 2 dp', () => {
    const { header, rows } = courseGradeTable(gradebook)
    expect(header).toEqual([
      'Student ID',
      'Family name',
      'Given name',
      'E-mail',
      'Section',
      'Week 3 — Otto cycle (4.29)',
      '=Week 9 (5) — not counted, due 2026-12-27 23:59 UTC',
      'Total (4.29)',
      'Answers being graded',
    ])
    expect(rows).toEqual([['S-1', 'Adams', 'Ada', 'ada@test.example', '', 2.86, null, 2.86, 0]])
    // The CSV options neutralise the header like any other text cell.
    expect(stringify([header], CSV_OPTIONS)).toContain(`"'=Week 9 (5) — not counted, due 2026-12-27 23:59 UTC"`)
  })
})

describe('a stored term export', () => {
  test('two files in one JSON document; anything else is an older single CSV', () => {
    const files = { assignments: 'a\r\n', 'course-totals': 't\r\n' }
    expect(readStoredExport(JSON.stringify({ format: 'term-export/2', files }))).toEqual({ files })
    expect(readStoredExport('\uFEFF"Course code"\r\n')).toEqual({ legacy: '\uFEFF"Course code"\r\n' })
    expect(readStoredExport('{not json')).toEqual({ legacy: '{not json' })
    expect(readStoredExport(JSON.stringify({ format: 'other', files }))).toEqual({
      legacy: JSON.stringify({ format: 'other', files }),
    })
  })

  test('file names: the stored base with the file’s name; an older export keeps its .csv', () => {
    expect(termExportFileName('grades-fall-2026-2026-12-02', 'course-totals')).toBe(
      'grades-fall-2026-2026-12-02-course-totals.csv',
    )
    expect(termExportFileName('grades-fall-2026-2026-12-02', 'assignments')).toBe(
      'grades-fall-2026-2026-12-02-assignments.csv',
    )
    expect(termExportFileName('grades-old-2026-11-01.csv', null)).toBe('grades-old-2026-11-01.csv')
    expect(termExportFileName('"; evil\r\nX: 1', 'assignments')).toBe('evil-x-1-assignments.csv')
  })
})
