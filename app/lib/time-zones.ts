/**
 * Time zones for course and department forms: a short list of common IANA zones to choose
 * from (a <datalist>, so any other zone can be typed), and the check that a typed zone is
 * one this runtime knows. Isomorphic: the list is shown in the browser, the check runs on
 * the server.
 */

/** Common zones, west to east; the form accepts any other IANA zone typed by hand. */
export const COMMON_TIME_ZONES: readonly string[] = [
  'Pacific/Honolulu',
  'America/Anchorage',
  'America/Los_Angeles',
  'America/Vancouver',
  'America/Denver',
  'America/Phoenix',
  'America/Chicago',
  'America/Mexico_City',
  'America/New_York',
  'America/Toronto',
  'America/Bogota',
  'America/Lima',
  'America/Halifax',
  'America/Santiago',
  'America/St_Johns',
  'America/Sao_Paulo',
  'America/Argentina/Buenos_Aires',
  'UTC',
  'Europe/London',
  'Europe/Dublin',
  'Europe/Lisbon',
  'Africa/Lagos',
  'Europe/Amsterdam',
  'Europe/Berlin',
  'Europe/Copenhagen',
  'Europe/Madrid',
  'Europe/Oslo',
  'Europe/Paris',
  'Europe/Rome',
  'Europe/Stockholm',
  'Europe/Warsaw',
  'Europe/Zurich',
  'Africa/Cairo',
  'Africa/Johannesburg',
  'Europe/Athens',
  'Europe/Helsinki',
  'Europe/Istanbul',
  'Africa/Nairobi',
  'Asia/Dubai',
  'Asia/Karachi',
  'Asia/Kolkata',
  'Asia/Dhaka',
  'Asia/Bangkok',
  'Asia/Singapore',
  'Asia/Shanghai',
  'Australia/Perth',
  'Asia/Seoul',
  'Asia/Tokyo',
  'Australia/Adelaide',
  'Australia/Brisbane',
  'Australia/Sydney',
  'Pacific/Auckland',
]

export const TIME_ZONE_HINT =
  'A zone name such as Europe/Oslo or America/Chicago: dates and times in the course are shown and read in it.'

function runtimeZones(): readonly string[] {
  try {
    return Intl.supportedValuesOf('timeZone')
  } catch {
    return []
  }
}

/**
 * Reads a typed zone: the known spelling of an IANA zone (letter case forgiven), or a
 * message saying what to type. Offsets ("+02:00") and bare abbreviations ("CET") are
 * refused: they do not follow a place's clock changes.
 */
export function readTimeZone(raw: string): { ok: true; timeZone: string } | { ok: false; message: string } {
  const text = raw.trim()
  if (text === '') return { ok: false, message: 'Choose or type a time zone, such as Europe/Oslo.' }
  if (text.length > 64) return { ok: false, message: 'That is not a time zone name. Type one such as Europe/Oslo.' }
  if (/^(?:utc|gmt|z)?\s*[+-]\d/i.test(text)) {
    return {
      ok: false,
      message: 'Use a zone name such as Europe/Oslo, not an offset: an offset does not follow summer time.',
    }
  }
  const lower = text.toLowerCase()
  if (lower === 'utc') return { ok: true, timeZone: 'UTC' }
  const known =
    COMMON_TIME_ZONES.find((z) => z.toLowerCase() === lower) ?? runtimeZones().find((z) => z.toLowerCase() === lower)
  if (known) return { ok: true, timeZone: known }
  if (!text.includes('/'))
    return { ok: false, message: `“${text}” is not a zone name. Type a region and city, such as Europe/Oslo.` }
  try {
    // An alias the runtime knows (America/Buenos_Aires): stored under the runtime's own name.
    return { ok: true, timeZone: new Intl.DateTimeFormat('en', { timeZone: text }).resolvedOptions().timeZone }
  } catch {
    return {
      ok: false,
      message: `“${text}” is not a time zone we know. Check the spelling, such as Europe/Oslo or America/Chicago.`,
    }
  }
}
