import { expect, test } from 'vitest'
import { formatInZone, isTimeZone, parseLocalDateTime, toLocalDateTimeValue } from './dates.ts'

// Offsets from the IANA tz database (common practice): Chicago is UTC−6 in winter (CST) and
// UTC−5 in summer (CDT); in 2026 CDT starts 8 March at 02:00 local; Berlin is UTC+1 in winter.
test.each([
  ['2026-01-15T23:59', 'America/Chicago', '2026-01-16T05:59:00.000Z'],
  ['2026-07-15T12:00', 'America/Chicago', '2026-07-15T17:00:00.000Z'],
  ['2026-01-15T09:30', 'Europe/Berlin', '2026-01-15T08:30:00.000Z'],
  ['2026-01-15T09:30', 'UTC', '2026-01-15T09:30:00.000Z'],
])('%s in %s is %s', (local, zone, iso) => {
  expect(parseLocalDateTime(local, zone)?.toISOString()).toBe(iso)
  expect(toLocalDateTimeValue(new Date(iso), zone)).toBe(local)
})

test('a wall-clock time skipped by the spring change is refused', () => {
  expect(parseLocalDateTime('2026-03-08T02:30', 'America/Chicago')).toBeNull()
})

test.each(['', '2026-13-01T00:00', 'tomorrow', '2026-01-15 09:30x'])('%j is not a date and time', (v) => {
  expect(parseLocalDateTime(v, 'UTC')).toBeNull()
})

test('formatting names the zone', () => {
  expect(formatInZone(new Date('2026-01-16T05:59:00Z'), 'America/Chicago')).toBe(
    'Thu 15 Jan 2026, 23:59 (America/Chicago)',
  )
  expect(formatInZone('2026-01-16T05:59:00Z', 'UTC', { withZone: false })).toBe('Fri 16 Jan 2026, 05:59')
})

test('time zone names', () => {
  expect(isTimeZone('America/Chicago')).toBe(true)
  expect(isTimeZone('Mars/Olympus')).toBe(false)
})
