/**
 * GET /courses/:courseId/disputes/:disputeId/attachment: the file a student sent with a
 * dispute, for that student and the course's staff. The type is the one detected from the
 * bytes, never sniffed. Images are shown inline (the dispute page embeds them) under a
 * sandboxing policy. PDFs are always sent as downloads: a PDF can carry JavaScript, and a
 * browser's built-in PDF viewer may run it whatever the page's policy says, so a PDF is never
 * opened inside this site.
 */
import { data } from 'react-router'
import { requireIdParam } from '#app/lib/params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getAttachmentForViewer, type AttachmentType } from '#app/server/disputes.server.ts'
import type { Route } from './+types/dispute-attachment'

const EXTENSION: Record<AttachmentType, string> = {
  'application/pdf': '.pdf',
  'image/png': '.png',
  'image/jpeg': '.jpg',
}

/** How each type is sent: PDFs as downloads, images for showing in the page. */
export function dispositionFor(type: AttachmentType): 'attachment' | 'inline' {
  return type === 'application/pdf' ? 'attachment' : 'inline'
}

/** The policy for every attachment: nothing may load but the image itself, and the document is sandboxed (no scripts, no forms, no plugins). */
export const ATTACHMENT_CSP = "default-src 'none'; img-src 'self'; sandbox"

/**
 * An ASCII name for old clients and the UTF-8 original for the rest (RFC 6266 / RFC 5987),
 * both ending in the detected type's extension; `attachment` for a PDF, `inline` for an image.
 */
export function contentDisposition(fileName: string, type: AttachmentType): string {
  const ext = EXTENSION[type]
  const known = type === 'image/jpeg' ? /\.jpe?g$/i : new RegExp(`\\${ext}$`, 'i')
  const trimmed = fileName.normalize('NFC').trim().slice(0, 150) || 'attachment'
  const full = known.test(trimmed) ? trimmed : `${trimmed}${ext}`
  const ascii = full
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^A-Za-z0-9._ -]+/g, '_')
    .replace(/^[. ]+/, '')
  // A name of nothing but replaced characters says nothing; give it a plain one.
  const safe = /[A-Za-z0-9]/.test(ascii.slice(0, ascii.length - ext.length)) ? ascii : `attachment${ext}`
  const encoded = encodeURIComponent(full).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`)
  return `${dispositionFor(type)}; filename="${safe}"; filename*=UTF-8''${encoded}`
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor', 'ta', 'student'])
  const disputeId = requireIdParam(params.disputeId, 'dispute')
  const file = await getAttachmentForViewer(db(), {
    courseId,
    disputeId,
    viewer: { id: user.id, isAdmin: user.isAdmin, role: course.role },
  })
  // The same answer whether the dispute is missing or someone else's: no hint that it exists.
  if (!file) throw data('There is no such file, or it is not yours to see.', { status: 404 })
  return new Response(new Uint8Array(file.data), {
    headers: {
      'Content-Type': file.contentType,
      'Content-Length': String(file.data.byteLength),
      'Content-Disposition': contentDisposition(file.fileName, file.contentType),
      'X-Content-Type-Options': 'nosniff',
      'Content-Security-Policy': ATTACHMENT_CSP,
      'Cache-Control': 'private, no-store',
    },
  })
}
