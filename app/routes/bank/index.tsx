import { data, Form, href, Link, useNavigation, useSearchParams } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { DIFFICULTIES, LEVELS } from '#app/domain/authoring/definition.ts'
import { cycleChoices } from '#app/domain/thermo/catalog.ts'
import { difficultyLabel, levelLabel, visibilityLabel } from '#app/lib/bank-labels.ts'
import { isKeyOf } from '#app/lib/guards.ts'
import { requireBankUser } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { bankViewerFor, listBankProblems, readBankSearch, type BankRow } from '#app/server/problems.server.ts'
import type { Route } from './+types/index'

export const meta: Route.MetaFunction = () => [{ title: 'Problem bank · Cyclewright' }]

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireBankUser(request)
  const url = new URL(request.url)
  const read = readBankSearch(url.searchParams)
  if (!read.ok) {
    // A page number beyond use has no field to mark: the error page says what to change.
    if (read.problem.param === 'page') throw data(read.problem.message, { status: 400 })
    // A search that cannot be run: the box keeps the words, marked, and no list is shown.
    const noRows: BankRow[] = []
    const refused = {
      rows: noRows,
      total: 0,
      page: 1,
      pageSize: read.query.pageSize,
      query: read.query,
      imported: 0,
      searchError: read.problem.message,
      cycles: cycleChoices(),
    }
    return data(refused, { status: 400 })
  }
  const { query } = read
  const viewer = await bankViewerFor(db(), user)
  const result = await listBankProblems(db(), viewer, query)
  const imported = Number(url.searchParams.get('imported') ?? '0')
  const searchError: string | null = null
  return {
    ...result,
    query,
    imported: Number.isInteger(imported) && imported > 0 ? imported : 0,
    deleted: url.searchParams.get('deleted') === '1',
    searchError,
    cycles: cycleChoices(),
  }
}

type SortKey = 'updated' | 'title' | 'cycle' | 'difficulty'

function SortHeader({
  label,
  sortKey,
  current,
  dir,
}: {
  label: string
  sortKey: SortKey
  current: string
  dir: string
}) {
  const [params] = useSearchParams()
  const active = current === sortKey
  const next = new URLSearchParams(params)
  next.set('sort', sortKey)
  next.set('dir', active && dir === 'asc' ? 'desc' : 'asc')
  next.delete('page')
  return (
    <th scope="col" className="px-3 py-2" aria-sort={active ? (dir === 'asc' ? 'ascending' : 'descending') : 'none'}>
      <Link to={`?${next}`} className="text-muted no-underline hover:text-ink">
        {label}
        <span aria-hidden="true">{active ? (dir === 'asc' ? ' ▲' : ' ▼') : ''}</span>
      </Link>
    </th>
  )
}

export default function BankRoute({ loaderData }: Route.ComponentProps) {
  const { rows, total, page, pageSize, query, imported, searchError, cycles } = loaderData
  const cycleLabels = new Map(cycles)
  const cycleLabel = (id: string) => cycleLabels.get(id) ?? id
  const [params] = useSearchParams()
  const busy = useNavigation().state === 'loading'
  const pages = Math.max(1, Math.ceil(total / pageSize))
  const pageLink = (p: number) => {
    const next = new URLSearchParams(params)
    next.set('page', String(p))
    return `?${next}`
  }
  const filtered = Boolean(
    query.q || query.cycle || query.difficulty || query.level || query.scope !== 'all' || query.archived,
  )
  return (
    <div>
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-3xl font-semibold">Problem bank</h1>
          <p className="mt-1 max-w-2xl text-muted">
            Problems belong to you, not to a course: reuse them in any course and term. Each student draws their own
            givens; the server solves every variant.
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          <Link
            to={href('/bank/new')}
            className="rounded-md bg-accent px-4 py-2 text-sm font-semibold text-white no-underline hover:bg-accent-strong hover:no-underline"
          >
            New problem
          </Link>
          <Link
            to={href('/bank/import')}
            className="rounded-md border border-line bg-white px-4 py-2 text-sm font-semibold text-ink no-underline hover:bg-paper hover:no-underline"
          >
            Import
          </Link>
          <a
            href={href('/bank/export')}
            className="rounded-md border border-line bg-white px-4 py-2 text-sm font-semibold text-ink no-underline hover:bg-paper hover:no-underline"
          >
            Export all of mine
          </a>
        </div>
      </div>

      {'deleted' in loaderData && loaderData.deleted ? (
        <Notice tone="ok" className="mt-4">
          The problem was deleted.
        </Notice>
      ) : null}
      {query.archived ? (
        <p className="mt-4 text-sm">
          Showing archived problems: they are hidden from the bank list and the assignment picker until restored.{' '}
          <Link to={href('/bank')}>Show the others</Link>
        </p>
      ) : null}
      {imported > 0 ? (
        <Notice tone="ok" className="mt-4">
          Imported {imported} problem{imported === 1 ? '' : 's'} into your bank as private problems.
        </Notice>
      ) : null}

      <Form
        method="get"
        role="search"
        aria-label="Search the bank"
        className="mt-6 grid gap-3 rounded-lg border border-line bg-white p-4 sm:grid-cols-2 lg:grid-cols-[2fr_1fr_1fr_1fr_1fr_auto_auto] lg:items-end"
      >
        <div className="flex flex-col gap-1">
          <label htmlFor="bank-q" className="text-sm font-medium">
            Search
          </label>
          <input
            id="bank-q"
            name="q"
            type="search"
            defaultValue={query.q ?? ''}
            placeholder="Title, topic or cycle"
            aria-invalid={searchError ? true : undefined}
            aria-describedby={searchError ? 'bank-q-error' : undefined}
            className={`rounded-md border px-3 py-2 ${searchError ? 'border-danger' : 'border-line'}`}
          />
          {searchError ? (
            <p id="bank-q-error" className="text-sm text-danger">
              {searchError}
            </p>
          ) : null}
        </div>
        <FilterSelect id="bank-cycle" name="cycle" label="Cycle" value={query.cycle ?? ''} options={cycles} />
        <FilterSelect
          id="bank-difficulty"
          name="difficulty"
          label="Difficulty"
          value={query.difficulty ?? ''}
          options={DIFFICULTIES.map((d) => [d, difficultyLabel[d]])}
        />
        <FilterSelect
          id="bank-level"
          name="level"
          label="Level"
          value={query.level ?? ''}
          options={LEVELS.map((l) => [l, levelLabel[l]])}
        />
        <FilterSelect
          id="bank-scope"
          name="scope"
          label="Whose"
          value={query.scope === 'all' ? '' : (query.scope ?? '')}
          allLabel="Everything I can see"
          options={[
            ['mine', 'My problems'],
            ['shared', 'Shared with me'],
          ]}
        />
        <label className="flex items-center gap-2 text-sm lg:self-center">
          <input type="checkbox" name="archived" value="1" defaultChecked={query.archived === '1'} className="size-4" />
          Archived
        </label>
        <div className="flex gap-2">
          <button
            type="submit"
            className="rounded-md bg-accent px-4 py-2 text-sm font-semibold text-white hover:bg-accent-strong"
          >
            Search
          </button>
          {filtered ? (
            <Link to={href('/bank')} className="self-center text-sm">
              Clear
            </Link>
          ) : null}
        </div>
      </Form>

      <p className="mt-4 text-sm text-muted" aria-live="polite">
        {busy
          ? 'Loading…'
          : searchError
            ? 'The search was not run: see the message under the search box.'
            : `${total} problem${total === 1 ? '' : 's'}${filtered ? ' match' : ''}`}
      </p>

      {searchError ? null : rows.length === 0 ? (
        <div className="mt-4 rounded-lg border border-dashed border-line bg-white p-8 text-center">
          {filtered ? (
            <p className="text-muted">Nothing matches these filters. Try fewer words, or clear the filters.</p>
          ) : (
            <>
              <p className="font-semibold">Your bank is empty.</p>
              <p className="mt-1 text-muted">Write a problem, or import a bank document someone shared with you.</p>
              <p className="mt-4">
                <Link to={href('/bank/new')}>Write your first problem</Link>
              </p>
            </>
          )}
        </div>
      ) : (
        <Form method="get" action={href('/bank/export')} reloadDocument>
          <div className="mt-2 overflow-x-auto rounded-lg border border-line bg-white">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">
                Problems in the bank, page {page} of {pages}
              </caption>
              <thead className="bg-paper text-xs tracking-wide uppercase">
                <tr>
                  <th scope="col" className="w-10 px-3 py-2">
                    <span className="sr-only">Select for export</span>
                  </th>
                  <SortHeader label="Title" sortKey="title" current={query.sort} dir={query.dir} />
                  <SortHeader label="Cycle" sortKey="cycle" current={query.sort} dir={query.dir} />
                  <th scope="col" className="px-3 py-2 text-muted">
                    Topics
                  </th>
                  <SortHeader label="Difficulty" sortKey="difficulty" current={query.sort} dir={query.dir} />
                  <th scope="col" className="px-3 py-2 text-muted">
                    Author · sharing
                  </th>
                  <SortHeader label="Updated" sortKey="updated" current={query.sort} dir={query.dir} />
                </tr>
              </thead>
              <tbody>
                {rows.map((r) => (
                  <tr key={r.id} className="border-t border-line align-top">
                    <td className="px-3 py-2">
                      <input
                        type="checkbox"
                        name="ids"
                        value={r.id}
                        aria-label={`Select “${r.title}” for export`}
                        className="size-4"
                      />
                    </td>
                    <td className="px-3 py-2">
                      <Link to={href('/bank/:problemId', { problemId: String(r.id) })} className="font-semibold">
                        {r.title}
                      </Link>
                      <div className="text-xs text-muted">
                        version {r.latestVersionNumber}
                        {r.originProblemId ? ' · copied' : ''}
                        {query.archived ? ' · archived' : ''}
                      </div>
                      {query.archived && r.isOwn ? (
                        // Inside the export form: this button posts to the problem's own page instead.
                        <button
                          type="submit"
                          name="intent"
                          value="restore"
                          formMethod="post"
                          formAction={href('/bank/:problemId', { problemId: String(r.id) })}
                          className="mt-1 text-xs text-accent underline"
                        >
                          restore<span className="sr-only"> “{r.title}”</span>
                        </button>
                      ) : null}
                    </td>
                    <td className="px-3 py-2">{cycleLabel(r.cycle)}</td>
                    <td className="px-3 py-2 text-muted">{r.topics.length > 0 ? r.topics.join(', ') : '—'}</td>
                    <td className="px-3 py-2">
                      {isKeyOf(difficultyLabel, r.difficulty) ? difficultyLabel[r.difficulty] : r.difficulty}
                      <div className="text-xs text-muted">
                        {isKeyOf(levelLabel, r.level) ? levelLabel[r.level] : r.level}
                      </div>
                    </td>
                    <td className="px-3 py-2">
                      {r.isOwn ? 'You' : r.ownerName}
                      <div className="text-xs text-muted">{visibilityLabel[r.visibility]}</div>
                    </td>
                    <td className="px-3 py-2 whitespace-nowrap text-muted">
                      <time dateTime={r.updatedAt}>{r.updatedAt.slice(0, 10)}</time>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <div className="mt-3 flex flex-wrap items-center justify-between gap-3">
            <button type="submit" className="rounded-md border border-line bg-white px-3 py-1.5 text-sm hover:bg-paper">
              Export selected
            </button>
            {pages > 1 ? (
              <nav aria-label="Pages" className="flex items-center gap-3 text-sm">
                {page > 1 ? (
                  <Link to={pageLink(page - 1)}>← Previous</Link>
                ) : (
                  <span className="text-muted">← Previous</span>
                )}
                <span>
                  Page {page} of {pages}
                </span>
                {page < pages ? (
                  <Link to={pageLink(page + 1)}>Next →</Link>
                ) : (
                  <span className="text-muted">Next →</span>
                )}
              </nav>
            ) : null}
          </div>
        </Form>
      )}
    </div>
  )
}

function FilterSelect({
  id,
  name,
  label,
  value,
  options,
  allLabel = 'Any',
}: {
  id: string
  name: string
  label: string
  value: string
  options: readonly (readonly [string, string])[]
  allLabel?: string
}) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium">
        {label}
      </label>
      <select id={id} name={name} defaultValue={value} className="rounded-md border border-line bg-white px-3 py-2">
        <option value="">{allLabel}</option>
        {options.map(([v, l]) => (
          <option key={v} value={v}>
            {l}
          </option>
        ))}
      </select>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
