import { data } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'

export async function loader() {
  throw data('The address may be mistyped, or the page may have moved.', { status: 404 })
}

export async function action() {
  throw data('The address may be mistyped, or the page may have moved.', { status: 404 })
}

export default function NotFoundRoute() {
  return null
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
