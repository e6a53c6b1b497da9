import { describe, expect, test } from 'vitest'
import { MAX_ROSTER_BYTES, MAX_ROSTER_ROWS, detectDelimiter, displayName, parseRosterCsv } from './roster-csv.server.ts'

function ok(text: string) {
  const parsed = parseRosterCsv(text)
  if (!parsed.ok) throw new Error(`expected a parsed roster, got: ${parsed.formError}`)
  return parsed
}

describe('reading a class list', () => {
  test('comma-separated with the plain headings', () => {
    const r = ok(
      'Student ID,Family name,Given name,E-mail\n1001,Okafor,Ngozi,N.Okafor@Uni.Example\n1002,Berg,Lars,lars@uni.example\n',
    )
    expect(r.hasSection).toBe(false)
    expect(r.rows).toEqual([
      {
        line: 2,
        studentNumber: '1001',
        familyName: 'Okafor',
        givenName: 'Ngozi',
        email: 'n.okafor@uni.example',
        section: '',
        errors: [],
      },
      {
        line: 3,
        studentNumber: '1002',
        familyName: 'Berg',
        givenName: 'Lars',
        email: 'lars@uni.example',
        section: '',
        errors: [],
      },
    ])
  })

  test('a BOM, semicolons, CRLF, other heading spellings in another order, quoted separators and a section column', () => {
    const r = ok(
      '\uFEFFE-MAIL ADDRESS;surname;First_Name;student number;Lab group\r\na@x.example;"de la Cruz; Jr";Ana;S-9;Tuesday\r\n\r\n',
    )
    expect(r.hasSection).toBe(true)
    expect(r.rows[0]).toMatchObject({
      studentNumber: 'S-9',
      familyName: 'de la Cruz; Jr',
      givenName: 'Ana',
      email: 'a@x.example',
      section: 'Tuesday',
      errors: [],
    })
  })

  test('a tab-separated paste from a spreadsheet', () => {
    expect(detectDelimiter('ID\tLast name\tFirst name\tEmail\n')).toBe('\t')
    const r = ok('ID\tLast name\tFirst name\tEmail\n7\tLi\tWei\twei@x.example')
    expect(r.rows[0]?.familyName).toBe('Li')
  })

  test('columns it does not know are listed and left alone', () => {
    const r = ok('Student ID,Family name,Given name,E-mail,Programme\n1,A,B,b@x.example,Mech')
    expect(r.ignoredColumns).toEqual(['Programme'])
  })

  test('each bad row says what is wrong with it', () => {
    const long = 'x'.repeat(61)
    const r = ok(
      [
        'Student ID,Family name,Given name,E-mail',
        '1,Good,Row,good@x.example',
        ',NoId,Row,noid@x.example',
        '3,Bad,Mail,not-an-address',
        '4,,,nameless@x.example',
        `5,${long},Long,long@x.example`,
        '6,Nul,By\u0000te,nul@x.example',
        '1,Dup,Id,dupid@x.example',
        '8,Dup,Mail,GOOD@x.example',
        '9 9,Space,Id,space@x.example',
      ].join('\n'),
    )
    const errorsOf = (line: number) => r.rows.find((row) => row.line === line)!.errors
    expect(errorsOf(2)).toEqual([])
    expect(errorsOf(3)).toEqual(['The student ID is missing.'])
    expect(errorsOf(4)).toEqual([expect.stringContaining('e-mail address is not valid')])
    expect(errorsOf(5)).toEqual([expect.stringContaining('name is missing')])
    expect(errorsOf(6)).toEqual(['The family name is longer than 60 characters.'])
    expect(errorsOf(7)).toEqual([expect.stringContaining('control character (such as a NUL byte)')])
    expect(errorsOf(8)).toEqual(['The student ID 1 is also on line 2.'])
    expect(errorsOf(9)).toEqual(['The e-mail address good@x.example is also on line 2.'])
    expect(errorsOf(10)).toEqual(['The student ID contains a space.'])
  })

  test('problems of the whole file are one message', () => {
    const fail = (text: string) => {
      const p = parseRosterCsv(text)
      if (p.ok) throw new Error('expected a refusal')
      return p.formError
    }
    expect(fail('')).toMatch(/empty/)
    expect(fail('Student ID,Given name,E-mail\n1,A,a@x.example')).toMatch(
      /Missing: family name\. Found: “Student ID”, “Given name”, “E-mail”/,
    )
    expect(fail('Student ID,Family name,Given name,E-mail\n')).toMatch(/no students/)
    expect(fail('Student ID,Family name,Given name,E-mail\n1,"A,B,a@x.example\n')).toMatch(
      /quotation mark opened on line 2 is never closed/,
    )
    const header = 'Student ID,Family name,Given name,E-mail\n'
    const many = header + Array.from({ length: MAX_ROSTER_ROWS + 1 }, (_, i) => `${i},F,G,s${i}@x.example`).join('\n')
    expect(fail(many)).toMatch(/at most 5,000 can be imported at once/)
    expect(fail(header + 'x'.repeat(MAX_ROSTER_BYTES))).toMatch(/larger than 1 MB/)
  })

  test('the display name is given then family', () => {
    expect(displayName({ givenName: 'Ngozi', familyName: 'Okafor' })).toBe('Ngozi Okafor')
    expect(displayName({ givenName: '', familyName: 'Okafor' })).toBe('Okafor')
  })
})
