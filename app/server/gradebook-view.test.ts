import { expect, test } from 'vitest'
import { applyGradebookView, DEFAULT_GRADEBOOK_VIEW } from './gradebook.server.ts'

const row = (name: string, familyName: string, givenName: string, email: string, studentNumber: string | null) => ({
  name,
  familyName,
  givenName,
  email,
  studentNumber,
  section: 'A',
  total: 0,
  status: 'not-started' as const,
  late: false,
})

const rows = [
  row('Aino Abernethy', 'Abernethy', 'Aino', 'aino@example.test', 'KH260001'),
  row('Kofi Gathii', 'Gathii', 'Kofi', 'kofi@example.test', 'KH260042'),
  row('Lena Ibarra', 'Ibarra', 'Lena', 'lena@example.test', null),
]

test('the gradebook search finds a student by name, e-mail or student ID, in any case', () => {
  const names = (q: string) => applyGradebookView(rows, { ...DEFAULT_GRADEBOOK_VIEW, q }).map((r) => r.name)
  expect(names('kh260042')).toEqual(['Kofi Gathii'])
  expect(names('KH2600')).toEqual(['Aino Abernethy', 'Kofi Gathii'])
  expect(names('ibarra')).toEqual(['Lena Ibarra'])
  expect(names('aino@')).toEqual(['Aino Abernethy'])
  expect(names('nobody')).toEqual([])
})
