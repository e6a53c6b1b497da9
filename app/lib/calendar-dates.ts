/**
 * Calendar dates without a time (a term's first and last day, stored as PostgreSQL date,
 * read as "YYYY-MM-DD"). They name a day, not a moment, so no time zone applies.
 * Isomorphic.
 */

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec']
const DAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat']

/** "2027-01-11" → "Mon 11 Jan 2027"; anything else comes back as it is. */
export function formatCalendarDate(value: string): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value)
  if (!m) return value
  const date = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])))
  return `${DAYS[date.getUTCDay()]} ${date.getUTCDate()} ${MONTHS[date.getUTCMonth()]} ${date.getUTCFullYear()}`
}

/** "+119 days", "−7 days", "the same dates" */
export function formatDayOffset(days: number): string {
  if (days === 0) return 'the same dates'
  const n = Math.abs(days)
  return `${days > 0 ? '+' : '−'}${n} day${n === 1 ? '' : 's'}`
}
