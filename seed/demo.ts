/**
 * The demo: an invented department of our own. No real institution, person or course.
 * Idempotent: running it again finds what is there and adds only what is missing.
 */
import { and, desc, eq } from 'drizzle-orm'
import { cycleOf } from '#app/domain/authoring/definition.ts'
import type { Db } from '#app/server/db/client.server.ts'
import {
  courseSections,
  courses,
  departments,
  problemVersions,
  problems,
  sectionStaff,
  terms,
  users,
} from '#app/server/db/schema.server.ts'
import { hashPassword } from '#app/server/passwords.server.ts'
import { addMember } from '#tests/support/factories.ts'
import { seedDemoAssignments } from './assignments.ts'
import { seedDemoDisputes } from './disputes.ts'
import type { DemoOwner } from './problems.ts'
import { DEMO_PROBLEMS } from './problems.ts'

export const DEMO_DOMAIN = 'kestrel-hollow.example'
export const DEMO_PASSWORD = 'cycle-demo-2026'

type Person = {
  email: string
  name: string
  isAdmin?: boolean
  studentNumber?: string
  familyName?: string
  givenName?: string
}

export const demoPeople = {
  admin: { email: `ines.carvalho@${DEMO_DOMAIN}`, name: 'Ines Carvalho-Lund', isAdmin: true },
  instructors: [
    { email: `tobias.wrenfield@${DEMO_DOMAIN}`, name: 'Tobias Wrenfield' },
    { email: `amara.okafor@${DEMO_DOMAIN}`, name: 'Amara Okafor-Reyes' },
  ],
  tas: [
    { email: `priya.halloran@${DEMO_DOMAIN}`, name: 'Priya Halloran' },
    { email: `jonas.strand@${DEMO_DOMAIN}`, name: 'Jonas Mbeki-Strand' },
  ],
} satisfies Record<string, Person | Person[]>

const FIRST = [
  'Aino',
  'Bastien',
  'Chiara',
  'Dawit',
  'Elif',
  'Femi',
  'Greta',
  'Hiro',
  'Isla',
  'Joaquín',
  'Kofi',
  'Lena',
  'Mateo',
  'Nadia',
  'Oskar',
  'Parisa',
  'Quentin',
  'Rania',
  'Soren',
  'Tamsin',
]
const LAST = [
  'Abernethy',
  'Bellweather',
  'Castellano',
  'Drummond',
  'Eskildsen',
  'Farrow',
  'Gathii',
  'Holmqvist',
  'Ibarra',
  'Jovanović',
]

/** 40 students with invented names, the same every time. */
export function demoStudents(): Person[] {
  const out: Person[] = []
  for (let i = 0; i < 40; i++) {
    const first = FIRST[i % FIRST.length]!
    const last = LAST[(i * 7 + Math.floor(i / FIRST.length)) % LAST.length]!
    const local = `${first}.${last}`
      .normalize('NFD')
      .replace(/[\u0300-\u036f]/g, '')
      .toLowerCase()
    // Invented student IDs in the demo department's own shape (KH + year + four digits).
    const studentNumber = `KH26${String(i + 1).padStart(4, '0')}`
    out.push({
      email: `${local}${i + 1}@students.${DEMO_DOMAIN}`,
      name: `${first} ${last}`,
      studentNumber,
      familyName: last,
      givenName: first,
    })
  }
  return out
}

async function upsertPerson(db: Db, p: Person, passwordHash: string, departmentId: number) {
  const [found] = await db.select({ id: users.id }).from(users).where(eq(users.email, p.email))
  if (found) return found.id
  const roster = p.studentNumber
    ? { studentNumber: p.studentNumber, familyName: p.familyName ?? null, givenName: p.givenName ?? null }
    : {}
  const [row] = await db
    .insert(users)
    .values({ email: p.email, name: p.name, passwordHash, isAdmin: p.isAdmin ?? false, departmentId, ...roster })
    .returning({ id: users.id })
  return row!.id
}

/** `now` places the demo assignments (a past week, the current one, a coming one); default: the clock. */
export async function seedDemo(db: Db, options: { now?: Date } = {}) {
  const slug = 'kestrel-hollow-energy'
  let [dept] = await db.select().from(departments).where(eq(departments.slug, slug))
  if (!dept) {
    ;[dept] = await db
      .insert(departments)
      .values({
        slug,
        name: 'School of Energy and Process Engineering, Kestrel Hollow Institute',
        timeZone: 'Europe/Oslo',
      })
      .returning()
  }
  const termName = 'Autumn 2026'
  let [term] = await db
    .select()
    .from(terms)
    .where(and(eq(terms.departmentId, dept!.id), eq(terms.name, termName)))
  if (!term) {
    ;[term] = await db
      .insert(terms)
      .values({ departmentId: dept!.id, name: termName, startsOn: '2026-09-07', endsOn: '2026-12-18' })
      .returning()
  }
  const courseSpecs = [
    {
      code: 'ENTH 210',
      title: 'Engineering Thermodynamics I',
      timeZone: 'Europe/Oslo',
      signConvention: 'engineering' as const,
    },
    {
      code: 'CHEM 342',
      title: 'Chemical Thermodynamics',
      timeZone: 'Europe/Oslo',
      signConvention: 'chemistry' as const,
    },
  ]
  const courseIds: number[] = []
  for (const spec of courseSpecs) {
    let [c] = await db
      .select({ id: courses.id })
      .from(courses)
      .where(and(eq(courses.termId, term!.id), eq(courses.code, spec.code)))
    if (!c)
      [c] = await db
        .insert(courses)
        .values({ ...spec, departmentId: dept!.id, termId: term!.id })
        .returning({ id: courses.id })
    courseIds.push(c!.id)
  }
  const [engineering, chemistry] = courseIds as [number, number]
  const passwordHash = await hashPassword(DEMO_PASSWORD)

  await upsertPerson(db, demoPeople.admin, passwordHash, dept!.id)
  const [wrenfield, okafor] = demoPeople.instructors
  const [halloran, strand] = demoPeople.tas
  const wrenfieldId = await upsertPerson(db, wrenfield!, passwordHash, dept!.id)
  const okaforId = await upsertPerson(db, okafor!, passwordHash, dept!.id)
  await addMember(db, wrenfieldId, engineering, 'instructor')
  await addMember(db, okaforId, chemistry, 'instructor')
  // One person, two roles: Halloran assists in ENTH 210 and CHEM 342.
  const halloranId = await upsertPerson(db, halloran!, passwordHash, dept!.id)
  await addMember(db, halloranId, engineering, 'ta')
  await addMember(db, halloranId, chemistry, 'ta')
  await addMember(db, await upsertPerson(db, strand!, passwordHash, dept!.id), engineering, 'ta')

  const students = demoStudents()
  for (const [i, s] of students.entries()) {
    const id = await upsertPerson(db, s, passwordHash, dept!.id)
    // 28 engineers in two sections, 12 chemists; 4 of the engineers also take the chemistry course.
    if (i < 28) await addMember(db, id, engineering, 'student', i % 2 === 0 ? 'A' : 'B')
    if (i >= 24) await addMember(db, id, chemistry, 'student', 'C')
  }
  // The sections those names stand for, and the TA who looks after each.
  const strandTaId = await upsertPerson(db, strand!, passwordHash, dept!.id)
  for (const [courseId, name, taId] of [
    [engineering, 'A', halloranId],
    [engineering, 'B', strandTaId],
    [chemistry, 'C', halloranId],
  ] as const) {
    const [section] = await db
      .insert(courseSections)
      .values({ courseId, name })
      .onConflictDoNothing()
      .returning({ id: courseSections.id })
    if (section) await db.insert(sectionStaff).values({ sectionId: section.id, userId: taId }).onConflictDoNothing()
  }
  const owners = { tobias: wrenfieldId, amara: okaforId }
  const problemCount = await seedDemoProblems(db, owners)
  const seeded = await seedDemoAssignments(db, {
    now: options.now ?? new Date(),
    courseIds: { engineering, chemistry },
    owners,
  })
  const strandId = await upsertPerson(db, strand!, passwordHash, dept!.id)
  const disputeCount = await seedDemoDisputes(db, { courseIds: { engineering, chemistry }, reviewerId: strandId })
  return {
    departmentId: dept!.id,
    courseIds,
    students: students.length,
    problems: problemCount,
    assignments: seeded.assignmentIds.length,
    disputes: disputeCount,
  }
}

// Fixed dates in the demo term, so a re-seeded database looks the same.
const VERSION_DATES = ['2026-09-14T09:00:00Z', '2026-10-19T09:00:00Z', '2026-11-16T09:00:00Z']
const versionDate = (i: number) => new Date(VERSION_DATES[Math.min(i, VERSION_DATES.length - 1)]!)
/** Earlier versions were frozen when an assignment first used them (week 6 of the term). */
const FROZEN_AT = new Date('2026-10-12T08:00:00Z')

/**
 * The demo bank (seed/problems.ts), inserted directly: problems are found again by owner and
 * title, and one already there is left as it is (its versions too), so re-seeding never
 * duplicates and never overwrites an edit made in the demo. Returns how many demo problems exist.
 */
export async function seedDemoProblems(db: Db, owners: Record<DemoOwner, number>): Promise<number> {
  const idByTitle = new Map<string, number>()
  for (const demo of DEMO_PROBLEMS) {
    const ownerId = owners[demo.owner]
    const [owner] = await db.select({ departmentId: users.departmentId }).from(users).where(eq(users.id, ownerId))
    const def = demo.definition
    const [found] = await db
      .select({ id: problems.id })
      .from(problems)
      .where(and(eq(problems.ownerId, ownerId), eq(problems.title, def.title)))
    if (found) {
      idByTitle.set(def.title, found.id)
      continue
    }
    const origin = demo.copiedFrom === undefined ? undefined : idByTitle.get(demo.copiedFrom)
    const id = await db.transaction(async (tx) => {
      let originVersionId: number | null = null
      if (origin !== undefined) {
        const [v] = await tx
          .select({ id: problemVersions.id })
          .from(problemVersions)
          .where(eq(problemVersions.problemId, origin))
          .orderBy(desc(problemVersions.number))
          .limit(1)
        originVersionId = v?.id ?? null
      }
      const all = [...(demo.earlierVersions ?? []), def]
      const createdAt = versionDate(0)
      const [row] = await tx
        .insert(problems)
        .values({
          ownerId,
          departmentId: owner?.departmentId ?? null,
          visibility: demo.visibility,
          originProblemId: origin ?? null,
          originVersionId,
          title: def.title,
          cycle: cycleOf(def.physics),
          topics: [...def.tags.topics],
          difficulty: def.tags.difficulty,
          level: def.tags.level,
          createdAt,
          updatedAt: versionDate(all.length - 1),
        })
        .returning({ id: problems.id })
      await tx.insert(problemVersions).values(
        all.map((d, i) => ({
          problemId: row!.id,
          number: i + 1,
          definition: d,
          createdBy: ownerId,
          createdAt: versionDate(i),
          frozenAt: i < all.length - 1 ? FROZEN_AT : null,
        })),
      )
      return row!.id
    })
    idByTitle.set(def.title, id)
  }
  return idByTitle.size
}

/** What `npm start` prints at the end of its output. */
export function demoAccountsText(url: string): string {
  const students = demoStudents()
  const rows = [
    ['Department admin', demoPeople.admin.email],
    ['Instructor (ENTH 210, engineering convention)', demoPeople.instructors[0]!.email],
    ['Instructor (CHEM 342, chemistry convention)', demoPeople.instructors[1]!.email],
    ['Teaching assistant (both courses)', demoPeople.tas[0]!.email],
    ['Teaching assistant (ENTH 210)', demoPeople.tas[1]!.email],
    ['Student (ENTH 210)', students[0]!.email],
    ['Student (CHEM 342)', students[39]!.email],
  ]
  const width = Math.max(...rows.map((r) => r[0]!.length))
  return [
    '',
    `Cyclewright is running at ${url}`,
    '',
    `Demo accounts (every one has the password  ${DEMO_PASSWORD} ):`,
    ...rows.map(([role, email]) => `  ${role!.padEnd(width)}  ${email}`),
    `  …and ${students.length} students in all (see seed/demo.ts).`,
    '',
    'Mail sent by the demo (invitations, password resets) is caught locally: sign in as the admin and open Outbox.',
    'Press Ctrl+C to stop the web server; `npm run db:stop` stops PostgreSQL.',
  ].join('\n')
}
