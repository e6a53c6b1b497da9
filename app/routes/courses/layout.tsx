import { href, Link, NavLink, Outlet, useParams, useRouteLoaderData } from 'react-router'
import { cn } from '#app/lib/cn.ts'
import { courseNavFor } from '#app/lib/course-nav.ts'
import type { loader as rootLoader } from '#app/root.tsx'

/**
 * The course header, rendered once for every page under /courses/:courseId: the course's code
 * and title, and the course's pages the signed-in member may open (the current one marked).
 * It reads the member's courses from the root loader and loads nothing itself: each page's own
 * loader still decides who may see it, so someone who is not a member gets that page's answer
 * (sign-in, 403 or 404) with no course header.
 */
export default function CourseLayout() {
  const { courseId } = useParams()
  const root = useRouteLoaderData<typeof rootLoader>('root')
  const course = root?.user?.courses.find((c) => String(c.id) === courseId)
  return (
    <>
      {course ? (
        <div className="mb-6 flex flex-wrap items-center gap-x-4 gap-y-2 border-b border-line pb-3">
          <p className="text-sm text-muted">
            <Link to={href('/courses/:courseId', { courseId: String(course.id) })} className="font-medium">
              {course.code} {course.title}
            </Link>
          </p>
          <nav aria-label="Course" className="flex flex-wrap gap-1">
            {courseNavFor(course.id, course.role).map((item) => (
              <NavLink
                key={item.to}
                to={item.to}
                end={item.end}
                className={({ isActive }) =>
                  cn(
                    'inline-flex min-h-11 items-center rounded-md px-2.5 py-1 text-sm no-underline hover:bg-accent-soft hover:no-underline sm:min-h-0',
                    isActive ? 'bg-accent-soft font-semibold text-accent-strong' : 'text-ink',
                  )
                }
              >
                {item.label}
              </NavLink>
            ))}
          </nav>
        </div>
      ) : null}
      <Outlet />
    </>
  )
}
