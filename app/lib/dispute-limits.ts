/**
 * Limits on disputes that the browser (the form's hints and its early size check) and the
 * server (the checks that count) share. Isomorphic.
 */

/** Uploads: 10 MB; PDF, PNG or JPEG, the type read from the bytes on the server. */
export const MAX_ATTACHMENT_BYTES = 10 * 1024 * 1024
export const ALLOWED_ATTACHMENT_TYPES = ['application/pdf', 'image/png', 'image/jpeg'] as const
export type AttachmentType = (typeof ALLOWED_ATTACHMENT_TYPES)[number]
