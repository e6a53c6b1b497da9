/**
 * Disputes (#7): a student challenges the verdict on a graded answer to one find; the
 * course's TAs and instructors review and resolve it. Every score change is written to the
 * append-only audit_events table in the same transaction as the change.
 *
 * CONTRACT (the signatures below are fixed; the bodies are being built):
 * - Window: a find can be disputed once it has a graded answer, until assignment.disputeDays
 *   days after the assignment's grades are released (open while not released). One open
 *   dispute per (item, student, find) (a partial unique index enforces it).
 * - Resolutions: 'reject' keeps the score (status rejected); 'adjust' sets the find's score by
 *   hand, comment required (status adjusted); 'accept-for-variant' marks the answer correct
 *   for every student of the assignment who gave the same answer (same value, within 1e-9
 *   relative) to that find on the same variant (same givens), this student included (status
 *   upheld). Each changed part_result gets an audit row (kind 'dispute', actorId, before/after
 *   {verdict, score}, note = the comment); the student is e-mailed (queued send-mail) in the
 *   same transaction.
 */
import type { CycleDiagrams } from '#app/domain/authoring/diagram-plot.ts'
import type { DrawnGiven, KeyEntry } from '#app/domain/authoring/definition.ts'
import type { Db, Tx } from './db/client.server.ts'
import type { DisputeStatus } from './db/schema.server.ts'

type Database = Db | Tx

/** Upload limits: 10 MB; PDF, PNG or JPEG, the type read from the bytes. */
export const MAX_ATTACHMENT_BYTES = 10 * 1024 * 1024
export const ALLOWED_ATTACHMENT_TYPES = ['application/pdf', 'image/png', 'image/jpeg'] as const
export type AttachmentType = (typeof ALLOWED_ATTACHMENT_TYPES)[number]

export type Upload = { fileName: string; bytes: Uint8Array }

export type RaiseDisputeInput = {
  courseId: number
  assignmentId: number
  position: number
  findName: string
  userId: number
  reason: string
  upload?: Upload | null
  now?: Date
}

export type RaiseDisputeResult =
  | { ok: true; disputeId: number }
  | { ok: false; formError?: string; fieldErrors: { reason?: string; file?: string; findName?: string } }

export type DisputeActor = { id: number; isAdmin: boolean; role: 'instructor' | 'ta' | 'student' }

export type DisputeListFilters = {
  assignmentId?: number
  status?: DisputeStatus | 'all'
  /** only disputes at least this many days old */
  olderThanDays?: number
}

export type DisputeListRow = {
  id: number
  status: DisputeStatus
  createdAt: string
  resolvedAt: string | null
  assignmentId: number
  assignmentTitle: string
  position: number
  problemTitle: string
  findName: string
  findLabel: string
  student: { id: number; name: string; email: string }
  reason: string
  hasAttachment: boolean
  scoreBefore: number | null
  scoreAfter: number | null
}

export type DisputeHistoryEntry = { at: string; who: string | null; kind: string; text: string }

export type DisputeDetail = {
  dispute: DisputeListRow & { comment: string | null; resolvedBy: string | null }
  timeZone: string
  find: { name: string; label: string; unit: string; share: number }
  /** the disputed answer and its grade */
  answer: { text: string; attempt: number; verdict: string | null; message: string | null; pitfallId: string | null; pitfallTitle: string | null; pitfallFeedback: string | null; score: number | null; maxScore: number; submittedAt: string; daysLate: number }
  /** every answer of this student to this find, oldest first */
  attempts: { text: string; attempt: number; verdict: string | null; score: number | null; submittedAt: string }[]
  /** the find's current score for the student (best of the graded answers) */
  findScore: number
  givens: readonly DrawnGiven[]
  promptHtml: string | null
  key: readonly KeyEntry[]
  workedHtml: string | null
  diagrams: CycleDiagrams | null
  attachment: { id: number; fileName: string; contentType: AttachmentType; size: number } | null
  /** how many other students gave the same answer on the same variant (what 'accept-for-variant' would change) */
  sameAnswerOnVariant: number
  history: DisputeHistoryEntry[]
}

export type ResolveDisputeInput = {
  courseId: number
  disputeId: number
  actor: DisputeActor
  decision: 'reject' | 'adjust' | 'accept-for-variant'
  /** for 'adjust': the find's new score, 0…its share of the points */
  newScore?: number
  comment: string
  now?: Date
}

export type ResolveDisputeResult = { ok: true; changed: number } | { ok: false; formError?: string; fieldErrors: { newScore?: string; comment?: string; decision?: string } }

/** A find's dispute state for the student's problem page. */
export type MyDispute = { id: number; findName: string; status: DisputeStatus; createdAt: string; resolvedAt: string | null; comment: string | null; scoreBefore: number | null; scoreAfter: number | null }

export type DisputeAllowance = { allowed: true; until: string | null } | { allowed: false; reason: string }

export type AuditRow = { id: number; at: string; actor: string | null; kind: string; student: string | null; assignmentTitle: string | null; before: unknown; after: unknown; note: string }

const NOT_BUILT = 'disputes.server.ts: not built yet (issue #7)'

/** Whether this student may dispute this find now, and until when. */
export async function disputeAllowance(_database: Database, _input: { courseId: number; assignmentId: number; position: number; findName: string; userId: number; now?: Date }): Promise<DisputeAllowance> {
  throw new Error(NOT_BUILT)
}

export async function raiseDispute(_database: Db, _input: RaiseDisputeInput): Promise<RaiseDisputeResult> {
  throw new Error(NOT_BUILT)
}

/** Staff: the course's disputes (oldest first); a student: only their own. */
export async function listDisputes(_database: Database, _input: { courseId: number; viewer: DisputeActor; filters?: DisputeListFilters; now?: Date }): Promise<DisputeListRow[]> {
  throw new Error(NOT_BUILT)
}

/** Null when there is no such dispute in the course or the viewer may not see it (a student sees only their own). */
export async function getDisputeDetail(_database: Database, _input: { courseId: number; disputeId: number; viewer: DisputeActor }): Promise<DisputeDetail | null> {
  throw new Error(NOT_BUILT)
}

/** Staff only (instructor or TA of the course). */
export async function resolveDispute(_database: Db, _input: ResolveDisputeInput): Promise<ResolveDisputeResult> {
  throw new Error(NOT_BUILT)
}

/** The student's disputes on one problem, newest first per find. */
export async function listMyDisputes(_database: Database, _input: { itemId: number; userId: number }): Promise<MyDispute[]> {
  throw new Error(NOT_BUILT)
}

/** The bytes of an attachment, for its owner or the course's staff; null otherwise. */
export async function getAttachmentForViewer(_database: Database, _input: { courseId: number; disputeId: number; viewer: DisputeActor }): Promise<{ fileName: string; contentType: AttachmentType; data: Buffer } | null> {
  throw new Error(NOT_BUILT)
}

/** Instructors: the course's audit log, newest first. */
export async function listAuditEvents(_database: Database, _input: { courseId: number; kind?: string; limit?: number; offset?: number }): Promise<{ rows: AuditRow[]; total: number }> {
  throw new Error(NOT_BUILT)
}
