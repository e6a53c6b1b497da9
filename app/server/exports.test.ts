import { parse } from 'csv-parse/sync'
import { stringify } from 'csv-stringify/sync'
import { describe, expect, test } from 'vitest'
import { courseCsvFileName, CSV_OPTIONS, fileSlug, neutraliseCell } from './exports.server.ts'

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
