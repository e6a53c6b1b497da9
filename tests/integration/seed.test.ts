import { sql } from 'drizzle-orm'
import { expect, test } from 'vitest'
import { db } from '#app/server/db/client.server.ts'
import { seedDemo } from '#seed/demo.ts'

test('the demo seed is idempotent: a second run adds nothing', async () => {
  const first = await seedDemo(db())
  const count = async () => {
    const r = await db().execute(sql`select (select count(*) from users)::int as u, (select count(*) from memberships)::int as m, (select count(*) from courses)::int as c`)
    return r.rows[0]
  }
  const before = await count()
  await seedDemo(db())
  expect(await count()).toEqual(before)
  expect(first.students).toBe(40)
  expect(before).toMatchObject({ u: 45, c: 2 })
})
