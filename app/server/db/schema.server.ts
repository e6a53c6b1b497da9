/**
 * The database schema: one place for every table the app owns. pg-boss keeps its own
 * tables in its own schema. SQL names are snake_case (drizzle `casing`), TypeScript
 * names camelCase.
 */
import { relations, sql } from 'drizzle-orm'
import {
  boolean,
  check,
  date,
  index,
  integer,
  pgEnum,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
} from 'drizzle-orm/pg-core'

export const courseRole = pgEnum('course_role', ['instructor', 'ta', 'student'])
export const signConvention = pgEnum('sign_convention', ['chemistry', 'engineering'])
export const tokenPurpose = pgEnum('token_purpose', ['invitation', 'password-reset'])

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
