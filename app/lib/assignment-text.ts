/**
 * An assignment's rules in sentences, for staff and students alike. Isomorphic: the pages
 * call these while rendering, in the browser as well as on the server.
 */
import type { AssignmentRules } from '#app/domain/assignments/policy.ts'
import { formatInZone } from './dates.ts'

export function latePolicyText(
  rules: Pick<AssignmentRules, 'latePolicy' | 'latePenaltyPercentPerDay' | 'lateDaysAllowed'>,
): string {
  if (rules.latePolicy === 'closed' || rules.lateDaysAllowed === 0) return 'No answers are accepted after the due date.'
  const days = rules.lateDaysAllowed
  return `Late answers are accepted for up to ${days} day${days === 1 ? '' : 's'} after the due date; each started day late costs ${rules.latePenaltyPercentPerDay} % of the points.`
}

export function keyReleaseText(
  rules: { keyRelease: AssignmentRules['keyRelease']; keyReleasedAt: Date | string | null },
  timeZone: string,
): string {
  if (rules.keyRelease === 'after-due')
    return 'The key and worked solutions are shown to each student once they can no longer submit.'
  return rules.keyReleasedAt
    ? `The key and worked solutions were released on ${formatInZone(rules.keyReleasedAt, timeZone)}.`
    : 'The key and worked solutions are shown when an instructor releases them.'
}
