/**
 * Guards for JSON resource routes under /api/: the same permission rules as the pages, but
 * answered as JSON (401/403) instead of a redirect to the sign-in page or an HTML error, so
 * client-side queries can show a plain message.
 */
import { getUser } from './auth.server.ts'
import { canUseBank } from '#app/domain/permissions.ts'
import { toActor, type SignedInUser } from './users.server.ts'

export function jsonError(status: number, message: string): Response {
  return Response.json({ error: message }, { status, headers: { 'Cache-Control': 'no-store' } })
}

/** The signed-in bank user, or a thrown JSON 401/403 Response. */
export async function requireApiBankUser(request: Request): Promise<SignedInUser> {
  const user = await getUser(request)
  if (!user) throw jsonError(401, 'Sign in to use the problem bank.')
  if (!canUseBank(toActor(user))) throw jsonError(403, 'The problem bank is for instructors.')
  return user
}

/** A positive integer id from the URL, or a thrown JSON 404. */
export function apiIdParam(value: string | undefined, what: string): number {
  if (!value || !/^\d{1,9}$/.test(value)) throw jsonError(404, `There is no such ${what}.`)
  return Number(value)
}
