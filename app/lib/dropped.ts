/** What a dropped student is told (isomorphic: pages and server functions use the same words). */
export const DROPPED_SUBMIT_MESSAGE =
  'You have been dropped from this course, so answers are no longer accepted. Your past work stays here for you to read; ask the course’s instructor if this is a mistake.'
export const DROPPED_DISPUTE_MESSAGE =
  'You have been dropped from this course, so you can no longer dispute a grade. Your past work stays here for you to read; ask the course’s instructor if this is a mistake.'
