/**
 * Limits on disputes that the browser (the form's hints and its early size check) and the
 * server (the checks that count) share. Isomorphic.
 */

/** Uploads: 10 MB; PDF, PNG or JPEG, the type read from the bytes on the server. */
export const MAX_ATTACHMENT_BYTES = 10 * 1024 * 1024
export const ALLOWED_ATTACHMENT_TYPES = ['application/pdf', 'image/png', 'image/jpeg'] as const
export type AttachmentType = (typeof ALLOWED_ATTACHMENT_TYPES)[number]

/** A student's reason for a dispute: the form's length hint and the server's check. */
export const DISPUTE_REASON_MIN = 10
export const DISPUTE_REASON_MAX = 2000
/** The staff's comment when resolving a dispute: the form's maxlength and the server's check. */
export const DISPUTE_COMMENT_MAX = 2000
