import { sql } from 'drizzle-orm'
import { expect, test } from 'vitest'
import { db } from '#app/server/db/client.server.ts'
import { seedDemo } from '#seed/demo.ts'

test('the demo seed is idempotent: a second run adds nothing', async () => {
  const first = await seedDemo(db())
  const count = async () => {
    const r = await db().execute(
      sql`select (select count(*) from users)::int as u, (select count(*) from memberships)::int as m, (select count(*) from courses)::int as c, (select count(*) from course_sections)::int as s, (select count(*) from section_staff)::int as st`,
    )
    return r.rows[0]
  }
  const before = await count()
  await seedDemo(db())
  expect(await count()).toEqual(before)
  expect(first.students).toBe(40)
  expect(before).toMatchObject({ u: 45, c: 2, s: 3, st: 3 })
  // Every demo student has the roster fields a grade system needs; every section a student carries exists.
  const gaps = await db().execute(
    sql`select count(*)::int as n from users u join memberships m on m.user_id = u.id and m.role = 'student' where u.student_number is null or u.family_name is null or u.given_name is null`,
  )
  expect(gaps.rows[0]).toEqual({ n: 0 })
  const orphans = await db().execute(
    sql`select count(*)::int as n from memberships m where m.section is not null and not exists (select 1 from course_sections s where s.course_id = m.course_id and s.name = m.section)`,
  )
  expect(orphans.rows[0]).toEqual({ n: 0 })
})
