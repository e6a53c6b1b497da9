/**
 * The database schema: one place for every table the app owns. pg-boss keeps its own
 * tables in its own schema. SQL names are snake_case (drizzle `casing`), TypeScript
 * names camelCase.
 */
import { relations, sql } from 'drizzle-orm'
import {
  type AnyPgColumn,
  boolean,
  check,
  date,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
} from 'drizzle-orm/pg-core'

export const courseRole = pgEnum('course_role', ['instructor', 'ta', 'student'])
export const signConvention = pgEnum('sign_convention', ['chemistry', 'engineering'])
export const tokenPurpose = pgEnum('token_purpose', ['invitation', 'password-reset'])
/** private: the owner only; department: everyone in the owner's department; installation: every instructor here. */
export const problemVisibility = pgEnum('problem_visibility', ['private', 'department', 'installation'])
export const sweepStatus = pgEnum('sweep_status', ['queued', 'running', 'done', 'failed'])

const createdAt = () => timestamp({ withTimezone: true }).notNull().defaultNow()

export const departments = pgTable('departments', {
  id: integer().primaryKey().generatedAlwaysAsIdentity(),
  slug: text().notNull().unique(),
  name: text().notNull(),
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
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('users_email_key').on(t.email), check('users_email_lower', sql`${t.email} = lower(${t.email})`)],
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
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('memberships_user_course_key').on(t.userId, t.courseId), index('memberships_course_idx').on(t.courseId)],
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
    createdAt: createdAt(),
  },
  (t) => [
    index('sign_in_attempts_email_idx').on(t.email, t.createdAt),
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
    topics: text().array().notNull().default(sql`'{}'::text[]`),
    difficulty: text().notNull(),
    level: text().notNull(),
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
    /** ProblemDefinition (app/domain/authoring/definition.ts) */
    definition: jsonb().notNull(),
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
    failures: jsonb().notNull().default(sql`'[]'::jsonb`),
    /** why the sweep itself could not run (not a variant's failure) */
    error: text(),
    createdAt: createdAt(),
    startedAt: timestamp({ withTimezone: true }),
    finishedAt: timestamp({ withTimezone: true }),
  },
  (t) => [index('problem_sweeps_version_idx').on(t.problemVersionId, t.createdAt)],
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
