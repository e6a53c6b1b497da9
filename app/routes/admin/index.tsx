import { href, Link } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { conventionText } from '#app/lib/conventions.ts'
import { requireAdmin } from '#app/server/auth.server.ts'
import { listAllCourses } from '#app/server/courses.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/index'
import { EmptyState, Table, TableHead } from '#app/components/ui/table.tsx'

export const meta: Route.MetaFunction = () => [{ title: 'Department · Cyclewright' }]

export async function loader({ request }: Route.LoaderArgs) {
  await requireAdmin(request)
  return { courses: await listAllCourses(db()) }
}

export default function AdminRoute({ loaderData }: Route.ComponentProps) {
  const { courses } = loaderData
  return (
    <div>
      <h1 className="text-3xl font-semibold">Department</h1>
      <p className="mt-2 text-muted">
        Every course on this installation. <Link to={href('/admin/exports')}>Export a term’s grades</Link> as one CSV
        file.
      </p>
      <p className="mt-4 flex flex-wrap gap-x-6 gap-y-2">
        <Link to={href('/admin/courses/new')}>New course</Link>
        <Link to={href('/admin/terms')}>Terms</Link>
      </p>
      {courses.length === 0 ? (
        <EmptyState className="mt-8">
          No courses yet — <Link to={href('/admin/courses/new')}>create the first</Link>.
        </EmptyState>
      ) : (
        <Table boxClassName="mt-6" caption="Courses">
          <TableHead>
            <tr>
              <th scope="col" className="px-4 py-2">
                Course
              </th>
              <th scope="col" className="px-4 py-2">
                Term
              </th>
              <th scope="col" className="px-4 py-2">
                Convention
              </th>
              <th scope="col" className="px-4 py-2">
                Time zone
              </th>
              <th scope="col" className="px-4 py-2 text-right">
                Students
              </th>
              <th scope="col" className="px-4 py-2 text-right">
                Staff
              </th>
            </tr>
          </TableHead>
          <tbody>
            {courses.map((c) => (
              <tr key={c.id} className="border-t border-line">
                <th scope="row" className="px-4 py-2 font-normal">
                  <Link to={href('/admin/courses/:courseId', { courseId: String(c.id) })}>
                    {c.code} {c.title}
                  </Link>
                </th>
                <td className="px-4 py-2">{c.termName}</td>
                <td className="px-4 py-2 font-mono whitespace-nowrap">{conventionText[c.signConvention].equation}</td>
                <td className="px-4 py-2">{c.timeZone}</td>
                <td className="px-4 py-2 text-right tabular-nums">{c.students}</td>
                <td className="px-4 py-2 text-right tabular-nums">{c.staff}</td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
      <ul className="mt-6 flex flex-wrap gap-x-6 gap-y-2" aria-label="Department tools">
        <li>
          <Link to={href('/admin/terms')}>Terms</Link>
        </li>
        <li>
          <Link to={href('/admin/exports')}>Grade exports</Link>
        </li>
        <li>
          <Link to={href('/admin/outbox')}>Outbox</Link>
        </li>
      </ul>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
