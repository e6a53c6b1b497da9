/**
 * The demo: an invented department of our own. No real institution, person or course.
 * Idempotent: running it again finds what is there and adds only what is missing.
 */
import { and, eq } from 'drizzle-orm'
import type { Db } from '#app/server/db/client.server.ts'
import { courses, departments, terms, users } from '#app/server/db/schema.server.ts'
import { hashPassword } from '#app/server/passwords.server.ts'
import { addMember } from '#tests/support/factories.ts'

export const DEMO_DOMAIN = 'kestrel-hollow.example'
export const DEMO_PASSWORD = 'cycle-demo-2026'

type Person = { email: string; name: string; isAdmin?: boolean }

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

const FIRST = ['Aino', 'Bastien', 'Chiara', 'Dawit', 'Elif', 'Femi', 'Greta', 'Hiro', 'Isla', 'Joaquín', 'Kofi', 'Lena', 'Mateo', 'Nadia', 'Oskar', 'Parisa', 'Quentin', 'Rania', 'Soren', 'Tamsin']
const LAST = ['Abernethy', 'Bellweather', 'Castellano', 'Drummond', 'Eskildsen', 'Farrow', 'Gathii', 'Holmqvist', 'Ibarra', 'Jovanović']

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
    out.push({ email: `${local}${i + 1}@students.${DEMO_DOMAIN}`, name: `${first} ${last}` })
  }
  return out
}

async function upsertPerson(db: Db, p: Person, passwordHash: string, departmentId: number) {
  const [found] = await db.select({ id: users.id }).from(users).where(eq(users.email, p.email))
  if (found) return found.id
  const [row] = await db
    .insert(users)
    .values({ email: p.email, name: p.name, passwordHash, isAdmin: p.isAdmin ?? false, departmentId })
    .returning({ id: users.id })
  return row!.id
}

export async function seedDemo(db: Db) {
  const slug = 'kestrel-hollow-energy'
  let [dept] = await db.select().from(departments).where(eq(departments.slug, slug))
  if (!dept) {
    ;[dept] = await db.insert(departments).values({ slug, name: 'School of Energy and Process Engineering, Kestrel Hollow Institute' }).returning()
  }
  const termName = 'Autumn 2026'
  let [term] = await db.select().from(terms).where(and(eq(terms.departmentId, dept!.id), eq(terms.name, termName)))
  if (!term) {
    ;[term] = await db.insert(terms).values({ departmentId: dept!.id, name: termName, startsOn: '2026-09-07', endsOn: '2026-12-18' }).returning()
  }
  const courseSpecs = [
    { code: 'ENTH 210', title: 'Engineering Thermodynamics I', timeZone: 'Europe/Oslo', signConvention: 'engineering' as const },
    { code: 'CHEM 342', title: 'Chemical Thermodynamics', timeZone: 'Europe/Oslo', signConvention: 'chemistry' as const },
  ]
  const courseIds: number[] = []
  for (const spec of courseSpecs) {
    let [c] = await db.select({ id: courses.id }).from(courses).where(and(eq(courses.termId, term!.id), eq(courses.code, spec.code)))
    if (!c) [c] = await db.insert(courses).values({ ...spec, departmentId: dept!.id, termId: term!.id }).returning({ id: courses.id })
    courseIds.push(c!.id)
  }
  const [engineering, chemistry] = courseIds as [number, number]
  const passwordHash = await hashPassword(DEMO_PASSWORD)

  await upsertPerson(db, demoPeople.admin, passwordHash, dept!.id)
  const [wrenfield, okafor] = demoPeople.instructors
  const [halloran, strand] = demoPeople.tas
  await addMember(db, await upsertPerson(db, wrenfield!, passwordHash, dept!.id), engineering, 'instructor')
  await addMember(db, await upsertPerson(db, okafor!, passwordHash, dept!.id), chemistry, 'instructor')
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
  return { departmentId: dept!.id, courseIds, students: students.length }
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
