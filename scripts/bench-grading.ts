/**
 * npm run bench:grading — the grading pipeline under load, on a throw-away database in the
 * private cluster (or on the server DATABASE_URL names), dropped at the end even on failure.
 *
 * A course of 200 students with one assignment (the demo's Otto and Brayton problems, 100
 * attempts per find) and the job worker started in this process. Then:
 * - steady (the targets): N submissions arrive at --rate per second and are queued for
 *   grading. The bench stores them the way submitAnswers does (the submission with the answers
 *   as typed, one part per counted answer with its attempt number and share of the points,
 *   and its 'grade-submission' job, in one transaction) but in small batches every 50 ms, as
 *   many web processes would; one process of this bench could not press Submit 500 times a
 *   second through the form's path on a 2-core machine that also runs PostgreSQL and the
 *   worker (the last phase measures that path on its own). Answers are mixed: right,
 *   catalogued slips (sign, ×1000), near misses. Latency per submission is submitted_at →
 *   graded_at (both from the database's clock); graded per second runs from the first
 *   submitted_at to the last graded_at.
 * - burst (unless --no-burst): N more queued at once: how fast a full queue drains.
 * - submit path (unless --no-submit): --submit-n presses through submitAnswers itself, at 16
 *   at a time, with the worker running: presses stored per second in one process, and their
 *   submit → graded latency. Reported; no target.
 * Targets: ≥ 500 graded per second, p99 ≤ 2 s, for the steady phase. A miss prints FAIL and
 * still exits 0 (this is a measurement); only an error exits 1.
 *
 * Options: --n 5000  --rate 600  --workers 1  --students 200  --max-seconds 30
 *          --submit-n 1000  --no-burst  --no-submit
 */
import os from 'node:os'
import { performance } from 'node:perf_hooks'
import { parseArgs } from 'node:util'
import { sql } from 'drizzle-orm'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { drawVariant, resolveConvention } from '#app/domain/authoring/variant.ts'
import { findShares } from '#app/domain/assignments/scoring.ts'
import { migrateDatabase } from '#app/server/db/migrate.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { createDatabase, dropDatabase, serverUrl, uniqueName } from '#tests/support/test-db.ts'
import { ensureSessionSecret } from './local-env.ts'

const TARGET_PER_SECOND = 500
const TARGET_P99_MS = 2000

const { values: args } = parseArgs({
  options: {
    n: { type: 'string', default: '5000' },
    rate: { type: 'string', default: '600' },
    workers: { type: 'string', default: '1' },
    students: { type: 'string', default: '200' },
    'max-seconds': { type: 'string', default: '30' },
    'no-burst': { type: 'boolean', default: false },
    'no-submit': { type: 'boolean', default: false },
    'submit-n': { type: 'string', default: '1000' },
  },
})
const positive = (name: string, text: string) => {
  const v = Number(text)
  if (!Number.isInteger(v) || v < 1) {
    console.error(`--${name} must be a whole number of at least 1 (got "${text}").`)
    process.exit(1)
  }
  return v
}
const N = positive('n', args.n)
const RATE = positive('rate', args.rate)
const WORKERS = positive('workers', args.workers)
const STUDENTS = positive('students', args.students)
const BUDGET_MS = positive('max-seconds', args['max-seconds']) * 1000
const SUBMIT_N = positive('submit-n', args['submit-n'])

const problem = (title: string): ProblemDefinition => {
  const p = DEMO_PROBLEMS.find((d) => d.definition.title === title)
  if (!p) throw new Error(`The demo bank has no problem "${title}"`)
  return p.definition
}
const definitions = [
  problem('Air-standard Otto cycle'),
  problem('Gas-turbine (Brayton) cycle with component efficiencies'),
]

/** A small deterministic generator (the bench's answers are the same every run). */
function lcg(seed: number) {
  let s = seed >>> 0
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0
    return s / 2 ** 32
  }
}

const fmt = (v: number, unit: string) => {
  const t = String(Number(v.toPrecision(4)))
  return unit === '' ? t : `${t} ${unit}`
}

function percentile(sorted: number[], p: number) {
  if (sorted.length === 0) return NaN
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))

async function main() {
  const server = await serverUrl()
  const name = uniqueName('cw_bench')
  const url = await createDatabase(server, name)
  // Set before any app module reads the environment: the app's pool and queue follow it.
  process.env.DATABASE_URL = url
  ensureSessionSecret()
  const cleanups: (() => Promise<unknown>)[] = []
  let interrupted = false
  const onSignal = () => {
    interrupted = true
  }
  process.on('SIGINT', onSignal)
  try {
    await migrateDatabase(url)
    const { db, closeDb } = await import('#app/server/db/client.server.ts')
    const { getBoss, stopBoss } = await import('#app/server/queue.server.ts')
    const { studentSeed } = await import('#app/server/grading.server.ts')
    const { submitAnswers } = await import('#app/server/submissions.server.ts')
    const { withJobTransaction } = await import('#app/server/queue.server.ts')
    const { startWorker } = await import('#jobs/worker.ts')
    const { createCourseWithAssignment } = await import('#tests/support/factories.ts')
    cleanups.push(closeDb, stopBoss)
    await getBoss()

    const setUpStart = performance.now()
    const now = Date.now()
    const made = await createCourseWithAssignment(db(), definitions, {
      students: STUDENTS,
      assignment: {
        title: 'Grading bench',
        attemptsPerFind: 100,
        opensAt: new Date(now - 3600_000),
        dueAt: new Date(now + 7 * 24 * 3600_000),
      },
    })
    // The answers' keys are drawn here without studentVariant, so the worker's variant
    // cache starts cold, as in a worker that has not seen these students yet.
    type Pair = {
      userId: number
      itemId: number
      position: number
      finds: { name: string; value: number; unit: string; pitfalls: readonly string[]; share: number }[]
      hard: number
      sentCorrect: Set<string>
      attempts: Map<string, number>
    }
    const pairs: Pair[] = []
    for (const s of made.students) {
      for (const item of made.items) {
        const def = definitions[item.position - 1]!
        const drawn = drawVariant(def, studentSeed(made.assignment.id, item.problemId, s.id), {
          convention: resolveConvention(def, made.course.signConvention),
        })
        if (!drawn.ok) throw new Error(`A bench variant could not be drawn: ${drawn.error.message}`)
        const shares = findShares(
          item.points,
          def.finds.map((f) => f.points),
        )
        const finds = def.finds.map((f, i) => {
          const k = drawn.variant.key.find((e) => e.name === f.name)!
          return { name: f.name, value: k.value, unit: k.unit, pitfalls: f.pitfalls, share: shares[i]! }
        })
        pairs.push({
          userId: s.id,
          itemId: item.id,
          position: item.position,
          finds,
          hard: (s.id * 7 + item.position) % finds.length,
          sentCorrect: new Set(),
          attempts: new Map(),
        })
      }
    }
    console.log(
      `Set up ${STUDENTS} students × ${made.items.length} problems in ${((performance.now() - setUpStart) / 1000).toFixed(1)} s.`,
    )

    const rand = lcg(20261202)
    /**
     * The next submission of a (student, problem): every find gets an answer; one find per pair
     * (its "hard" one) is never right, so every press counts at least one attempt.
     */
    const answersFor = (pair: Pair): Record<string, string> => {
      const out: Record<string, string> = {}
      pair.finds.forEach((f, i) => {
        const r = rand()
        if (i !== pair.hard && (pair.sentCorrect.has(f.name) || r < 0.35)) {
          pair.sentCorrect.add(f.name)
          out[f.name] = fmt(f.value, f.unit)
        } else if (r < 0.55 && f.pitfalls.includes('sign-convention-flipped')) out[f.name] = fmt(-f.value, f.unit)
        else if (r < 0.7 && f.pitfalls.includes('kilo-factor')) out[f.name] = fmt(f.value * 1000, f.unit)
        else if (r > 0.98 && i !== pair.hard) out[f.name] = 'about 12'
        else out[f.name] = fmt(f.value * (1 + (0.05 + 0.3 * rand()) * (rand() < 0.5 ? -1 : 1)), f.unit)
      })
      return out
    }
    // Round-robin over shuffled pairs, so one student's presses are spread over the run.
    const order = pairs.map((_, i) => i).sort(() => rand() - 0.5)
    let cursor = 0
    const nextPair = () => pairs[order[cursor++ % order.length]!]!

    const refused: string[] = []
    const submitOne = async (): Promise<number | null> => {
      const pair = nextPair()
      const r = await submitAnswers(db(), {
        courseId: made.course.id,
        assignmentId: made.assignment.id,
        position: pair.position,
        userId: pair.userId,
        answers: answersFor(pair),
      })
      if (r.ok) return r.receipt.submissionId
      refused.push(r.formError)
      return null
    }

    /**
     * Stores `count` presses as submitAnswers would (see the header) in one transaction: the
     * submissions, their counted parts (a find already answered right, or unreadable, is not
     * counted, as on the form) and their grading jobs. Returns the submission ids.
     */
    const storeBatch = async (count: number): Promise<number[]> => {
      const presses = Array.from({ length: count }, () => {
        const pair = nextPair()
        const alreadyRight = new Set(pair.sentCorrect)
        const answers = answersFor(pair)
        const parts = pair.finds
          .filter((f) => answers[f.name] !== undefined && !alreadyRight.has(f.name) && answers[f.name] !== 'about 12')
          .map((f) => {
            const attempt = (pair.attempts.get(f.name) ?? 0) + 1
            pair.attempts.set(f.name, attempt)
            return { findName: f.name, answer: answers[f.name]!, attempt, maxScore: f.share }
          })
        return { pair, answers, parts }
      }).filter((p) => p.parts.length > 0)
      if (presses.length === 0) return []
      return withJobTransaction(db(), async (tx, jobs) => {
        const subValues = sql.join(
          presses.map(
            (p) =>
              sql`(${made.assignment.id}::int, ${p.pair.itemId}::int, ${p.pair.userId}::int, ${JSON.stringify(p.answers)}::jsonb, clock_timestamp())`,
          ),
          sql`, `,
        )
        const inserted = await tx.execute<{ id: number }>(
          sql`insert into submissions (assignment_id, item_id, user_id, answers, submitted_at) values ${subValues} returning id`,
        )
        const ids = inserted.rows.map((r) => r.id)
        const partValues = sql.join(
          presses.flatMap((p, i) =>
            p.parts.map(
              (part) =>
                sql`(${ids[i]}::int, ${made.assignment.id}::int, ${p.pair.itemId}::int, ${p.pair.userId}::int, ${part.findName}::text, ${part.answer}::text, ${part.attempt}::int, ${part.maxScore}::float8)`,
            ),
          ),
          sql`, `,
        )
        await tx.execute(
          sql`insert into part_results (submission_id, assignment_id, item_id, user_id, find_name, answer, attempt, max_score) values ${partValues}`,
        )
        const boss = await getBoss()
        await boss.insert(
          ids.map((id) => ({ name: 'grade-submission', data: { v: 1, submissionId: id } })),
          { db: jobs } as never,
        )
        return ids
      })
    }

    /** Queues `count` submissions arriving at `rate` per second (Infinity: all at once), in batches every 50 ms. */
    const arrive = async (count: number, rate: number) => {
      const ids: number[] = []
      const t0 = performance.now()
      let stored = 0
      let behind = 0
      while (stored < count && !interrupted && performance.now() - t0 < BUDGET_MS) {
        const due = Number.isFinite(rate)
          ? Math.min(count, Math.floor(((performance.now() - t0) / 1000) * rate))
          : count
        const take = Math.min(due - stored, 500)
        if (take <= 0) {
          await sleep(50 - ((performance.now() - t0) % 50))
          continue
        }
        if (Number.isFinite(rate) && take > rate * 0.25) behind++
        stored += take
        ids.push(...(await storeBatch(take)))
      }
      if (interrupted) throw new Error('Interrupted')
      return { ids, started: stored, seconds: (performance.now() - t0) / 1000, lateStarts: behind }
    }

    /** Offers `count` submissions at `rate` per second (Infinity: as fast as they go), at most `inFlight` at once. */
    const offer = async (count: number, rate: number, inFlight: number) => {
      const ids: number[] = []
      const t0 = performance.now()
      let started = 0
      let running = 0
      let lateStarts = 0
      let firstError: unknown = null
      await new Promise<void>((resolve) => {
        const pump = async () => {
          while (started < count && firstError === null && !interrupted && performance.now() - t0 < BUDGET_MS) {
            const due = Number.isFinite(rate) ? t0 + (started * 1000) / rate : 0
            const wait = due - performance.now()
            if (wait > 1) {
              await sleep(wait)
              continue
            }
            if (running >= inFlight) {
              await sleep(1)
              continue
            }
            if (wait < -250) lateStarts++
            started++
            running++
            submitOne()
              .then((id) => id !== null && ids.push(id))
              .catch((e) => (firstError ??= e))
              .finally(() => running--)
          }
          while (running > 0) await sleep(2)
          resolve()
        }
        void pump()
      })
      if (firstError) throw firstError
      if (interrupted) throw new Error('Interrupted')
      return { ids, started, seconds: (performance.now() - t0) / 1000, lateStarts }
    }

    const waitGraded = async (ids: number[], limitMs: number) => {
      const lo = Math.min(...ids)
      const hi = Math.max(...ids)
      const end = performance.now() + limitMs
      for (;;) {
        const r = await db().execute<{ queued: number }>(
          sql`select count(*)::int as queued from submissions where id between ${lo} and ${hi} and status = 'queued'`,
        )
        if (r.rows[0]!.queued === 0) return
        if (interrupted) throw new Error('Interrupted')
        if (performance.now() > end)
          throw new Error(
            `${r.rows[0]!.queued} submissions were still waiting for the grader after ${limitMs / 1000} s`,
          )
        await sleep(100)
      }
    }

    const readTimes = async (ids: number[]) => {
      const lo = Math.min(...ids)
      const hi = Math.max(...ids)
      const r = await db().execute<{ submitted: number; graded: number; status: string }>(
        sql`select extract(epoch from submitted_at) * 1000 as submitted, extract(epoch from graded_at) * 1000 as graded, status from submissions where id between ${lo} and ${hi}`,
      )
      return r.rows.map((x) => ({ submitted: Number(x.submitted), graded: Number(x.graded), status: x.status }))
    }

    const workerErrors: string[] = []
    type Running = Awaited<ReturnType<typeof startWorker>>
    const startWorkers = async () => {
      const list: Running[] = []
      for (let i = 0; i < WORKERS; i++)
        list.push(await startWorker({ databaseUrl: url, log: () => {}, logError: (l) => workerErrors.push(l) }))
      return list
    }
    const stopWorkers = async (list: Running[]) => {
      for (const w of list.splice(0)) await w.stop()
    }
    let workers = await startWorkers()
    cleanups.unshift(() => stopWorkers(workers))

    // ---- steady load -------------------------------------------------------------------
    console.log(
      `Steady: ${N.toLocaleString('en')} submissions arriving at ${RATE}/s for ${WORKERS} worker${WORKERS === 1 ? '' : 's'}…`,
    )
    const steady = await arrive(N, RATE)
    await waitGraded(steady.ids, 120_000)
    const times = await readTimes(steady.ids)
    const latencies = times.map((t) => t.graded - t.submitted).sort((a, b) => a - b)
    const firstSubmitted = Math.min(...times.map((t) => t.submitted))
    const lastGraded = Math.max(...times.map((t) => t.graded))
    const gradedPerSecond = times.length / ((lastGraded - firstSubmitted) / 1000)
    const failed = times.filter((t) => t.status === 'failed').length
    const p50 = percentile(latencies, 50)
    const p90 = percentile(latencies, 90)
    const p99 = percentile(latencies, 99)
    const max = latencies.at(-1)!

    // ---- burst -------------------------------------------------------------------------
    let burst: { queued: number; queueSeconds: number; perSecond: number } | null = null
    if (!args['no-burst']) {
      console.log(`Burst: queueing ${N.toLocaleString('en')} submissions with the worker stopped, then starting it…`)
      await stopWorkers(workers)
      const queued = await arrive(N, Infinity)
      workers = await startWorkers()
      await waitGraded(queued.ids, 120_000)
      const bt = await readTimes(queued.ids)
      const firstGraded = Math.min(...bt.map((t) => t.graded))
      const lastBurst = Math.max(...bt.map((t) => t.graded))
      burst = {
        queued: queued.ids.length,
        queueSeconds: queued.seconds,
        perSecond: (bt.length - 1) / ((lastBurst - firstGraded) / 1000),
      }
    }

    // ---- the form's submit path ----------------------------------------------------------
    let submitPath: { stored: number; perSecond: number; p50: number; p99: number } | null = null
    if (!args['no-submit']) {
      console.log(`Submit path: ${SUBMIT_N.toLocaleString('en')} presses through submitAnswers, 16 at a time…`)
      const pressed = await offer(SUBMIT_N, Infinity, 16)
      await waitGraded(pressed.ids, 120_000)
      const pt = await readTimes(pressed.ids)
      const lat = pt.map((t) => t.graded - t.submitted).sort((a, b) => a - b)
      submitPath = {
        stored: pressed.ids.length,
        perSecond: pressed.ids.length / pressed.seconds,
        p50: percentile(lat, 50),
        p99: percentile(lat, 99),
      }
    }

    const s = (ms: number) => `${(ms / 1000).toFixed(3)} s`
    const pass = gradedPerSecond >= TARGET_PER_SECOND && p99 <= TARGET_P99_MS
    console.log('')
    console.log('Cyclewright grading benchmark')
    console.log(
      `machine          ${os.cpus().length} CPUs (${os.cpus()[0]?.model ?? 'unknown'}), node ${process.version}, ${os.platform()} ${os.release()}; load average ${os
        .loadavg()
        .map((l) => l.toFixed(1))
        .join(' ')} (other work on the machine skews every figure)`,
    )
    console.log(
      `set-up           ${STUDENTS} students × 2 problems (Otto, Brayton), ${WORKERS} in-process worker${WORKERS === 1 ? '' : 's'} with default fetch loops`,
    )
    if (steady.started < N)
      console.log(
        `note             only ${steady.started.toLocaleString('en')} of ${N.toLocaleString('en')} arrived within --max-seconds ${BUDGET_MS / 1000}: queueing could not keep up with ${RATE}/s`,
      )
    console.log(
      `steady           ${steady.ids.length.toLocaleString('en')} submissions arriving at ${RATE}/s, queued in ${steady.seconds.toFixed(1)} s = ${(steady.ids.length / steady.seconds).toFixed(0)}/s${steady.lateStarts > 0 ? ` (${steady.lateStarts} batches > 250 ms behind schedule)` : ''}`,
    )
    console.log(`graded/s         ${gradedPerSecond.toFixed(0)}  (first submitted → last graded)`)
    console.log(`latency          p50 ${s(p50)}   p90 ${s(p90)}   p99 ${s(p99)}   max ${s(max)}`)
    if (burst)
      console.log(
        `burst            ${burst.queued.toLocaleString('en')} queued in ${burst.queueSeconds.toFixed(1)} s (${(burst.queued / burst.queueSeconds).toFixed(0)}/s), drained at ${burst.perSecond.toFixed(0)} graded/s`,
      )
    if (submitPath)
      console.log(
        `submit path      ${submitPath.stored.toLocaleString('en')} presses through submitAnswers in this one process: ${submitPath.perSecond.toFixed(0)} stored/s; submit → graded p50 ${s(submitPath.p50)}, p99 ${s(submitPath.p99)} (no target: web processes scale out)`,
      )
    if (refused.length > 0)
      console.log(`refused          ${refused.length} presses stored nothing (first: ${refused[0]})`)
    if (failed > 0 || workerErrors.length > 0)
      console.log(
        `problems         ${failed} submissions failed to grade; ${workerErrors.length} worker errors${workerErrors[0] ? ` (first: ${workerErrors[0]})` : ''}`,
      )
    console.log(
      `targets          ≥ ${TARGET_PER_SECOND} graded/s: ${gradedPerSecond >= TARGET_PER_SECOND ? 'met' : 'missed'}; p99 ≤ ${s(TARGET_P99_MS)}: ${p99 <= TARGET_P99_MS ? 'met' : 'missed'}`,
    )
    console.log(pass ? 'PASS' : 'FAIL')
  } finally {
    for (const c of cleanups) await c().catch((e) => console.error('Clean-up:', e instanceof Error ? e.message : e))
    await dropDatabase(server, name).catch((e) =>
      console.error(`Could not drop the bench database ${name}:`, e instanceof Error ? e.message : e),
    )
    process.off('SIGINT', onSignal)
  }
}

main().then(
  () => process.exit(0),
  (e) => {
    console.error('The grading bench stopped:', e instanceof Error ? e.message : e)
    process.exit(1)
  },
)
