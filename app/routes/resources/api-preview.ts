import { z } from 'zod'
import { jsonError, requireApiBankUser } from '#app/server/api-guard.server.ts'
import { MAX_PREVIEW_SEEDS, previewProblem } from '#app/server/preview.server.ts'
import type { Route } from './+types/api-preview'

/** Largest preview request body; a problem document is far smaller. */
const MAX_BODY_BYTES = 512 * 1024

const PreviewRequestSchema = z.object({
  definition: z.unknown(),
  seeds: z.array(z.number().int().min(0).max(0xffffffff)).max(MAX_PREVIEW_SEEDS).optional(),
  convention: z.enum(['chemistry', 'engineering']).optional(),
})

export async function loader() {
  return jsonError(405, 'Send the problem with POST as JSON: { "definition": …, "seeds": [1, 2, 3] }.')
}

/** POST { definition, seeds?, convention? } → PreviewResult (app/lib/preview.ts). */
export async function action({ request }: Route.ActionArgs) {
  if (request.method !== 'POST') return jsonError(405, 'Use POST.')
  await requireApiBankUser(request)
  const length = Number(request.headers.get('content-length') ?? '0')
  if (length > MAX_BODY_BYTES) return jsonError(413, 'That problem is too large to preview.')
  let body: unknown
  try {
    const text = await request.text()
    if (text.length > MAX_BODY_BYTES) return jsonError(413, 'That problem is too large to preview.')
    body = JSON.parse(text)
  } catch {
    return jsonError(400, 'The preview request is not valid JSON.')
  }
  const parsed = PreviewRequestSchema.safeParse(body)
  if (!parsed.success)
    return jsonError(
      400,
      `The preview request could not be read: ${parsed.error.issues[0]?.message ?? 'unknown field'}.`,
    )
  const { definition, seeds, convention } = parsed.data
  return Response.json(previewProblem(definition, { seeds, convention }), { headers: { 'Cache-Control': 'no-store' } })
}
