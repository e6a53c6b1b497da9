import { type RouteConfig, index, prefix, route } from '@react-router/dev/routes'

export default [
  index('routes/home.tsx'),
  route('sign-in', 'routes/sign-in.tsx'),
  route('sign-out', 'routes/sign-out.tsx'),
  route('forgot-password', 'routes/forgot-password.tsx'),
  route('reset-password/:token', 'routes/reset-password.tsx'),
  route('join/:token', 'routes/join.tsx'),
  ...prefix('courses/:courseId', [
    index('routes/courses/$courseId.tsx'),
    route('people', 'routes/courses/people.tsx'),
  ]),
  ...prefix('admin', [
    index('routes/admin/index.tsx'),
    route('outbox', 'routes/admin/outbox.tsx'),
    route('outbox/:messageId', 'routes/admin/outbox-message.tsx'),
  ]),
  route('healthz', 'routes/resources/healthz.ts'),
  route('*', 'routes/not-found.tsx'),
] satisfies RouteConfig
