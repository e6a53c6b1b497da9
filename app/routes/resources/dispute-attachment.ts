// Placeholder until this resource is built (issue #7).
export function loader() {
  return new Response('Not built yet', { status: 404 })
}
