/**
 * The database schema: one place for every table the app owns. pg-boss keeps its own
 * tables in its own schema. SQL names are snake_case (drizzle `casing`), TypeScript
 * names camelCase.
 */
import { relations, sql } from 'drizzle-orm'
import {
  type AnyPgColumn,
  boolean,
  customType,
  check,
  date,
  index,
  integer,
  jsonb,
  doublePrecision,
  pgEnum,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
} from 'drizzle-orm/pg-core'
import type { ProblemDefinition, SweepFailure } from '#app/domain/authoring/definition.ts'
import type { CheckDetail, Tolerance } from '#app/domain/grading/index.ts'

/**
 * What an audit event's before and after hold: the fields that changed (an object), or the
 * lines of a message (a list). Each kind of event writes its own fields; readers check them.
 */
export type AuditValue = Readonly<Record<string, unknown>> | readonly unknown[]

export const courseRole = pgEnum('course_role', ['instructor', 'ta', 'student'])
export const signConvention = pgEnum('sign_convention', ['chemistry', 'engineering'])
export const tokenPurpose = pgEnum('token_purpose', ['invitation', 'password-reset'])
/** private: the owner only; department: everyone in the owner's department; installation: every instructor here. */
export const problemVisibility = pgEnum('problem_visibility', ['private', 'department', 'installation'])
export const sweepStatus = pgEnum('sweep_status', ['queued', 'running', 'done', 'failed'])

/** Raw bytes (PostgreSQL bytea): Drizzle 0.45 has no built-in bytea column. */
const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' })

const createdAt = () => timestamp({ withTimezone: true }).notNull().defaultNow()

export const departments = pgTable('departments', {
  id: integer().primaryKey().generatedAlwaysAsIdentity(),
  slug: text().notNull().unique(),
  name: text().notNull(),
  /** IANA zone for department-wide pages (admin lists, term exports) */
  timeZone: text().notNull().default('UTC'),
  createdAt: createdAt(),
})

export const terms = pgTable('terms', {
  id: integer().primaryKey().generatedAlwaysAsIdentity(),
  departmentId: integer()
    .notNull()
    .references(() => departments.id),
  name: text().notNull(),
  startsOn: date().notNull(),
  endsOn: date().notNull(),
})

export const courses = pgTable(
  'courses',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    departmentId: integer()
      .notNull()
      .references(() => departments.id),
    termId: integer()
      .notNull()
      .references(() => terms.id),
    code: text().notNull(),
    title: text().notNull(),
    /** IANA zone in which the course's dates and times are shown. */
    timeZone: text().notNull().default('UTC'),
    signConvention: signConvention().notNull(),
    /** the course this one was copied from (a new term's copy) */
    copiedFromId: integer().references((): AnyPgColumn => courses.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('courses_term_code_key').on(t.termId, t.code)],
)

export const users = pgTable(
  'users',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    /** Stored lower-cased; unique. */
    email: text().notNull(),
    name: text().notNull(),
    /** argon2id; null until the person accepts an invitation. */
    passwordHash: text(),
    isAdmin: boolean().notNull().default(false),
    departmentId: integer().references(() => departments.id),
    /** from a roster: the institution's student ID and the two halves of the name (name stays the display form) */
    studentNumber: text(),
    familyName: text(),
    givenName: text(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('users_email_key').on(t.email),
    uniqueIndex('users_student_number_key').on(t.studentNumber),
    check('users_email_lower', sql`${t.email} = lower(${t.email})`),
  ],
)

export const memberships = pgTable(
  'memberships',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    courseId: integer()
      .notNull()
      .references(() => courses.id, { onDelete: 'cascade' }),
    role: courseRole().notNull(),
    section: text(),
    /** a dropped student: answers kept, left out of totals and exports */
    droppedAt: timestamp({ withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('memberships_user_course_key').on(t.userId, t.courseId),
    index('memberships_course_idx').on(t.courseId),
  ],
)

/** A course's sections (lab or tutorial groups), named as the department names them. */
export const courseSections = pgTable(
  'course_sections',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    courseId: integer()
      .notNull()
      .references(() => courses.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('course_sections_course_name_key').on(t.courseId, t.name)],
)

/** Which teaching assistants look after which sections. */
export const sectionStaff = pgTable(
  'section_staff',
  {
    sectionId: integer()
      .notNull()
      .references(() => courseSections.id, { onDelete: 'cascade' }),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
  },
  (t) => [uniqueIndex('section_staff_pair_key').on(t.sectionId, t.userId)],
)

/** Single-use links: invitations to a course, and password resets. */
export const accessTokens = pgTable(
  'access_tokens',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    token: text().notNull().unique(),
    purpose: tokenPurpose().notNull(),
    email: text().notNull(),
    courseId: integer().references(() => courses.id, { onDelete: 'cascade' }),
    role: courseRole(),
    createdBy: integer().references(() => users.id),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    usedAt: timestamp({ withTimezone: true }),
    /** an invitation withdrawn by staff before it was used */
    revokedAt: timestamp({ withTimezone: true }),
    /** when the link was last e-mailed (resends move it) */
    lastSentAt: timestamp({ withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [index('access_tokens_email_idx').on(t.email)],
)

/** Server-side session rows; the cookie holds only the id. */
export const sessions = pgTable(
  'sessions',
  {
    id: text().primaryKey(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index('sessions_user_idx').on(t.userId)],
)

/** Every sign-in attempt, for rate limiting per e-mail and per client address. */
export const signInAttempts = pgTable(
  'sign_in_attempts',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    email: text().notNull(),
    clientAddress: text().notNull(),
    succeeded: boolean().notNull(),
    /** sign-in: a password tried; reset: a reset link asked for (throttled apart) */
    kind: text().$type<'sign-in' | 'reset'>().notNull().default('sign-in'),
    createdAt: createdAt(),
  },
  (t) => [
    index('sign_in_attempts_email_idx').on(t.email, t.createdAt),
    index('sign_in_attempts_pair_idx').on(t.email, t.clientAddress, t.createdAt),
    index('sign_in_attempts_client_idx').on(t.clientAddress, t.createdAt),
  ],
)

/** The outbox: every message the local fake SMTP server received. */
export const mailMessages = pgTable(
  'mail_messages',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    messageId: text(),
    envelopeFrom: text().notNull(),
    envelopeTo: text().array().notNull(),
    subject: text().notNull().default(''),
    text: text().notNull().default(''),
    html: text(),
    receivedAt: createdAt(),
  },
  (t) => [index('mail_messages_received_idx').on(t.receivedAt)],
)

/**
 * A bank problem: who owns it, who may see it, and the columns the bank page searches and
 * sorts on (copied from the newest version's definition on every save).
 */
export const problems = pgTable(
  'problems',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    ownerId: integer()
      .notNull()
      .references(() => users.id),
    /** The owner's department when the problem was made; 'department' visibility uses it. */
    departmentId: integer().references(() => departments.id),
    visibility: problemVisibility().notNull().default('private'),
    /** Set on a copy: the problem and version it was copied from. */
    originProblemId: integer().references((): AnyPgColumn => problems.id, { onDelete: 'set null' }),
    originVersionId: integer(),
    /** Set on an import: the credit the bank document carried ({ title, author }). */
    importedFrom: jsonb().$type<{ title: string; author: string }>(),
    title: text().notNull(),
    /** template id or 'general' */
    cycle: text().notNull(),
    topics: text()
      .array()
      .notNull()
      .default(sql`'{}'::text[]`),
    difficulty: text().notNull(),
    level: text().notNull(),
    /** archived: hidden from the bank and the assignment picker, kept for assignments that use it */
    archivedAt: timestamp({ withTimezone: true }),
    createdAt: createdAt(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('problems_owner_idx').on(t.ownerId), index('problems_visibility_idx').on(t.visibility, t.departmentId)],
)

/** One revision of a problem. Frozen once an assignment uses it: editing then makes a new version. */
export const problemVersions = pgTable(
  'problem_versions',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    problemId: integer()
      .notNull()
      .references(() => problems.id, { onDelete: 'cascade' }),
    /** 1, 2, 3, … per problem */
    number: integer().notNull(),
    /**
     * ProblemDefinition (app/domain/authoring/definition.ts), written only after the shape
     * check. Read through readDefinition (app/server/definitions.server.ts), which checks it
     * again and upgrades an older format.
     */
    definition: jsonb().$type<ProblemDefinition>().notNull(),
    createdBy: integer()
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    frozenAt: timestamp({ withTimezone: true }),
  },
  (t) => [uniqueIndex('problem_versions_problem_number_key').on(t.problemId, t.number)],
)

/** A sweep: N sampled variants of one version checked for physical sanity, in the job queue. */
export const problemSweeps = pgTable(
  'problem_sweeps',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    problemVersionId: integer()
      .notNull()
      .references(() => problemVersions.id, { onDelete: 'cascade' }),
    requestedBy: integer()
      .notNull()
      .references(() => users.id),
    status: sweepStatus().notNull().default('queued'),
    /** how many variants to check */
    total: integer().notNull(),
    checked: integer().notNull().default(0),
    failed: integer().notNull().default(0),
    /** SweepFailure[] (the first few hundred) */
    failures: jsonb()
      .$type<SweepFailure[]>()
      .notNull()
      .default(sql`'[]'::jsonb`),
    /** why the sweep itself could not run (not a variant's failure) */
    error: text(),
    createdAt: createdAt(),
    startedAt: timestamp({ withTimezone: true }),
    finishedAt: timestamp({ withTimezone: true }),
  },
  (t) => [index('problem_sweeps_version_idx').on(t.problemVersionId, t.createdAt)],
)

// ---- Assignments, submissions and grading (#6) -----------------------------------------

/** closed: nothing is accepted after the due date; penalty: accepted for lateDaysAllowed days, less a share per day. */
export const latePolicy = pgEnum('late_policy', ['closed', 'penalty'])
/** after-due: each student sees the key once they can no longer submit; manual: when an instructor releases it. */
export const keyRelease = pgEnum('key_release', ['after-due', 'manual'])
export const submissionStatus = pgEnum('submission_status', ['queued', 'graded', 'failed'])
export const verdict = pgEnum('verdict', ['correct', 'incorrect', 'unreadable', 'wrong-dimension'])
export const jobStatus = pgEnum('job_status', ['queued', 'running', 'done', 'failed'])

/** Work set in a course: bank problems (fixed versions), dates, attempts, late and key policies. */
export const assignments = pgTable(
  'assignments',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    courseId: integer()
      .notNull()
      .references(() => courses.id, { onDelete: 'cascade' }),
    title: text().notNull(),
    /** Markdown shown above the problems. */
    instructions: text().notNull().default(''),
    opensAt: timestamp({ withTimezone: true }).notNull(),
    dueAt: timestamp({ withTimezone: true }).notNull(),
    /** Attempts allowed per find (an extension may add more for one student). */
    attemptsPerFind: integer().notNull().default(3),
    latePolicy: latePolicy().notNull().default('closed'),
    /** penalty policy: the share of a late answer's points lost per day (or part day) late, in percent. */
    latePenaltyPercentPerDay: doublePrecision().notNull().default(0),
    /** penalty policy: how many days after the (extended) due date answers are still accepted. */
    lateDaysAllowed: integer().notNull().default(0),
    keyRelease: keyRelease().notNull().default('after-due'),
    /** manual release: when an instructor released the key and worked solutions. */
    keyReleasedAt: timestamp({ withTimezone: true }),
    /** when an instructor released the grades (students are e-mailed). */
    gradesReleasedAt: timestamp({ withTimezone: true }),
    /** students may dispute a verdict until this many days after the grades are released */
    disputeDays: integer().notNull().default(7),
    createdBy: integer()
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('assignments_course_idx').on(t.courseId, t.dueAt),
    check('assignments_due_after_open', sql`${t.dueAt} > ${t.opensAt}`),
    check('assignments_attempts_positive', sql`${t.attemptsPerFind} >= 1`),
  ],
)

/** One problem of an assignment, pinned to a problem version. */
export const assignmentItems = pgTable(
  'assignment_items',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    assignmentId: integer()
      .notNull()
      .references(() => assignments.id, { onDelete: 'cascade' }),
    /** 1, 2, 3, … in the order students see them */
    position: integer().notNull(),
    problemId: integer()
      .notNull()
      .references(() => problems.id),
    problemVersionId: integer()
      .notNull()
      .references(() => problemVersions.id),
    /** The problem's worth in this assignment; its finds share it in proportion to their own points. */
    points: doublePrecision().notNull(),
    /** findName → Tolerance replacing the version's tolerance for this assignment (a regrade may set it). */
    toleranceOverrides: jsonb()
      .$type<Record<string, Tolerance>>()
      .notNull()
      .default(sql`'{}'::jsonb`),
  },
  (t) => [
    index('assignment_items_assignment_idx').on(t.assignmentId, t.position),
    check('assignment_items_points', sql`${t.points} >= 0`),
  ],
)

/** A per-student accommodation: a later due date and/or more attempts per find. */
export const extensions = pgTable(
  'extensions',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    assignmentId: integer()
      .notNull()
      .references(() => assignments.id, { onDelete: 'cascade' }),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    /** null: the assignment's own due date */
    dueAt: timestamp({ withTimezone: true }),
    extraAttempts: integer().notNull().default(0),
    reason: text().notNull().default(''),
    createdBy: integer()
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('extensions_assignment_user_key').on(t.assignmentId, t.userId),
    check('extensions_extra_attempts', sql`${t.extraAttempts} >= 0`),
  ],
)

/** One press of Submit on one problem: the answers exactly as typed, kept for good. */
export const submissions = pgTable(
  'submissions',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    assignmentId: integer()
      .notNull()
      .references(() => assignments.id, { onDelete: 'cascade' }),
    itemId: integer()
      .notNull()
      .references(() => assignmentItems.id, { onDelete: 'cascade' }),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    /** findName → the text typed, every find of the form (blank ones included) */
    answers: jsonb().$type<Record<string, string>>().notNull(),
    submittedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    status: submissionStatus().notNull().default('queued'),
    /** whole days (or parts of days) after the student's due date; 0 when on time */
    daysLate: integer().notNull().default(0),
    /** the share of points lost to lateness, 0…1 */
    latePenalty: doublePrecision().notNull().default(0),
    gradedAt: timestamp({ withTimezone: true }),
    /** why grading stopped for good (status failed) */
    error: text(),
    /** the one-time token of the rendered answer form: the same press is stored once */
    formToken: text(),
  },
  (t) => [
    index('submissions_item_user_idx').on(t.itemId, t.userId, t.submittedAt),
    uniqueIndex('submissions_user_form_token_idx').on(t.userId, t.formToken),
    index('submissions_assignment_status_idx').on(t.assignmentId, t.status),
  ],
)

/** The grade of one find in one submission; counted answers only (blank or unreadable ones use no attempt). */
export const partResults = pgTable(
  'part_results',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    submissionId: integer()
      .notNull()
      .references(() => submissions.id, { onDelete: 'cascade' }),
    assignmentId: integer().notNull(),
    itemId: integer().notNull(),
    userId: integer().notNull(),
    findName: text().notNull(),
    /** the text as typed */
    answer: text().notNull(),
    /** this find's attempt number for this student, 1…n */
    attempt: integer().notNull(),
    /** null until graded */
    verdict: verdict(),
    /** the answer's value in the find's unit, as read (statistics group wrong answers by it) */
    value: doublePrecision(),
    /** points earned after the late penalty, in the assignment's points */
    score: doublePrecision(),
    /** the most this find can earn in the assignment */
    maxScore: doublePrecision().notNull(),
    message: text(),
    pitfallId: text(),
    pitfallFeedback: text(),
    /** checkAnswer's detail (difference, allowed difference, how the answer was read) */
    detail: jsonb().$type<CheckDetail>(),
    /** the problem version and tolerance the grade was computed against */
    gradedVersionId: integer(),
    graderVersion: text(),
    gradedAt: timestamp({ withTimezone: true }),
    /** the regrade that last changed this row */
    regradeId: integer(),
  },
  (t) => [
    uniqueIndex('part_results_submission_find_key').on(t.submissionId, t.findName),
    index('part_results_item_user_find_idx').on(t.itemId, t.userId, t.findName),
    index('part_results_assignment_idx').on(t.assignmentId),
  ],
)

/** A regrade of one assignment item: previewed, then applied by a job that reports progress. */
export const regrades = pgTable(
  'regrades',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    assignmentId: integer()
      .notNull()
      .references(() => assignments.id, { onDelete: 'cascade' }),
    itemId: integer()
      .notNull()
      .references(() => assignmentItems.id, { onDelete: 'cascade' }),
    fromVersionId: integer().notNull(),
    toVersionId: integer().notNull(),
    toleranceOverrides: jsonb()
      .$type<Record<string, Tolerance>>()
      .notNull()
      .default(sql`'{}'::jsonb`),
    status: jobStatus().notNull().default('queued'),
    /** parts to regrade, parts done, parts whose score changed */
    total: integer().notNull().default(0),
    done: integer().notNull().default(0),
    changed: integer().notNull().default(0),
    error: text(),
    requestedBy: integer()
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    finishedAt: timestamp({ withTimezone: true }),
  },
  (t) => [index('regrades_assignment_idx').on(t.assignmentId, t.createdAt)],
)

/** A large grade export made by the worker (a term's courses for a department admin). */
export const gradeExports = pgTable(
  'grade_exports',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    requestedBy: integer()
      .notNull()
      .references(() => users.id),
    termId: integer()
      .notNull()
      .references(() => terms.id),
    status: jobStatus().notNull().default('queued'),
    rows: integer().notNull().default(0),
    fileName: text().notNull(),
    csv: text(),
    error: text(),
    createdAt: createdAt(),
    finishedAt: timestamp({ withTimezone: true }),
  },
  (t) => [index('grade_exports_requested_idx').on(t.requestedBy, t.createdAt)],
)

/** open: waiting for staff; upheld: the answer is accepted (for every student who gave it on that variant); adjusted: the find's score was changed by hand; rejected: the score is kept. */
export const disputeStatus = pgEnum('dispute_status', ['open', 'upheld', 'adjusted', 'rejected'])

/** A file a student uploaded with a dispute (their own worked solution). Kept in the database, behind the same checks as their answers. */
export const attachments = pgTable(
  'attachments',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    /** the student who uploaded it */
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    courseId: integer()
      .notNull()
      .references(() => courses.id, { onDelete: 'cascade' }),
    /** the name the file had on the student's computer (shown, never trusted) */
    fileName: text().notNull(),
    /** detected from the content: application/pdf, image/png or image/jpeg */
    contentType: text().notNull(),
    size: integer().notNull(),
    sha256: text().notNull(),
    data: bytea().notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    index('attachments_user_idx').on(t.userId),
    check('attachments_size', sql`${t.size} > 0 and ${t.size} <= 10485760`),
  ],
)

/** A student's challenge to the verdict on one graded answer to one find. */
export const disputes = pgTable(
  'disputes',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    courseId: integer()
      .notNull()
      .references(() => courses.id, { onDelete: 'cascade' }),
    assignmentId: integer()
      .notNull()
      .references(() => assignments.id, { onDelete: 'cascade' }),
    itemId: integer()
      .notNull()
      .references(() => assignmentItems.id, { onDelete: 'cascade' }),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    findName: text().notNull(),
    /** the graded answer disputed (the student's latest graded answer to the find when raised) */
    partResultId: integer()
      .notNull()
      .references(() => partResults.id, { onDelete: 'cascade' }),
    reason: text().notNull(),
    attachmentId: integer().references(() => attachments.id, { onDelete: 'set null' }),
    status: disputeStatus().notNull().default('open'),
    /** staff's comment when resolving (required when adjusting) */
    comment: text(),
    resolvedBy: integer().references(() => users.id),
    resolvedAt: timestamp({ withTimezone: true }),
    /** the find's score before and after the resolution */
    scoreBefore: doublePrecision(),
    scoreAfter: doublePrecision(),
    createdAt: createdAt(),
  },
  (t) => [
    index('disputes_course_status_idx').on(t.courseId, t.status, t.createdAt),
    index('disputes_user_idx').on(t.userId, t.createdAt),
    uniqueIndex('disputes_one_open_per_find')
      .on(t.itemId, t.userId, t.findName)
      .where(sql`status = 'open'`),
  ],
)

/**
 * Append-only record of every score change (a regrade here; TA decisions in #7): who, when,
 * what it was and what it became. Rows are never updated or deleted.
 */
export const auditEvents = pgTable(
  'audit_events',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    at: createdAt(),
    /** null: the system (a job) */
    actorId: integer().references(() => users.id),
    courseId: integer().notNull(),
    assignmentId: integer(),
    /** the student the change is about */
    userId: integer(),
    partResultId: integer(),
    /** 'regrade', 'extension', 'key-released', 'grades-released', … */
    kind: text().notNull(),
    before: jsonb().$type<AuditValue>(),
    after: jsonb().$type<AuditValue>(),
    note: text().notNull().default(''),
  },
  (t) => [index('audit_events_course_idx').on(t.courseId, t.at), index('audit_events_user_idx').on(t.userId, t.at)],
)

export const usersRelations = relations(users, ({ many }) => ({ memberships: many(memberships) }))
export const coursesRelations = relations(courses, ({ one, many }) => ({
  term: one(terms, { fields: [courses.termId], references: [terms.id] }),
  department: one(departments, { fields: [courses.departmentId], references: [departments.id] }),
  memberships: many(memberships),
}))
export const membershipsRelations = relations(memberships, ({ one }) => ({
  user: one(users, { fields: [memberships.userId], references: [users.id] }),
  course: one(courses, { fields: [memberships.courseId], references: [courses.id] }),
}))

export type User = typeof users.$inferSelect
export type Course = typeof courses.$inferSelect
export type Membership = typeof memberships.$inferSelect
export type CourseRole = (typeof courseRole.enumValues)[number]
export type SignConvention = (typeof signConvention.enumValues)[number]
export type MailMessage = typeof mailMessages.$inferSelect
export type Problem = typeof problems.$inferSelect
export type ProblemVersion = typeof problemVersions.$inferSelect
export type ProblemSweep = typeof problemSweeps.$inferSelect
export type ProblemVisibility = (typeof problemVisibility.enumValues)[number]
export type Assignment = typeof assignments.$inferSelect
export type NewAssignment = typeof assignments.$inferInsert
export type AssignmentItem = typeof assignmentItems.$inferSelect
export type Extension = typeof extensions.$inferSelect
export type Submission = typeof submissions.$inferSelect
export type PartResult = typeof partResults.$inferSelect
export type Regrade = typeof regrades.$inferSelect
export type GradeExport = typeof gradeExports.$inferSelect
export type AuditEvent = typeof auditEvents.$inferSelect
export type LatePolicy = (typeof latePolicy.enumValues)[number]
export type KeyRelease = (typeof keyRelease.enumValues)[number]
export type Dispute = typeof disputes.$inferSelect
export type Attachment = typeof attachments.$inferSelect
export type DisputeStatus = (typeof disputeStatus.enumValues)[number]
export type CourseSection = typeof courseSections.$inferSelect
