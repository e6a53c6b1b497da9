/**
 * Who may do what, for every route in app/routes.ts. The URL map is read from the route
 * config itself and flattened to (path pattern, file); EXPECTED below holds one entry per
 * route file with the outcome of GET (its loader) and POST (its action) for each role:
 *
 *   signedOut        no session
 *   student          a student of course A (owns the dispute and the answers in the fixtures)
 *   classmate        another student of course A (owns nothing in the fixtures)
 *   otherStudent     a student of course B only
 *   ta               a teaching assistant of course A
 *   instructor       an instructor of course A (owns the bank problem used in A)
 *   otherInstructor  an instructor of course B only, in another department
 *   admin            a department admin (department A) who is a member of no course
 *
 * Routes under /courses/:courseId that also name a record of the course (an assignment, a
 * dispute) are tried across courses too, with the course in the URL being the caller's own
 * course B and the record being A's: `otherStudentOwnCourse`, `otherInstructorOwnCourse`.
 *
 * A route missing from EXPECTED, an entry whose route is gone, a loader or action without
 * its expectations (or expectations for one that does not exist) all fail. Loaders and
 * actions are called directly with real Requests and session cookies; thrown Responses and
 * `data()` results are read for their status. Inputs are valid: this is about who, not what.
 */
import { count, eq } from 'drizzle-orm'
import { nanoid } from 'nanoid'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import routeConfig from '#app/routes.ts'
import { formValuesFromDefinition } from '#app/lib/problem-form.ts'
import { db } from '#app/server/db/client.server.ts'
import {
  accessTokens,
  attachments,
  disputes,
  gradeExports,
  mailMessages,
  partResults,
  problemSweeps,
  regrades,
  submissions,
} from '#app/server/db/schema.server.ts'
import { createProblem } from '#app/server/problems.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { carnotDrill } from '#tests/support/definitions.ts'
import { addMember, createAssignment, createCourseWithAssignment, createUser } from '#tests/support/factories.ts'
import { loginAs } from '#tests/support/login.ts'
import { args, BASE } from '#tests/support/requests.ts'

// ---- The route config, flattened -------------------------------------------------------

type RouteEntry = { id?: string; path?: string; index?: boolean; file: string; children?: RouteEntry[] }
type FlatRoute = { pattern: string; file: string }

function flatten(entries: readonly RouteEntry[], parent = ''): FlatRoute[] {
  const out: FlatRoute[] = []
  for (const e of entries) {
    const here = [parent, e.path ?? ''].filter(Boolean).join('/')
    // A layout route (no path, not an index: the course header) has no loader or action of
    // its own to guard; its pages are listed through its children.
    const isLayout = e.path === undefined && !e.index && e.children !== undefined
    if (!isLayout) out.push({ pattern: '/' + here, file: e.file })
    if (e.children) out.push(...flatten(e.children, here))
  }
  return out
}

const ROUTES = flatten(routeConfig as unknown as RouteEntry[])

// ---- Roles and outcomes -----------------------------------------------------------------

const CORE_ROLES = [
  'signedOut',
  'student',
  'classmate',
  'otherStudent',
  'ta',
  'instructor',
  'otherInstructor',
  'admin',
] as const
const CROSS_ROLES = ['otherStudentOwnCourse', 'otherInstructorOwnCourse'] as const
type CoreRole = (typeof CORE_ROLES)[number]
type CrossRole = (typeof CROSS_ROLES)[number]
type Role = CoreRole | CrossRole

/**
 * ok: 2xx. moved: 3xx to the place the entry names (`moved`). sign-in: 3xx to the sign-in
 * page. Numbers: that status (401 from the JSON API when signed out).
 */
type Outcome = 'ok' | 'moved' | 'sign-in' | 400 | 401 | 403 | 404 | 405
type Expectations = Record<CoreRole, Outcome> & Partial<Record<CrossRole, Outcome>>

type Ctx = { role: Role; courseId: number; headers: Record<string, string> }
type Params = Record<string, string>
type Body = { form: Record<string, string> } | { multipart: FormData } | { json: unknown }

type Method = {
  expect: Expectations
  /** where an allowed request is sent (for 'moved') */
  moved?: (w: World) => RegExp
  /** the URL's params; defaults to the entry's */
  params?: (w: World, ctx: Ctx) => Promise<Params> | Params
  query?: (w: World) => string
}
type PostMethod = Method & { body: (w: World, ctx: Ctx, params: Params) => Promise<Body> | Body }
type Entry = {
  params?: (w: World, ctx: Ctx) => Promise<Params> | Params
  get?: Method
  post?: PostMethod
}

// Shorthands for the common shapes of the table.
const everyone = (o: Outcome): Expectations => Object.fromEntries(CORE_ROLES.map((r) => [r, o])) as Expectations
/** The course's members (students, TA, instructor) only. */
const courseMembers: Expectations = {
  signedOut: 'sign-in',
  student: 'ok',
  classmate: 'ok',
  otherStudent: 403,
  ta: 'ok',
  instructor: 'ok',
  otherInstructor: 403,
  admin: 403,
}
const courseStaff: Expectations = { ...courseMembers, student: 403, classmate: 403 }
const courseInstructor: Expectations = { ...courseStaff, ta: 403 }
const courseStaffApi: Expectations = {
  signedOut: 401,
  student: 403,
  classmate: 403,
  otherStudent: 403,
  ta: 'ok',
  instructor: 'ok',
  otherInstructor: 403,
  admin: 403,
}
const bankUsers: Expectations = {
  signedOut: 'sign-in',
  student: 403,
  classmate: 403,
  otherStudent: 403,
  ta: 403,
  instructor: 'ok',
  otherInstructor: 'ok',
  admin: 'ok',
}
const bankUsersApi: Expectations = { ...bankUsers, signedOut: 401 }
const adminOnly: Expectations = {
  signedOut: 'sign-in',
  student: 403,
  classmate: 403,
  otherStudent: 403,
  ta: 403,
  instructor: 403,
  otherInstructor: 403,
  admin: 'ok',
}
/** The same, where the allowed answer is a redirect to the entry's `moved` place. */
const redirecting = (e: Expectations): Expectations =>
  Object.fromEntries(Object.entries(e).map(([r, o]) => [r, o === 'ok' ? 'moved' : o])) as Expectations
/**
 * The course in the URL is the caller's own (B) but the record is A's. A caller without the
 * role in B is refused by the role check (403); one with it finds no such record (404, or a
 * 400 form error where an action reports the record as missing in its form).
 */
const cross = (otherStudentOwnCourse: Outcome, otherInstructorOwnCourse: Outcome) => ({
  otherStudentOwnCourse,
  otherInstructorOwnCourse,
})
const crossMembers = cross(404, 404)
const crossStaff = cross(403, 404)

// ---- Fixtures ---------------------------------------------------------------------------

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.earlierVersions![0]!

const carnot = carnotDrill

const unique = () => nanoid(10).replace(/[^A-Za-z0-9]/g, 'x')
const localMinute = (d: Date) => d.toISOString().slice(0, 16)

type World = Awaited<ReturnType<typeof build>>
let world: World

async function build() {
  const A = await createCourseWithAssignment(db(), [otto], {
    students: 2,
    assignment: { keyRelease: 'manual', gradesReleasedAt: new Date(Date.now() - 3600_000) },
  })
  const B = await createCourseWithAssignment(db(), [otto], { students: 1 })
  const [student, classmate] = A.students as [(typeof A.students)[0], (typeof A.students)[0]]
  const ta = await createUser(db(), { name: 'Course TA', password: null })
  await addMember(db(), ta.id, A.course.id, 'ta')
  const admin = await createUser(db(), {
    name: 'Department Admin',
    isAdmin: true,
    departmentId: A.course.departmentId,
    password: null,
  })
  const signInUser = await createUser(db(), { name: 'Signs In' })
  const item = A.items[0]!
  const people = {
    student,
    classmate,
    otherStudent: B.students[0]!,
    ta,
    instructor: A.instructor,
    otherInstructor: B.instructor,
    admin,
  }

  /** A graded answer of `userId` to find T2 of `it`; returns the part result's id. */
  async function graded(userId: number, it: { id: number; assignmentId: number }) {
    const [sub] = await db()
      .insert(submissions)
      .values({ assignmentId: it.assignmentId, itemId: it.id, userId, answers: { T2: '312 K' }, status: 'graded' })
      .returning({ id: submissions.id })
    const [part] = await db()
      .insert(partResults)
      .values({
        submissionId: sub!.id,
        assignmentId: it.assignmentId,
        itemId: it.id,
        userId,
        findName: 'T2',
        answer: '312 K',
        attempt: 1,
        verdict: 'incorrect',
        value: 312,
        score: 0,
        maxScore: 2,
        message: 'Not within tolerance.',
      })
      .returning({ id: partResults.id })
    return part!.id
  }
  /** An open dispute by the student on T2 of `it`, with a PNG attached. */
  async function openDispute(it: { id: number; assignmentId: number }) {
    const partId = await graded(student.id, it)
    const [file] = await db()
      .insert(attachments)
      .values({
        userId: student.id,
        courseId: A.course.id,
        fileName: 'working.png',
        contentType: 'image/png',
        size: 4,
        sha256: 'x',
        data: Buffer.from([0x89, 0x50, 0x4e, 0x47]),
      })
      .returning({ id: attachments.id })
    const [row] = await db()
      .insert(disputes)
      .values({
        courseId: A.course.id,
        assignmentId: it.assignmentId,
        itemId: it.id,
        userId: student.id,
        findName: 'T2',
        partResultId: partId,
        reason: 'My T2 is right; see my working attached.',
        attachmentId: file!.id,
      })
      .returning({ id: disputes.id })
    return row!.id
  }
  /** A fresh assignment of course A over the bank problem, grades released an hour ago. */
  async function freshAssignment() {
    const made = await createAssignment(
      db(),
      A.course.id,
      A.instructor.id,
      [{ problemId: item.problemId, versionId: item.problemVersionId }],
      {
        keyRelease: 'manual',
        gradesReleasedAt: new Date(Date.now() - 3600_000),
      },
    )
    return { assignment: made.assignment, item: made.items[0]! }
  }
  async function freshToken(purpose: 'invitation' | 'password-reset', email: string) {
    const token = nanoid(32)
    await db()
      .insert(accessTokens)
      .values({
        token,
        purpose,
        email,
        courseId: purpose === 'invitation' ? A.course.id : null,
        role: purpose === 'invitation' ? 'student' : null,
        expiresAt: new Date(Date.now() + 86_400_000),
      })
    return token
  }

  const disputeId = await openDispute(item)
  await graded(classmate.id, item)
  const [regrade] = await db()
    .insert(regrades)
    .values({
      assignmentId: A.assignment.id,
      itemId: item.id,
      fromVersionId: item.problemVersionId,
      toVersionId: item.problemVersionId,
      status: 'done',
      requestedBy: A.instructor.id,
    })
    .returning({ id: regrades.id })
  const [sweep] = await db()
    .insert(problemSweeps)
    .values({
      problemVersionId: item.problemVersionId,
      requestedBy: A.instructor.id,
      status: 'done',
      total: 10,
      checked: 10,
    })
    .returning({ id: problemSweeps.id })
  const [mail] = await db()
    .insert(mailMessages)
    .values({ envelopeFrom: 'noreply@test.example', envelopeTo: [student.email], subject: 'A message', text: 'Hello.' })
    .returning({ id: mailMessages.id })
  const [gradeExport] = await db()
    .insert(gradeExports)
    .values({
      requestedBy: admin.id,
      termId: A.course.termId,
      status: 'done',
      rows: 1,
      fileName: 'term-grades.csv',
      csv: 'a,b\n1,2\n',
      finishedAt: new Date(),
    })
    .returning({ id: gradeExports.id })
  const viewerA = { id: A.instructor.id, isAdmin: false, departmentId: A.course.departmentId }

  return {
    A,
    B,
    people,
    signInUser,
    item,
    ids: {
      disputeId,
      regradeId: regrade!.id,
      sweepId: sweep!.id,
      messageId: mail!.id,
      exportId: gradeExport!.id,
      problemId: item.problemId,
    },
    freshAssignment,
    openDispute,
    graded,
    freshToken,
    /** a fresh bank problem of A's instructor, not yet used anywhere */
    freshProblem: async () =>
      (await createProblem(db(), viewerA, { definition: carnot(`Drill ${unique()}`), visibility: 'private' }))
        .problemId,
  }
}

beforeAll(async () => {
  world = await build()
})

afterAll(async () => {
  await stopBoss()
})

// Params shared by many entries. `ctx.courseId` is A, or B in the cross-course cases.
const course = (_w: World, ctx: Ctx) => ({ courseId: String(ctx.courseId) })
const assignment = (w: World, ctx: Ctx) => ({ ...course(w, ctx), assignmentId: String(w.A.assignment.id) })
const problem = (w: World, ctx: Ctx) => ({ ...assignment(w, ctx), position: '1' })
const dispute = (w: World, ctx: Ctx) => ({ ...course(w, ctx), disputeId: String(w.ids.disputeId) })
const apiAssignment = (w: World) => ({ assignmentId: String(w.A.assignment.id) })
const bankProblem = (w: World) => ({ problemId: String(w.ids.problemId) })

function settingsFields(w: World): Record<string, string> {
  return {
    intent: 'save',
    title: `Week ${unique()}`,
    instructions: '',
    opensAt: '2027-01-10T09:00',
    dueAt: '2027-01-15T23:59',
    attemptsPerFind: '3',
    latePolicy: 'penalty',
    latePenaltyPercentPerDay: '10',
    lateDaysAllowed: '2',
    keyRelease: 'after-due',
    'items.0.versionId': String(w.item.problemVersionId),
    'items.0.points': '10',
  }
}

const editorFields = (title: string) => ({
  ...formValuesFromDefinition(carnot(title)),
  visibility: 'private',
  intent: 'save',
})

// ---- The table: one entry per route file ---------------------------------------------------

const EXPECTED: Record<string, Entry> = {
  'routes/home.tsx': { get: { expect: { ...everyone('ok'), signedOut: 'sign-in' } } },
  'routes/sign-in.tsx': {
    get: { expect: { ...everyone('moved'), signedOut: 'ok' }, moved: () => /^\/$/ },
    post: {
      expect: everyone('moved'),
      moved: () => /^\/$/,
      body: (w) => ({ form: { email: w.signInUser.email, password: w.signInUser.password! } }),
    },
  },
  'routes/sign-out.tsx': {
    get: { expect: everyone('moved'), moved: () => /^\/$/ },
    post: { expect: everyone('moved'), moved: () => /^\/sign-in$/, body: () => ({ form: {} }) },
  },
  'routes/forgot-password.tsx': {
    post: { expect: everyone('ok'), body: (w) => ({ form: { email: w.people.student.email } }) },
  },
  // The token is the authority on these two: whoever holds the link may use it.
  'routes/reset-password.tsx': {
    params: async (w) => ({
      token: await w.freshToken('password-reset', (await createUser(db(), { password: null })).email),
    }),
    get: { expect: everyone('ok') },
    post: {
      expect: everyone('moved'),
      moved: () => /^\/sign-in\?reset=1$/,
      body: () => ({ form: { password: 'a long new password 123', confirm: 'a long new password 123' } }),
    },
  },
  'routes/join.tsx': {
    params: async (w) => ({ token: await w.freshToken('invitation', `new-${unique()}@test.example`.toLowerCase()) }),
    get: { expect: everyone('ok') },
    post: {
      expect: everyone('moved'),
      moved: (w) => new RegExp(`^/courses/${w.A.course.id}$`),
      body: () => ({
        form: { name: 'New Person', password: 'a long new password 123', confirm: 'a long new password 123' },
      }),
    },
  },

  // -- A course
  'routes/courses/$courseId.tsx': { params: course, get: { expect: courseMembers } },
  'routes/courses/people.tsx': {
    params: course,
    get: { expect: courseStaff },
    post: {
      expect: courseInstructor,
      body: () => ({
        form: { intent: 'invite', email: `invitee-${unique()}@test.example`.toLowerCase(), role: 'student' },
      }),
    },
  },
  'routes/courses/people/import.tsx': {
    params: course,
    get: { expect: courseInstructor },
    post: {
      expect: courseInstructor,
      body: () => {
        const form = new FormData()
        form.set('intent', 'preview')
        form.set(
          'csv',
          `Student ID,Family name,Given name,E-mail\nS${Date.now()},Listed,Person,listed-${unique().toLowerCase()}@test.example\n`,
        )
        return { multipart: form }
      },
    },
  },
  'routes/courses/people/sections.tsx': {
    params: course,
    get: { expect: courseStaff },
    post: { expect: courseInstructor, body: () => ({ form: { intent: 'create', name: `Lab ${unique()}` } }) },
  },
  'routes/courses/students/$userId.tsx': {
    params: (w, ctx) => ({ ...course(w, ctx), userId: String(w.people.student.id) }),
    get: { expect: { ...courseStaff, ...crossStaff } },
  },
  'routes/courses/gradebook.tsx': { params: course, get: { expect: courseStaff } },
  'routes/resources/course-gradebook-csv.ts': { params: course, get: { expect: courseStaff } },
  'routes/resources/course-gradebook-xlsx.ts': { params: course, get: { expect: courseStaff } },
  'routes/courses/disputes/index.tsx': { params: course, get: { expect: courseMembers } },
  'routes/courses/disputes/$disputeId.tsx': {
    params: dispute,
    get: { expect: { ...courseMembers, classmate: 404, ...crossMembers } },
    post: {
      // Each try resolves a dispute of its own, so one allowed resolution does not spoil the next.
      params: async (w, ctx) => ({
        ...course(w, ctx),
        disputeId: String(await w.openDispute((await w.freshAssignment()).item)),
      }),
      expect: { ...redirecting(courseStaff), ...cross(403, 400) },
      moved: (w) => new RegExp(`^/courses/${w.A.course.id}/disputes/\\d+\\?resolved=\\d+$`),
      body: () => ({ form: { intent: 'resolve', decision: 'reject', comment: 'The key stands.' } }),
    },
  },
  'routes/resources/dispute-attachment.ts': {
    params: dispute,
    get: { expect: { ...courseMembers, classmate: 404, ...crossMembers } },
  },
  'routes/courses/audit.tsx': { params: course, get: { expect: courseInstructor } },
  'routes/courses/settings.tsx': {
    params: course,
    get: { expect: courseInstructor },
    post: {
      expect: redirecting(courseInstructor),
      moved: (w) => new RegExp(`^/courses/${w.A.course.id}/settings\\?saved=1$`),
      body: (w) => ({
        form: {
          intent: 'save',
          code: w.A.course.code,
          title: w.A.course.title,
          signConvention: w.A.course.signConvention,
          timeZone: w.A.course.timeZone,
        },
      }),
    },
  },

  // -- Assignments
  'routes/courses/assignments/new.tsx': {
    params: course,
    get: { expect: courseInstructor },
    post: {
      expect: redirecting(courseInstructor),
      moved: (w) => new RegExp(`^/courses/${w.A.course.id}/assignments/\\d+$`),
      body: (w) => ({ form: settingsFields(w) }),
    },
  },
  'routes/courses/assignments/$assignmentId.tsx': {
    params: assignment,
    get: { expect: { ...courseMembers, ...crossMembers } },
    post: {
      expect: { ...redirecting(courseInstructor), ...crossStaff },
      // A's grades are already released, so the confirmed release changes nothing and answers with the page.
      moved: (w) => new RegExp(`^/courses/${w.A.course.id}/assignments/${w.A.assignment.id}\\?done=grades$`),
      body: () => ({ form: { intent: 'release-grades', confirm: 'yes', early: 'yes' } }),
    },
  },
  'routes/courses/assignments/edit.tsx': {
    params: assignment,
    get: { expect: { ...courseInstructor, ...crossStaff } },
    post: {
      params: async (w, ctx) => ({
        ...course(w, ctx),
        assignmentId: String((await w.freshAssignment()).assignment.id),
      }),
      expect: { ...redirecting(courseInstructor), ...crossStaff },
      moved: (w) => new RegExp(`^/courses/${w.A.course.id}/assignments/\\d+$`),
      body: (w) => ({ form: settingsFields(w) }),
    },
  },
  'routes/courses/assignments/extensions.tsx': {
    params: assignment,
    get: { expect: { ...courseStaff, ...crossStaff } },
    post: {
      expect: { ...redirecting(courseInstructor), ...crossStaff },
      moved: (w) => new RegExp(`^/courses/${w.A.course.id}/assignments/${w.A.assignment.id}/extensions\\?done=saved$`),
      body: (w) => ({
        form: {
          intent: 'save',
          userId: String(w.people.student.id),
          dueAt: localMinute(new Date(Date.now() + 10 * 86_400_000)),
          extraAttempts: '1',
          reason: 'Ill for a week.',
        },
      }),
    },
  },
  'routes/courses/assignments/gradebook.tsx': {
    params: assignment,
    get: { expect: { ...courseStaff, ...crossStaff } },
  },
  'routes/courses/assignments/statistics.tsx': {
    params: assignment,
    get: { expect: { ...courseStaff, ...crossStaff } },
  },
  'routes/courses/assignments/problem.tsx': {
    params: problem,
    get: { expect: { ...courseMembers, ...crossMembers } },
    post: {
      // A fresh assignment each time: the release-key case above releases the key of A's.
      params: async (w, ctx) => ({
        ...course(w, ctx),
        assignmentId: String((await w.freshAssignment()).assignment.id),
        position: '1',
      }),
      expect: { ...redirecting(courseMembers), ta: 403, instructor: 403, ...cross(400, 403) },
      moved: (w) => new RegExp(`^/courses/${w.A.course.id}/assignments/\\d+/problems/1\\?receipt=\\d+$`),
      body: async (w, ctx, params) => {
        // A one-time token from a fresh rendering of the page, as the browser would send it
        // (the caller's own when they may see the page, else one of the student's).
        const mod = await import('#app/routes/courses/assignments/problem.tsx')
        const asker = ['student', 'classmate'].includes(ctx.role) ? ctx.headers : await loginAs(w.people.student)
        const page = (await mod.loader(
          args(
            new Request(`${BASE}/courses/${w.A.course.id}/assignments/${params.assignmentId}/problems/1`, {
              headers: asker,
            }),
            { ...params, courseId: String(w.A.course.id) },
          ),
        )) as {
          formToken?: string | null
        }
        return { form: { formToken: page.formToken ?? '', 'answer.T2': '583 K' } }
      },
    },
  },
  'routes/courses/assignments/answers.tsx': { params: problem, get: { expect: { ...courseStaff, ...crossStaff } } },
  'routes/courses/assignments/regrade.tsx': {
    params: problem,
    get: { expect: { ...courseInstructor, ...crossStaff } },
    post: {
      params: async (w, ctx) => ({
        ...course(w, ctx),
        assignmentId: String((await w.freshAssignment()).assignment.id),
        position: '1',
      }),
      expect: { ...redirecting(courseInstructor), ...cross(403, 400) },
      moved: (w) => new RegExp(`^/courses/${w.A.course.id}/assignments/\\d+/problems/1/regrade\\?regrade=\\d+$`),
      body: (w) => ({
        form: {
          intent: 'apply',
          version: String(w.item.problemVersionId),
          'kind.T2': 'relative',
          'value.T2': '5 %',
          'unit.T2': '',
        },
      }),
    },
  },
  'routes/courses/assignments/dispute.tsx': {
    params: problem,
    get: { expect: { ...courseMembers, ta: 403, instructor: 403, ...cross(404, 403) }, query: () => '?find=T2' },
    post: {
      // A fresh assignment where both students of A have a graded T2, grades released.
      params: async (w, ctx) => {
        const fresh = await w.freshAssignment()
        await w.graded(w.people.student.id, fresh.item)
        await w.graded(w.people.classmate.id, fresh.item)
        return { ...course(w, ctx), assignmentId: String(fresh.assignment.id), position: '1' }
      },
      expect: { ...redirecting(courseMembers), ta: 403, instructor: 403, ...cross(400, 403) },
      moved: (w) => new RegExp(`^/courses/${w.A.course.id}/assignments/\\d+/problems/1\\?disputed=T2$`),
      body: () => {
        const form = new FormData()
        form.set('find', 'T2')
        form.set('reason', 'I used the right ratio; the key rounds too early.')
        return { multipart: form }
      },
    },
  },

  // -- The problem bank (the problem is A's instructor's, private)
  'routes/bank/index.tsx': { get: { expect: bankUsers } },
  'routes/bank/new.tsx': {
    get: { expect: bankUsers },
    post: {
      expect: { ...bankUsers, instructor: 'moved', otherInstructor: 'moved', admin: 'moved' },
      moved: () => /^\/bank\/\d+$/,
      body: () => ({ form: editorFields(`New ${unique()}`) }),
    },
  },
  'routes/bank/import.tsx': {
    get: { expect: bankUsers },
    post: {
      expect: { ...bankUsers, instructor: 'moved', otherInstructor: 'moved', admin: 'moved' },
      moved: () => /^\/bank\?imported=1$/,
      body: () => {
        const doc = {
          format: 'cyclewright-bank',
          version: 1,
          exportedAt: new Date().toISOString(),
          problems: [{ title: 'Carnot drill', definition: carnot(`Imported ${unique()}`) }],
        }
        const form = new FormData()
        form.set('document', new File([JSON.stringify(doc)], 'bank.json', { type: 'application/json' }))
        return { multipart: form }
      },
    },
  },
  'routes/resources/bank-export.ts': {
    get: { expect: { ...bankUsers, otherInstructor: 404 }, query: (w) => `?ids=${w.ids.problemId}` },
  },
  'routes/bank/$problemId.tsx': {
    params: bankProblem,
    get: { expect: { ...bankUsers, otherInstructor: 404 } },
    post: {
      expect: { ...bankUsers, instructor: 'moved', otherInstructor: 404, admin: 'moved' },
      moved: () => /^\/bank\/\d+\?copied=1$/,
      body: () => ({ form: { intent: 'copy' } }),
    },
  },
  'routes/bank/edit.tsx': {
    params: bankProblem,
    // Only the owner edits; an admin sees the problem but may not change it.
    get: { expect: { ...bankUsers, otherInstructor: 404, admin: 403 } },
    post: {
      params: async (w) => ({ problemId: String(await w.freshProblem()) }),
      expect: { ...bankUsers, instructor: 'moved', otherInstructor: 403, admin: 403 },
      moved: () => /^\/bank\/\d+$/,
      body: () => ({ form: editorFields(`Edited ${unique()}`) }),
    },
  },

  // -- The JSON API
  'routes/resources/api-problems.ts': { get: { expect: bankUsersApi } },
  'routes/resources/api-problem.ts': {
    params: bankProblem,
    get: { expect: { ...bankUsersApi, otherInstructor: 404 } },
  },
  'routes/resources/api-preview.ts': {
    get: { expect: everyone(405) },
    post: { expect: bankUsersApi, body: () => ({ json: { definition: carnot(), seeds: [1, 2] } }) },
  },
  'routes/resources/api-sweep.ts': {
    params: (w) => ({ sweepId: String(w.ids.sweepId) }),
    get: { expect: { ...bankUsersApi, otherInstructor: 404 } },
  },
  'routes/resources/api-version-check.ts': {
    params: (w) => ({ versionId: String(w.item.problemVersionId) }),
    get: { expect: { ...bankUsersApi, otherInstructor: 404 } },
  },
  // Only ever the caller's own results: a classmate gets theirs, a student of B nothing.
  'routes/resources/api-my-results.ts': {
    params: (w) => ({ ...apiAssignment(w), position: '1' }),
    get: {
      expect: {
        signedOut: 401,
        student: 'ok',
        classmate: 'ok',
        otherStudent: 404,
        ta: 403,
        instructor: 403,
        otherInstructor: 403,
        admin: 403,
      },
    },
  },
  'routes/resources/api-assignment-gradebook.ts': { params: apiAssignment, get: { expect: courseStaffApi } },
  'routes/resources/api-assignment-statistics.ts': { params: apiAssignment, get: { expect: courseStaffApi } },
  'routes/resources/api-find-answers.ts': {
    params: (w) => ({ ...apiAssignment(w), position: '1' }),
    get: { expect: courseStaffApi },
  },
  'routes/resources/api-course-gradebook.ts': {
    params: (w) => ({ courseId: String(w.A.course.id) }),
    get: { expect: courseStaffApi },
  },
  'routes/resources/api-regrade.ts': {
    params: (w) => ({ regradeId: String(w.ids.regradeId) }),
    get: { expect: courseStaffApi },
  },

  // -- Department admin
  'routes/admin/index.tsx': { get: { expect: adminOnly } },
  'routes/admin/terms.tsx': {
    get: { expect: adminOnly },
    post: {
      expect: { ...adminOnly, admin: 'moved' },
      moved: () => /^\/admin\/terms\?created=\d+$/,
      body: () => ({ form: { name: `Term ${unique()}`, startsOn: '2031-01-06', endsOn: '2031-05-02' } }),
    },
  },
  'routes/admin/courses/new.tsx': {
    get: { expect: adminOnly },
    post: {
      expect: { ...adminOnly, admin: 'moved' },
      moved: () => /^\/admin\/courses\/\d+\?created=1$/,
      body: (w) => ({
        form: {
          termId: String(w.A.course.termId),
          code: `AZ ${unique()}`,
          title: 'Heat engines',
          signConvention: 'engineering',
          timeZone: 'UTC',
        },
      }),
    },
  },
  'routes/admin/courses/$courseId.tsx': {
    params: course,
    get: { expect: adminOnly },
    post: { expect: adminOnly, body: () => ({ form: { email: `teacher-${unique()}@test.example`.toLowerCase() } }) },
  },
  'routes/admin/outbox.tsx': { get: { expect: adminOnly } },
  'routes/admin/outbox-message.tsx': {
    params: (w) => ({ messageId: String(w.ids.messageId) }),
    get: { expect: adminOnly },
  },
  'routes/admin/exports.tsx': {
    get: { expect: adminOnly },
    post: {
      expect: { ...adminOnly, admin: 'moved' },
      moved: () => /^\/admin\/exports\?requested=\d+$/,
      body: (w) => ({ form: { termId: String(w.A.course.termId) } }),
    },
  },
  'routes/resources/grade-export-download.ts': {
    params: (w) => ({ exportId: String(w.ids.exportId) }),
    get: { expect: adminOnly },
  },

  // The author guide and bank format: for the people who may use the bank.
  'routes/help.tsx': { params: () => ({ page: 'authoring' }), get: { expect: bankUsers } },
  'routes/resources/healthz.ts': { get: { expect: everyone('ok') } },
  'routes/not-found.tsx': {
    params: () => ({ '*': 'no/such/page' }),
    get: { expect: everyone(404) },
    post: { expect: everyone(404), body: () => ({ form: {} }) },
  },
}

// ---- Running one case -----------------------------------------------------------------------

function who(w: World, role: Role) {
  if (role === 'signedOut') return null
  if (role === 'otherStudentOwnCourse') return w.people.otherStudent
  if (role === 'otherInstructorOwnCourse') return w.people.otherInstructor
  return w.people[role]
}

function toPath(pattern: string, params: Params): string {
  return pattern
    .split('/')
    .map((seg) =>
      seg === '*'
        ? (params['*'] ?? '')
        : seg.startsWith(':')
          ? encodeURIComponent(params[seg.slice(1)] ?? `missing-${seg.slice(1)}`)
          : seg,
    )
    .join('/')
}

async function buildRequest(
  url: string,
  method: 'GET' | 'POST',
  headers: Record<string, string>,
  body?: Body,
): Promise<Request> {
  const base = { 'x-cyclewright-client-address': '10.0.0.1', Origin: BASE, ...headers }
  if (method === 'GET' || !body)
    return new Request(url, { method, headers: base, ...(method === 'POST' ? { body: '' } : {}) })
  let payload: ArrayBuffer
  let type: string
  if ('json' in body) {
    payload = new TextEncoder().encode(JSON.stringify(body.json)).buffer as ArrayBuffer
    type = 'application/json'
  } else {
    // Bodies as a browser sends them: encoded, with their length stated.
    const encoded = new Response('form' in body ? new URLSearchParams(body.form) : body.multipart)
    payload = await encoded.arrayBuffer()
    type = encoded.headers.get('Content-Type')!
  }
  return new Request(url, {
    method,
    body: payload,
    headers: { ...base, 'Content-Type': type, 'Content-Length': String(payload.byteLength) },
  })
}

type Seen = { outcome: Outcome | string; detail: string }

/** What a loader or action answered, as an outcome of the table. */
function classify(result: unknown, moved: RegExp | undefined): Seen {
  let status = 200
  let location: string | null = null
  let detail = ''
  if (result instanceof Response) {
    status = result.status
    location = result.headers.get('Location')
  } else if (result && typeof result === 'object' && (result as { type?: string }).type === 'DataWithResponseInit') {
    const init = (result as { init?: ResponseInit | null; data?: unknown }).init
    status = init?.status ?? 200
    location = init?.headers ? new Headers(init.headers).get('Location') : null
    detail = JSON.stringify((result as { data?: unknown }).data)?.slice(0, 300) ?? ''
  } else if (result instanceof Error) {
    return { outcome: `error: ${result.message}`, detail: result.stack ?? '' }
  }
  if (status >= 200 && status < 300) return { outcome: 'ok', detail }
  if (status >= 300 && status < 400) {
    if (location && moved?.test(location)) return { outcome: 'moved', detail: location }
    if (location?.startsWith('/sign-in')) return { outcome: 'sign-in', detail: location }
    return { outcome: `${status} to ${location}`, detail: location ?? '' }
  }
  return { outcome: status as Outcome, detail }
}

async function run(
  w: World,
  entry: Entry,
  pattern: string,
  file: string,
  method: 'GET' | 'POST',
  role: Role,
): Promise<Seen> {
  const m = (method === 'GET' ? entry.get : entry.post)!
  const user = who(w, role)
  const headers = await loginAs(user)
  const courseId =
    role === 'otherStudentOwnCourse' || role === 'otherInstructorOwnCourse' ? w.B.course.id : w.A.course.id
  const ctx: Ctx = { role, courseId, headers }
  const params = await (m.params ?? entry.params ?? (() => ({})))(w, ctx)
  const url = `${BASE}${toPath(pattern, params)}${m.query?.(w) ?? ''}`
  const body = method === 'POST' ? await (m as PostMethod).body(w, ctx, params) : undefined
  const request = await buildRequest(url, method, headers, body)
  const mod = (await import(/* @vite-ignore */ new URL(`../../app/${file}`, import.meta.url).href)) as Record<
    string,
    (a: never) => Promise<unknown>
  >
  const fn = method === 'GET' ? mod.loader! : mod.action!
  let result: unknown
  try {
    result = await fn(args(request, params))
  } catch (thrown) {
    result = thrown
  }
  return classify(result, m.moved?.(w))
}

// ---- The checks --------------------------------------------------------------------------------

/** Routes whose URL names a record of the course besides the course itself. */
const namesCourseRecord = (pattern: string) =>
  pattern.startsWith('/courses/:courseId/') && /:(?!courseId)\w+/.test(pattern)

describe('the expectation table matches app/routes.ts', () => {
  test('the course layout guards nothing of its own: it has no loader or action (its pages do)', async () => {
    const layout = (await import('#app/routes/courses/layout.tsx')) as Record<string, unknown>
    expect(layout.loader).toBeUndefined()
    expect(layout.action).toBeUndefined()
  })

  test('every route file in app/routes.ts has an entry', () => {
    const missing = [...new Set(ROUTES.map((r) => r.file))].filter((f) => !(f in EXPECTED))
    expect(missing, `routes without an entry in EXPECTED (add who may GET/POST them): ${missing.join(', ')}`).toEqual(
      [],
    )
  })

  test('every entry names a route that still exists', () => {
    const files = new Set(ROUTES.map((r) => r.file))
    const stale = Object.keys(EXPECTED).filter((f) => !files.has(f))
    expect(stale, `entries in EXPECTED whose route is no longer in app/routes.ts: ${stale.join(', ')}`).toEqual([])
  })

  test('GET expectations exist exactly for modules with a loader, POST ones exactly for modules with an action', async () => {
    const wrong: string[] = []
    for (const { file } of ROUTES) {
      const entry = EXPECTED[file]
      if (!entry) continue
      const mod = (await import(/* @vite-ignore */ new URL(`../../app/${file}`, import.meta.url).href)) as Record<
        string,
        unknown
      >
      if (typeof mod.loader === 'function' && !entry.get) wrong.push(`${file}: has a loader but no GET expectations`)
      if (typeof mod.loader !== 'function' && entry.get) wrong.push(`${file}: GET expectations but no loader`)
      if (typeof mod.action === 'function' && !entry.post) wrong.push(`${file}: has an action but no POST expectations`)
      if (typeof mod.action !== 'function' && entry.post) wrong.push(`${file}: POST expectations but no action`)
    }
    expect(wrong).toEqual([])
  })

  test('routes that name a course record are also tried across courses, with the caller’s own course in the URL', () => {
    const wrong: string[] = []
    for (const { pattern, file } of ROUTES) {
      if (!namesCourseRecord(pattern)) continue
      for (const [method, m] of [
        ['GET', EXPECTED[file]?.get],
        ['POST', EXPECTED[file]?.post],
      ] as const) {
        if (m && CROSS_ROLES.some((r) => m.expect[r] === undefined))
          wrong.push(`${method} ${pattern} (${file}) lacks cross-course cases`)
      }
    }
    expect(wrong).toEqual([])
  })
})

describe('who may do what, route by route', () => {
  for (const { pattern, file } of ROUTES) {
    const entry = EXPECTED[file]
    if (!entry) continue
    for (const method of ['GET', 'POST'] as const) {
      const m = method === 'GET' ? entry.get : entry.post
      if (!m) continue
      const roles = [...CORE_ROLES, ...CROSS_ROLES].filter((r) => m.expect[r] !== undefined)
      test(`${method} ${pattern}`, async () => {
        const wrong: string[] = []
        for (const role of roles) {
          const seen = await run(world, entry, pattern, file, method, role)
          if (seen.outcome !== m.expect[role])
            wrong.push(`${role}: expected ${m.expect[role]}, got ${seen.outcome} ${seen.detail}`.trim())
        }
        expect(wrong, `${method} ${pattern} (${file})`).toEqual([])
      })
    }
  }
})

describe('records of others named in the query string', () => {
  const headersOf = (user: { id: number }) => loginAs(user)

  test('an instructor of course B naming A’s regrade as ?regrade= on their own regrade page is shown no progress', async () => {
    const mod = await import('#app/routes/courses/assignments/regrade.tsx')
    const params = { courseId: String(world.B.course.id), assignmentId: String(world.B.assignment.id), position: '1' }
    const url = `${BASE}/courses/${world.B.course.id}/assignments/${world.B.assignment.id}/problems/1/regrade?regrade=${world.ids.regradeId}`
    const page = await mod.loader(
      args(new Request(url, { headers: await headersOf(world.people.otherInstructor) }), params),
    )
    expect(page.progress).toBeNull()
    expect(page.regrades.map((r: { id: number }) => r.id)).not.toContain(world.ids.regradeId)
  })

  test('an instructor of course B filtering their review queue by A’s assignment lists none of A’s disputes', async () => {
    const mod = await import('#app/routes/courses/disputes/index.tsx')
    const url = `${BASE}/courses/${world.B.course.id}/disputes?assignment=${world.A.assignment.id}&status=all`
    const page = await mod.loader(
      args(new Request(url, { headers: await headersOf(world.people.otherInstructor) }), {
        courseId: String(world.B.course.id),
      }),
    )
    expect(page.rows).toEqual([])
  })
})

describe('refusals leave nothing behind', () => {
  test('a TA, a student and an instructor of another course who try a regrade record no regrade', async () => {
    const fresh = await world.freshAssignment()
    const mod = await import('#app/routes/courses/assignments/regrade.tsx')
    const path = `/courses/${world.A.course.id}/assignments/${fresh.assignment.id}/problems/1/regrade`
    const params = { courseId: String(world.A.course.id), assignmentId: String(fresh.assignment.id), position: '1' }
    for (const user of [world.people.ta, world.people.student, world.people.otherInstructor]) {
      const request = await buildRequest(`${BASE}${path}`, 'POST', await loginAs(user), {
        form: {
          intent: 'apply',
          version: String(world.item.problemVersionId),
          'kind.T2': 'relative',
          'value.T2': '5 %',
          'unit.T2': '',
        },
      })
      const seen = classify(await mod.action(args(request, params)).catch((e: unknown) => e), undefined)
      expect(seen.outcome).toBe(403)
    }
    const [row] = await db().select({ n: count() }).from(regrades).where(eq(regrades.itemId, fresh.item.id))
    expect(row!.n).toBe(0)
  })

  test('nobody but the owner reads a dispute’s file: the bytes never reach a classmate or another course', async () => {
    const mod = await import('#app/routes/resources/dispute-attachment.ts')
    const params = { courseId: String(world.A.course.id), disputeId: String(world.ids.disputeId) }
    const path = `${BASE}/courses/${world.A.course.id}/disputes/${world.ids.disputeId}/attachment`
    const mine = (await mod.loader(
      args(new Request(path, { headers: await loginAs(world.people.student) }), params),
    )) as Response
    expect(new Uint8Array(await mine.arrayBuffer())).toEqual(new Uint8Array([0x89, 0x50, 0x4e, 0x47]))
    for (const user of [world.people.classmate, world.people.otherStudent, world.people.admin]) {
      const out = await mod
        .loader(args(new Request(path, { headers: await loginAs(user) }), params))
        .catch((e: unknown) => e)
      expect(out).not.toBeInstanceOf(Response)
    }
  })
})
