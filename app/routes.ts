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
  ...prefix('bank', [
    index('routes/bank/index.tsx'),
    route('new', 'routes/bank/new.tsx'),
    route('import', 'routes/bank/import.tsx'),
    route('export', 'routes/resources/bank-export.ts'),
    route(':problemId', 'routes/bank/$problemId.tsx'),
    route(':problemId/edit', 'routes/bank/edit.tsx'),
  ]),
  ...prefix('api', [
    route('problems', 'routes/resources/api-problems.ts'),
    route('problems/:problemId', 'routes/resources/api-problem.ts'),
    route('preview', 'routes/resources/api-preview.ts'),
    route('sweeps/:sweepId', 'routes/resources/api-sweep.ts'),
  ]),
  ...prefix('admin', [
    index('routes/admin/index.tsx'),
    route('outbox', 'routes/admin/outbox.tsx'),
    route('outbox/:messageId', 'routes/admin/outbox-message.tsx'),
  ]),
  route('healthz', 'routes/resources/healthz.ts'),
  route('*', 'routes/not-found.tsx'),
] satisfies RouteConfig
