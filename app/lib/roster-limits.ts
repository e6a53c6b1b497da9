/**
 * Limits of a class list, shared by the import page (its hints, in the browser bundle) and the
 * server that checks them (app/server/roster-csv.server.ts).
 */

/** Largest class list accepted, in bytes of text and in students. */
export const MAX_ROSTER_BYTES = 1024 * 1024
export const MAX_ROSTER_ROWS = 5000

/** Longest value accepted in each column, in characters. */
export const rosterLimits = {
  studentNumber: 32,
  familyName: 60,
  givenName: 60,
  email: 254,
  section: 60,
} as const
