/**
 * A course's roster: importing a class list (preview first, then one transaction), the
 * invitations still waiting (resend, revoke), dropping a student and undoing it, sections
 * and the TAs who look after them. Every change writes an audit row in its transaction.
 *
 * People are matched by student ID, then by e-mail address; an import never makes a second
 * account for someone who has one. A new student gets an account without a password and a
 * student membership at once (so they are in the gradebook from the first day) and an
 * invitation e-mail; the link on it sets their password (acceptInvitation).
 */
import { and, asc, eq, inArray, isNotNull, isNull, ne, or, sql } from 'drizzle-orm'
import { nanoid } from 'nanoid'
import { roleLabels, type CourseRole } from '#app/domain/permissions.ts'
import { INVITATION_DAYS } from './access-links.server.ts'
import type { Db, Tx } from './db/client.server.ts'
import { isUniqueViolation } from './db/pg-errors.server.ts'
import {
  accessTokens,
  auditEvents,
  courseSections,
  courses,
  memberships,
  sectionStaff,
  users,
} from './db/schema.server.ts'
import { linkMail, queueMail } from './email.server.ts'
import { appUrl } from './env.server.ts'
import { withJobTransaction, type JobConnection } from './queue.server.ts'
import { displayName, rosterLimits, type ParsedRoster, type RosterRow } from './roster-csv.server.ts'

// ---- Import: the plan -------------------------------------------------------------------

/**
 * What an import would do with one row: `new` makes an account, `add` puts an existing
 * account on the course, `update` changes a student already on it, `unchanged` does
 * nothing, `error` stops the whole import.
 */
export type RowStatus = 'new' | 'add' | 'update' | 'unchanged' | 'error'

export type PlannedRow = {
  line: number
  studentNumber: string
  familyName: string
  givenName: string
  email: string
  section: string
  status: RowStatus
  errors: string[]
  /** in words, for the preview: "family name Smith → Smyth", "section A → B" */
  changes: string[]
  /** the student is dropped from the course; the import updates them but leaves them dropped */
  dropped: boolean
  userId: number | null
}

export type RosterPlan = {
  rows: PlannedRow[]
  counts: Record<RowStatus, number>
  /** sections named in the file that the course does not have yet; the import creates them */
  newSections: string[]
  ignoredColumns: string[]
}

type Existing = {
  id: number
  email: string
  studentNumber: string | null
  familyName: string | null
  givenName: string | null
  name: string
  hasPassword: boolean
}

async function planRoster(
  database: Db,
  courseId: number,
  parsed: Extract<ParsedRoster, { ok: true }>,
): Promise<RosterPlan> {
  const ids = [...new Set(parsed.rows.map((r) => r.studentNumber).filter((s) => s !== ''))]
  const emails = [...new Set(parsed.rows.map((r) => r.email).filter((s) => s !== ''))]
  const found: Existing[] = []
  // Chunks keep each statement well under PostgreSQL's parameter limit.
  for (let i = 0; i < Math.max(ids.length, emails.length); i += 2000) {
    const idPart = ids.slice(i, i + 2000)
    const emailPart = emails.slice(i, i + 2000)
    const conditions = [
      idPart.length > 0 ? inArray(users.studentNumber, idPart) : undefined,
      emailPart.length > 0 ? inArray(users.email, emailPart) : undefined,
    ].filter((c) => c !== undefined)
    if (conditions.length === 0) continue
    const rows = await database
      .select({
        id: users.id,
        email: users.email,
        studentNumber: users.studentNumber,
        familyName: users.familyName,
        givenName: users.givenName,
        name: users.name,
        hasPassword: sql<boolean>`${users.passwordHash} is not null`,
      })
      .from(users)
      .where(or(...conditions))
    found.push(...rows)
  }
  const byId = new Map<string, Existing>()
  const byEmail = new Map<string, Existing>()
  for (const u of found) {
    if (u.studentNumber) byId.set(u.studentNumber, u)
    byEmail.set(u.email, u)
  }
  const userIds = [...new Set(found.map((u) => u.id))]
  const members = new Map<number, { role: CourseRole; section: string | null; droppedAt: Date | null }>()
  for (let i = 0; i < userIds.length; i += 2000) {
    const part = userIds.slice(i, i + 2000)
    const rows = await database
      .select({
        userId: memberships.userId,
        role: memberships.role,
        section: memberships.section,
        droppedAt: memberships.droppedAt,
      })
      .from(memberships)
      .where(and(eq(memberships.courseId, courseId), inArray(memberships.userId, part)))
    for (const m of rows) members.set(m.userId, m)
  }
  const sections = await database
    .select({ name: courseSections.name })
    .from(courseSections)
    .where(eq(courseSections.courseId, courseId))
  const sectionByKey = new Map(sections.map((s) => [s.name.toLowerCase(), s.name]))
  const newSections = new Map<string, string>()

  const rows: PlannedRow[] = parsed.rows.map((row: RosterRow) => {
    const errors = [...row.errors]
    const changes: string[] = []
    let section = row.section
    if (section !== '') {
      const known = sectionByKey.get(section.toLowerCase()) ?? newSections.get(section.toLowerCase())
      if (known) section = known
      else if (errors.length === 0) newSections.set(section.toLowerCase(), section)
    }
    const plan: PlannedRow = {
      ...row,
      section,
      errors,
      changes,
      status: 'error',
      dropped: false,
      userId: null,
    }
    if (errors.length > 0) return plan
    const idOwner = byId.get(row.studentNumber)
    const emailOwner = byEmail.get(row.email)
    if (idOwner && idOwner.email !== row.email) {
      errors.push(
        `The student ID ${row.studentNumber} is already registered with a different e-mail address. Use that address, or ask an administrator to change it.`,
      )
      return plan
    }
    if (!idOwner && emailOwner?.studentNumber && emailOwner.studentNumber !== row.studentNumber) {
      errors.push(
        `The e-mail address ${row.email} is already registered to a different student ID. Check the student ID.`,
      )
      return plan
    }
    const person = idOwner ?? emailOwner
    if (!person) {
      plan.status = 'new'
      return plan
    }
    plan.userId = person.id
    const membership = members.get(person.id)
    if (membership && membership.role !== 'student') {
      errors.push(
        `${row.email} is a ${roleLabels[membership.role].toLowerCase()} of this course, so cannot be added as a student.`,
      )
      return plan
    }
    const name = displayName(row)
    if ((person.familyName ?? '') !== row.familyName)
      changes.push(`family name “${person.familyName ?? ''}” → “${row.familyName}”`)
    if ((person.givenName ?? '') !== row.givenName)
      changes.push(`given name “${person.givenName ?? ''}” → “${row.givenName}”`)
    if (changes.length === 0 && person.name !== name) changes.push(`name “${person.name}” → “${name}”`)
    if (!person.studentNumber) changes.push(`student ID set to ${row.studentNumber}`)
    if (!membership) {
      plan.status = 'add'
      return plan
    }
    plan.dropped = membership.droppedAt !== null
    if (section !== '' && membership.section !== section)
      changes.push(`section “${membership.section ?? 'none'}” → “${section}”`)
    plan.status = changes.length > 0 ? 'update' : 'unchanged'
    return plan
  })
  const counts: Record<RowStatus, number> = {
    new: 0,
    add: 0,
    update: 0,
    unchanged: 0,
    error: 0,
  }
  for (const r of rows) {
    if (r.errors.length > 0) r.status = 'error'
    counts[r.status]++
  }
  // A section is only new if a row without errors names it.
  const named = new Set(rows.filter((r) => r.status !== 'error').map((r) => r.section.toLowerCase()))
  return {
    rows,
    counts,
    newSections: [...newSections.entries()].filter(([k]) => named.has(k)).map(([, v]) => v),
    ignoredColumns: parsed.ignoredColumns,
  }
}

/** The preview: what an import would do, row by row. Writes nothing. */
export async function previewRoster(
  database: Db,
  courseId: number,
  parsed: Extract<ParsedRoster, { ok: true }>,
): Promise<RosterPlan> {
  return planRoster(database, courseId, parsed)
}

export type ImportOutcome =
  | {
      ok: true
      counts: Record<RowStatus, number>
      invited: number
      newSections: string[]
    }
  | { ok: false; plan: RosterPlan; formError: string }

/**
 * Imports the class list in one transaction. The plan is made again inside it (the file is
 * never trusted to be what was previewed, and the database may have changed since): if any
 * row has an error, nothing is written and the new plan comes back.
 */
export async function importRoster(
  database: Db,
  input: {
    courseId: number
    actorId: number
    parsed: Extract<ParsedRoster, { ok: true }>
    fileName?: string
    baseUrl?: string
    now?: Date
  },
): Promise<ImportOutcome> {
  const now = input.now ?? new Date()
  const baseUrl = input.baseUrl ?? appUrl()
  try {
    return await withJobTransaction(database, async (tx, jobs) => {
      // One import at a time anywhere: accounts are shared between courses.
      await tx.execute(sql`select pg_advisory_xact_lock(hashtext('roster-import'))`)
      const plan = await planRoster(tx, input.courseId, input.parsed)
      if (plan.counts.error > 0) {
        const n = plan.counts.error
        return {
          ok: false as const,
          plan,
          formError: `Nothing was imported: ${n} row${n === 1 ? ' has a problem' : 's have problems'}. Fix ${n === 1 ? 'it' : 'them'} and check again.`,
        }
      }
      const course = await courseFacts(tx, input.courseId)
      if (plan.newSections.length > 0)
        await tx
          .insert(courseSections)
          .values(
            plan.newSections.map((name) => ({
              courseId: input.courseId,
              name,
            })),
          )
          .onConflictDoNothing()

      const toInvite: { email: string }[] = []
      const created = plan.rows.filter((r) => r.status === 'new')
      for (let i = 0; i < created.length; i += 1000) {
        const part = created.slice(i, i + 1000)
        const inserted = await tx
          .insert(users)
          .values(
            part.map((r) => ({
              email: r.email,
              name: displayName(r),
              studentNumber: r.studentNumber,
              familyName: r.familyName,
              givenName: r.givenName,
            })),
          )
          .returning({ id: users.id, email: users.email })
        const idOf = new Map(inserted.map((u) => [u.email, u.id]))
        await tx.insert(memberships).values(
          part.map((r) => ({
            userId: idOf.get(r.email)!,
            courseId: input.courseId,
            role: 'student' as const,
            section: r.section || null,
          })),
        )
        toInvite.push(...part)
      }
      for (const r of plan.rows) {
        if (r.status !== 'add' && r.status !== 'update') continue
        await tx
          .update(users)
          .set({
            familyName: r.familyName,
            givenName: r.givenName,
            name: displayName(r),
            studentNumber: r.studentNumber,
          })
          .where(eq(users.id, r.userId!))
        if (r.status === 'add') {
          await tx.insert(memberships).values({
            userId: r.userId!,
            courseId: input.courseId,
            role: 'student',
            section: r.section || null,
          })
          toInvite.push(r)
        } else if (r.section !== '') {
          await tx
            .update(memberships)
            .set({ section: r.section })
            .where(and(eq(memberships.userId, r.userId!), eq(memberships.courseId, input.courseId)))
        }
      }
      const inviter = await nameOf(tx, input.actorId)
      await createInvitations(tx, jobs, {
        course,
        emails: toInvite.map((p) => p.email),
        role: 'student',
        actorId: input.actorId,
        inviterName: inviter,
        baseUrl,
        now,
      })

      await tx.insert(auditEvents).values({
        actorId: input.actorId,
        courseId: input.courseId,
        kind: 'roster-import',
        before: null,
        after: {
          rows: plan.rows.length,
          ...plan.counts,
          invited: toInvite.length,
          newSections: plan.newSections,
        },
        note: input.fileName ? `From ${input.fileName.slice(0, 200)}` : '',
      })
      return {
        ok: true as const,
        counts: plan.counts,
        invited: toInvite.length,
        newSections: plan.newSections,
      }
    })
  } catch (e) {
    if (!isUniqueViolation(e)) throw e
    // Someone else wrote one of these people between the plan and the insert.
    const plan = await planRoster(database, input.courseId, input.parsed)
    return {
      ok: false,
      plan,
      formError:
        'The accounts changed while importing, so nothing was imported. Check the rows below and import again.',
    }
  }
}

// ---- Invitations ------------------------------------------------------------------------

type CourseFacts = { id: number; code: string; title: string }

async function courseFacts(database: Db, courseId: number): Promise<CourseFacts> {
  const [course] = await database
    .select({ id: courses.id, code: courses.code, title: courses.title })
    .from(courses)
    .where(eq(courses.id, courseId))
  if (!course) throw new Error(`No course ${courseId}`)
  return course
}

async function nameOf(database: Db, userId: number): Promise<string> {
  const [u] = await database.select({ name: users.name }).from(users).where(eq(users.id, userId))
  return u?.name ?? 'An instructor'
}

function invitationMail(opts: {
  course: CourseFacts
  email: string
  role: CourseRole
  inviterName: string
  link: string
  reminder: boolean
}) {
  return linkMail({
    to: opts.email,
    subject: `${opts.reminder ? 'Reminder: you' : 'You'} are invited to ${opts.course.code} on Cyclewright`,
    lines: [
      `${opts.inviterName} has added you to ${opts.course.code} ${opts.course.title} as ${roleLabels[opts.role].toLowerCase()}.`,
      'Open the link to choose your password (or, if you already have an account, to sign in) and go to the course.',
    ],
    link: opts.link,
    linkLabel: 'Accept the invitation',
    after: [`The link works once and expires in ${INVITATION_DAYS} days.`],
  })
}

/** New invitation links for many addresses at once, each e-mailed through the transaction's job connection. */
async function createInvitations(
  tx: Db,
  jobs: JobConnection,
  opts: {
    course: CourseFacts
    emails: string[]
    role: CourseRole
    actorId: number
    inviterName: string
    baseUrl: string
    now: Date
  },
) {
  const expiresAt = new Date(opts.now.getTime() + INVITATION_DAYS * 86_400_000)
  const links = opts.emails.map((email) => ({ email, token: nanoid(32) }))
  for (let i = 0; i < links.length; i += 1000)
    await tx.insert(accessTokens).values(
      links.slice(i, i + 1000).map(({ email, token }) => ({
        token,
        purpose: 'invitation' as const,
        email,
        courseId: opts.course.id,
        role: opts.role,
        createdBy: opts.actorId,
        expiresAt,
        lastSentAt: opts.now,
      })),
    )
  for (const { email, token } of links)
    await queueMail(invitationMail({ ...opts, email, link: `${opts.baseUrl}/join/${token}`, reminder: false }), {
      connection: jobs,
    })
}

export type PendingInvitation = {
  id: number
  email: string
  role: CourseRole
  name: string | null
  sentAt: string
  expiresAt: string
  expired: boolean
}

/** Invitations of the course not used and not revoked, oldest first; expired ones included (a resend renews them). */
export async function listPendingInvitations(
  database: Db,
  courseId: number,
  now = new Date(),
): Promise<PendingInvitation[]> {
  const rows = await database
    .select({
      id: accessTokens.id,
      email: accessTokens.email,
      role: accessTokens.role,
      name: users.name,
      createdAt: accessTokens.createdAt,
      lastSentAt: accessTokens.lastSentAt,
      expiresAt: accessTokens.expiresAt,
    })
    .from(accessTokens)
    .leftJoin(users, eq(users.email, accessTokens.email))
    .where(
      and(
        eq(accessTokens.courseId, courseId),
        eq(accessTokens.purpose, 'invitation'),
        isNull(accessTokens.usedAt),
        isNull(accessTokens.revokedAt),
      ),
    )
    .orderBy(asc(accessTokens.createdAt), asc(accessTokens.id))
  return rows.map((r) => ({
    id: r.id,
    email: r.email,
    role: r.role ?? 'student',
    name: r.name,
    sentAt: (r.lastSentAt ?? r.createdAt).toISOString(),
    expiresAt: r.expiresAt.toISOString(),
    expired: r.expiresAt <= now,
  }))
}

/** How soon the same invitation may be e-mailed again. */
export const RESEND_PAUSE_SECONDS = 60

export type InvitationChange = { ok: true; email: string } | { ok: false; message: string }

const GONE = 'That invitation is no longer waiting: it was used or revoked. The list below is up to date.'

/**
 * E-mails the same link again and gives it a fresh 7 days. The link stays the same so the
 * first e-mail keeps working too; it only ever went to this one address. (A link that
 * may have reached someone else is revoked instead, and a new invitation sent.)
 */
export async function resendInvitation(
  database: Db,
  input: {
    courseId: number
    invitationId: number
    actorId: number
    baseUrl?: string
    now?: Date
  },
): Promise<InvitationChange> {
  const now = input.now ?? new Date()
  const baseUrl = input.baseUrl ?? appUrl()
  return withJobTransaction(database, async (tx, jobs) => {
    const [row] = await tx
      .select()
      .from(accessTokens)
      .where(
        and(
          eq(accessTokens.id, input.invitationId),
          eq(accessTokens.courseId, input.courseId),
          eq(accessTokens.purpose, 'invitation'),
          isNull(accessTokens.usedAt),
          isNull(accessTokens.revokedAt),
        ),
      )
      .for('update')
    if (!row) return { ok: false as const, message: GONE }
    const last = row.lastSentAt ?? row.createdAt
    if (now.getTime() - last.getTime() < RESEND_PAUSE_SECONDS * 1000)
      return {
        ok: false as const,
        message: `The invitation to ${row.email} was sent less than a minute ago. Give the e-mail a little time to arrive.`,
      }
    await tx
      .update(accessTokens)
      .set({
        lastSentAt: now,
        expiresAt: new Date(now.getTime() + INVITATION_DAYS * 86_400_000),
      })
      .where(eq(accessTokens.id, row.id))
    const course = await courseFacts(tx, input.courseId)
    await queueMail(
      invitationMail({
        course,
        email: row.email,
        role: row.role ?? 'student',
        inviterName: await nameOf(tx, input.actorId),
        link: `${baseUrl}/join/${row.token}`,
        reminder: true,
      }),
      { connection: jobs },
    )
    await tx.insert(auditEvents).values({
      actorId: input.actorId,
      courseId: input.courseId,
      kind: 'invitation-resent',
      before: {
        lastSentAt: last.toISOString(),
        expiresAt: row.expiresAt.toISOString(),
      },
      after: { invitationId: row.id, email: row.email },
    })
    return { ok: true as const, email: row.email }
  })
}

/** Withdraws an unused invitation: its link then says it was withdrawn. The person stays on the roster. */
export async function revokeInvitation(
  database: Db,
  input: {
    courseId: number
    invitationId: number
    actorId: number
    now?: Date
  },
): Promise<InvitationChange> {
  const now = input.now ?? new Date()
  return database.transaction(async (tx) => {
    const [row] = await tx
      .update(accessTokens)
      .set({ revokedAt: now })
      .where(
        and(
          eq(accessTokens.id, input.invitationId),
          eq(accessTokens.courseId, input.courseId),
          eq(accessTokens.purpose, 'invitation'),
          isNull(accessTokens.usedAt),
          isNull(accessTokens.revokedAt),
        ),
      )
      .returning({ id: accessTokens.id, email: accessTokens.email })
    if (!row) return { ok: false as const, message: GONE }
    await tx.insert(auditEvents).values({
      actorId: input.actorId,
      courseId: input.courseId,
      kind: 'invitation-revoked',
      before: null,
      after: { invitationId: row.id, email: row.email },
    })
    return { ok: true as const, email: row.email }
  })
}

// ---- The roster -------------------------------------------------------------------------

export type RosterMember = {
  userId: number
  name: string
  email: string
  studentNumber: string | null
  role: CourseRole
  section: string | null
  droppedAt: string | null
  /** has set a password (has joined) */
  joined: boolean
}

export async function listRoster(
  database: Db,
  courseId: number,
): Promise<{ active: RosterMember[]; dropped: RosterMember[] }> {
  const rows = await database
    .select({
      userId: users.id,
      name: users.name,
      familyName: users.familyName,
      email: users.email,
      studentNumber: users.studentNumber,
      role: memberships.role,
      section: memberships.section,
      droppedAt: memberships.droppedAt,
      joined: sql<boolean>`${users.passwordHash} is not null`,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.courseId, courseId))
    .orderBy(
      sql`case ${memberships.role} when 'instructor' then 0 when 'ta' then 1 else 2 end`,
      sql`coalesce(${users.familyName}, ${users.name})`,
      asc(users.name),
      asc(users.id),
    )
  const all = rows.map(({ familyName: _f, ...r }) => ({
    ...r,
    droppedAt: r.droppedAt?.toISOString() ?? null,
  }))
  return {
    active: all.filter((m) => m.droppedAt === null),
    dropped: all.filter((m) => m.droppedAt !== null),
  }
}

export type RosterChange = { ok: true; message: string } | { ok: false; message: string }

async function studentOf(tx: Db | Tx, courseId: number, userId: number) {
  const [row] = await tx
    .select({
      id: memberships.id,
      droppedAt: memberships.droppedAt,
      section: memberships.section,
      name: users.name,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.courseId, courseId), eq(memberships.userId, userId), eq(memberships.role, 'student')))
    .for('update', { of: memberships })
  return row ?? null
}

/** Drops (or, with `undo`, restores) a student. Their answers stay; the gradebook leaves dropped students out of totals. */
export async function setDropped(
  database: Db,
  input: {
    courseId: number
    userId: number
    actorId: number
    dropped: boolean
    now?: Date
  },
): Promise<RosterChange> {
  const now = input.now ?? new Date()
  return database.transaction(async (tx) => {
    const student = await studentOf(tx, input.courseId, input.userId)
    if (!student)
      return {
        ok: false as const,
        message: 'That person is not a student of this course.',
      }
    if ((student.droppedAt !== null) === input.dropped)
      return {
        ok: true as const,
        message: input.dropped ? `${student.name} was already dropped.` : `${student.name} is already on the roster.`,
      }
    await tx
      .update(memberships)
      .set({ droppedAt: input.dropped ? now : null })
      .where(eq(memberships.id, student.id))
    await tx.insert(auditEvents).values({
      actorId: input.actorId,
      courseId: input.courseId,
      userId: input.userId,
      kind: input.dropped ? 'student-dropped' : 'student-undropped',
      before: { droppedAt: student.droppedAt?.toISOString() ?? null },
      after: { droppedAt: input.dropped ? now.toISOString() : null },
    })
    return {
      ok: true as const,
      message: input.dropped
        ? `${student.name} was dropped. Their answers are kept.`
        : `${student.name} is back on the roster.`,
    }
  })
}

// ---- Sections ---------------------------------------------------------------------------

export type SectionSummary = {
  id: number
  name: string
  students: number
  staff: { userId: number; name: string }[]
}

export async function listSections(database: Db, courseId: number): Promise<SectionSummary[]> {
  const sections = await database
    .select({
      id: courseSections.id,
      name: courseSections.name,
      students: sql<number>`(select count(*)::int from ${memberships} m where m.course_id = ${courseSections.courseId} and m.section = ${courseSections.name} and m.role = 'student' and m.dropped_at is null)`,
    })
    .from(courseSections)
    .where(eq(courseSections.courseId, courseId))
    .orderBy(asc(courseSections.name))
  if (sections.length === 0) return []
  const staff = await database
    .select({
      sectionId: sectionStaff.sectionId,
      userId: users.id,
      name: users.name,
    })
    .from(sectionStaff)
    .innerJoin(users, eq(users.id, sectionStaff.userId))
    .where(
      inArray(
        sectionStaff.sectionId,
        sections.map((s) => s.id),
      ),
    )
    .orderBy(asc(users.name))
  return sections.map((s) => ({
    ...s,
    staff: staff.filter((t) => t.sectionId === s.id).map(({ userId, name }) => ({ userId, name })),
  }))
}

/** Section names students carry that the course has not set up as sections (from before sections existed). */
export async function listLooseSectionNames(database: Db | Tx, courseId: number): Promise<string[]> {
  const rows = await database
    .selectDistinct({ name: memberships.section })
    .from(memberships)
    .where(
      and(
        eq(memberships.courseId, courseId),
        isNotNull(memberships.section),
        sql`not exists (select 1 from ${courseSections} s where s.course_id = ${memberships.courseId} and s.name = ${memberships.section})`,
      ),
    )
    .orderBy(asc(memberships.section))
  return rows.map((r) => r.name!).filter((n) => n !== '')
}

export function checkSectionName(raw: string): { ok: true; name: string } | { ok: false; message: string } {
  const name = raw.replace(/\s+/g, ' ').trim()
  if (name === '') return { ok: false, message: 'Give the section a name.' }
  if (name.length > rosterLimits.section)
    return {
      ok: false,
      message: `Keep the section name to ${rosterLimits.section} characters.`,
    }
  if (/\p{Cc}/u.test(name))
    return {
      ok: false,
      message: 'The name contains a control character. Retype it.',
    }
  return { ok: true, name }
}

async function sectionNamed(tx: Db | Tx, courseId: number, name: string, exceptId?: number) {
  const [row] = await tx
    .select({ id: courseSections.id, name: courseSections.name })
    .from(courseSections)
    .where(
      and(
        eq(courseSections.courseId, courseId),
        sql`lower(${courseSections.name}) = lower(${name})`,
        exceptId ? ne(courseSections.id, exceptId) : undefined,
      ),
    )
  return row ?? null
}

async function audit(tx: Db | Tx, row: typeof auditEvents.$inferInsert) {
  await tx.insert(auditEvents).values(row)
}

export async function createSection(
  database: Db,
  input: { courseId: number; actorId: number; name: string },
): Promise<RosterChange> {
  const checked = checkSectionName(input.name)
  if (!checked.ok) return checked
  return database.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext('course-sections'), ${input.courseId})`)
    if (await sectionNamed(tx, input.courseId, checked.name))
      return {
        ok: false as const,
        message: `There is already a section called “${checked.name}”.`,
      }
    const [row] = await tx
      .insert(courseSections)
      .values({ courseId: input.courseId, name: checked.name })
      .returning({ id: courseSections.id })
    await audit(tx, {
      actorId: input.actorId,
      courseId: input.courseId,
      kind: 'section-created',
      before: null,
      after: { sectionId: row!.id, name: checked.name },
    })
    return { ok: true as const, message: `Section “${checked.name}” added.` }
  })
}

/** Renames a section and the section of every student in it, together. */
export async function renameSection(
  database: Db,
  input: { courseId: number; actorId: number; sectionId: number; name: string },
): Promise<RosterChange> {
  const checked = checkSectionName(input.name)
  if (!checked.ok) return checked
  return database.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext('course-sections'), ${input.courseId})`)
    const [section] = await tx
      .select({ id: courseSections.id, name: courseSections.name })
      .from(courseSections)
      .where(and(eq(courseSections.id, input.sectionId), eq(courseSections.courseId, input.courseId)))
    if (!section) return { ok: false as const, message: 'That section no longer exists.' }
    if (section.name === checked.name) return { ok: true as const, message: 'The name is unchanged.' }
    if (await sectionNamed(tx, input.courseId, checked.name, section.id))
      return {
        ok: false as const,
        message: `There is already a section called “${checked.name}”.`,
      }
    await tx.update(courseSections).set({ name: checked.name }).where(eq(courseSections.id, section.id))
    const moved = await tx
      .update(memberships)
      .set({ section: checked.name })
      .where(and(eq(memberships.courseId, input.courseId), eq(memberships.section, section.name)))
      .returning({ id: memberships.id })
    await audit(tx, {
      actorId: input.actorId,
      courseId: input.courseId,
      kind: 'section-renamed',
      before: { sectionId: section.id, name: section.name },
      after: {
        sectionId: section.id,
        name: checked.name,
        students: moved.length,
      },
    })
    return {
      ok: true as const,
      message: `Section “${section.name}” is now “${checked.name}”.`,
    }
  })
}

/** Deletes a section; its students are left without a section (nothing else of theirs changes). */
export async function deleteSection(
  database: Db,
  input: { courseId: number; actorId: number; sectionId: number },
): Promise<RosterChange> {
  return database.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext('course-sections'), ${input.courseId})`)
    const [section] = await tx
      .delete(courseSections)
      .where(and(eq(courseSections.id, input.sectionId), eq(courseSections.courseId, input.courseId)))
      .returning({ id: courseSections.id, name: courseSections.name })
    if (!section) return { ok: false as const, message: 'That section no longer exists.' }
    const cleared = await tx
      .update(memberships)
      .set({ section: null })
      .where(and(eq(memberships.courseId, input.courseId), eq(memberships.section, section.name)))
      .returning({ id: memberships.id })
    await audit(tx, {
      actorId: input.actorId,
      courseId: input.courseId,
      kind: 'section-deleted',
      before: { sectionId: section.id, name: section.name },
      after: { studentsWithoutSection: cleared.length },
    })
    return {
      ok: true as const,
      message: `Section “${section.name}” deleted${cleared.length > 0 ? `; ${cleared.length} student${cleared.length === 1 ? ' has' : 's have'} no section now` : ''}.`,
    }
  })
}

/** Puts a student in a section (by its id), or in none (null). */
export async function setStudentSection(
  database: Db,
  input: {
    courseId: number
    actorId: number
    userId: number
    sectionId: number | null
  },
): Promise<RosterChange> {
  return database.transaction(async (tx) => {
    const student = await studentOf(tx, input.courseId, input.userId)
    if (!student)
      return {
        ok: false as const,
        message: 'That person is not a student of this course.',
      }
    let name: string | null = null
    if (input.sectionId !== null) {
      const [section] = await tx
        .select({ name: courseSections.name })
        .from(courseSections)
        .where(and(eq(courseSections.id, input.sectionId), eq(courseSections.courseId, input.courseId)))
        .for('share')
      if (!section)
        return {
          ok: false as const,
          message: 'That section no longer exists. Choose another.',
        }
      name = section.name
    }
    if (student.section === name)
      return {
        ok: true as const,
        message: `${student.name} is already ${name ? `in section ${name}` : 'without a section'}.`,
      }
    await tx.update(memberships).set({ section: name }).where(eq(memberships.id, student.id))
    await audit(tx, {
      actorId: input.actorId,
      courseId: input.courseId,
      userId: input.userId,
      kind: 'student-section',
      before: { section: student.section },
      after: { section: name },
    })
    return {
      ok: true as const,
      message: name ? `${student.name} is now in section ${name}.` : `${student.name} now has no section.`,
    }
  })
}

/** Assigns a TA of the course to a section, or takes them off it. */
export async function setSectionStaff(
  database: Db,
  input: {
    courseId: number
    actorId: number
    sectionId: number
    userId: number
    assigned: boolean
  },
): Promise<RosterChange> {
  return database.transaction(async (tx) => {
    const [section] = await tx
      .select({ id: courseSections.id, name: courseSections.name })
      .from(courseSections)
      .where(and(eq(courseSections.id, input.sectionId), eq(courseSections.courseId, input.courseId)))
    if (!section) return { ok: false as const, message: 'That section no longer exists.' }
    const [ta] = await tx
      .select({ name: users.name })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(
        and(eq(memberships.courseId, input.courseId), eq(memberships.userId, input.userId), eq(memberships.role, 'ta')),
      )
    if (!ta)
      return {
        ok: false as const,
        message: 'Only teaching assistants of this course can be assigned to a section.',
      }
    const changed = input.assigned
      ? await tx
          .insert(sectionStaff)
          .values({ sectionId: section.id, userId: input.userId })
          .onConflictDoNothing()
          .returning({ id: sectionStaff.userId })
      : await tx
          .delete(sectionStaff)
          .where(and(eq(sectionStaff.sectionId, section.id), eq(sectionStaff.userId, input.userId)))
          .returning({ id: sectionStaff.userId })
    if (changed.length > 0)
      await audit(tx, {
        actorId: input.actorId,
        courseId: input.courseId,
        userId: input.userId,
        kind: 'section-staff',
        before: {
          sectionId: section.id,
          name: section.name,
          assigned: !input.assigned,
        },
        after: {
          sectionId: section.id,
          name: section.name,
          assigned: input.assigned,
        },
      })
    return {
      ok: true as const,
      message: input.assigned
        ? `${ta.name} looks after section ${section.name}.`
        : `${ta.name} no longer looks after section ${section.name}.`,
    }
  })
}

/** Sets up, as sections, names students already carry. */
export async function adoptLooseSections(
  database: Db,
  input: { courseId: number; actorId: number },
): Promise<RosterChange> {
  return database.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext('course-sections'), ${input.courseId})`)
    const names = await listLooseSectionNames(tx, input.courseId)
    if (names.length === 0)
      return {
        ok: true as const,
        message: 'Every section students are in is already set up.',
      }
    await tx
      .insert(courseSections)
      .values(names.map((name) => ({ courseId: input.courseId, name })))
      .onConflictDoNothing()
    await audit(tx, {
      actorId: input.actorId,
      courseId: input.courseId,
      kind: 'section-created',
      before: null,
      after: { names },
    })
    return {
      ok: true as const,
      message: `Set up ${names.length} section${names.length === 1 ? '' : 's'}: ${names.join(', ')}.`,
    }
  })
}
