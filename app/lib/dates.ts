/**
 * Dates and times in a course's time zone (IANA name, courses.time_zone). Forms use
 * <input type="datetime-local">, whose value has no zone: it is read as wall-clock time in
 * the course's zone. Isomorphic: runs in the browser and on the server.
 */
import { TZDate } from '@date-fns/tz'
import { format } from 'date-fns'

const LOCAL_PATTERN = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/

/**
 * "2026-03-08T23:59" in `timeZone` → the instant, or null when the text is not such a value
 * or names a wall-clock time that does not exist in that zone (skipped by a clock change).
 */
export function parseLocalDateTime(value: string, timeZone: string): Date | null {
  const m = LOCAL_PATTERN.exec(value.trim())
  if (!m) return null
  // The pattern makes every part but the seconds present; the defaults only satisfy the types.
  const [y = 0, mo = 1, d = 1, h = 0, mi = 0, s = 0] = m.slice(1).map((x) => Number(x ?? 0))
  const date = new TZDate(y, mo - 1, d, h, mi, s, timeZone)
  if (Number.isNaN(date.getTime())) return null
  // A time in a spring-forward gap comes back moved; refuse it rather than guess.
  if (
    date.getFullYear() !== y ||
    date.getMonth() !== mo - 1 ||
    date.getDate() !== d ||
    date.getHours() !== h ||
    date.getMinutes() !== mi
  )
    return null
  return new Date(date.getTime())
}

/** The instant as a datetime-local value in `timeZone` ("2026-03-08T23:59"). */
export function toLocalDateTimeValue(instant: Date, timeZone: string): string {
  return format(new TZDate(instant.getTime(), timeZone), "yyyy-MM-dd'T'HH:mm")
}

/** "Sun 8 Mar 2026, 23:59 (America/Chicago)": the zone is always named. */
export function formatInZone(instant: Date | string, timeZone: string, options: { withZone?: boolean } = {}): string {
  const d = typeof instant === 'string' ? new Date(instant) : instant
  const text = format(new TZDate(d.getTime(), timeZone), 'EEE d MMM yyyy, HH:mm')
  return options.withZone === false ? text : `${text} (${timeZone})`
}

/** Whether `timeZone` is an IANA zone this runtime knows. */
export function isTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone })
    return true
  } catch {
    return false
  }
}
