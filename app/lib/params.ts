import { data } from 'react-router'

/** Reads a positive integer id from the URL, or throws a 404 page. */
export function requireIdParam(value: string | undefined, what = 'page'): number {
  if (!value || !/^\d{1,9}$/.test(value)) throw data(`There is no such ${what}.`, { status: 404 })
  return Number(value)
}
