import { href, redirect } from 'react-router'
import { signOut } from '#app/server/auth.server.ts'
import type { Route } from './+types/sign-out'

export async function loader() {
  return redirect(href('/'))
}

export async function action({ request }: Route.ActionArgs) {
  return signOut(request)
}
