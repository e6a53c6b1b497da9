/**
 * GET /courses/:courseId/disputes/:disputeId/attachment: the file a student sent with a
 * dispute, for that student and the course's staff. Shown inline (the dispute page embeds it),
 * so the response is locked down: the type is the one detected from the bytes, never sniffed,
 * and a sandboxing policy keeps a PDF from running scripts.
 */
import { data } from 'react-router'
import { requireIdParam } from '#app/lib/params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getAttachmentForViewer, type AttachmentType } from '#app/server/disputes.server.ts'
import type { Route } from './+types/dispute-attachment'

const EXTENSION: Record<AttachmentType, string> = { 'application/pdf': '.pdf', 'image/png': '.png', 'image/jpeg': '.jpg' }

/** An ASCII name for old clients and the UTF-8 original for the rest (RFC 6266 / RFC 5987), both ending in the detected type's extension. */
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
  return `inline; filename="${safe}"; filename*=UTF-8''${encoded}`
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor', 'ta', 'student'])
  const disputeId = requireIdParam(params.disputeId, 'dispute')
  const file = await getAttachmentForViewer(db(), { courseId, disputeId, viewer: { id: user.id, isAdmin: user.isAdmin, role: course.role } })
  // The same answer whether the dispute is missing or someone else's: no hint that it exists.
  if (!file) throw data('There is no such file, or it is not yours to see.', { status: 404 })
  return new Response(new Uint8Array(file.data), {
    headers: {
      'Content-Type': file.contentType,
      'Content-Length': String(file.data.byteLength),
      'Content-Disposition': contentDisposition(file.fileName, file.contentType),
      'X-Content-Type-Options': 'nosniff',
      'Content-Security-Policy': "default-src 'none'; img-src 'self'; object-src 'self'; sandbox",
      'Cache-Control': 'private, no-store',
    },
  })
}
