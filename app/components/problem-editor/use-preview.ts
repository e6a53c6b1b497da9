import { keepPreviousData, useQuery } from '@tanstack/react-query'
import { href } from 'react-router'
import { isRecord } from '#app/lib/guards.ts'
import type { PreviewResult } from '#app/lib/preview.ts'
import type { EditorDraft } from './use-draft.ts'

function isPreviewResult(x: unknown): x is PreviewResult {
  return isRecord(x) && Array.isArray(x.issues) && Array.isArray(x.variants)
}

/** The draft's JSON read back (it was written by JSON.stringify a moment ago). */
function parsedJson(text: string): unknown {
  return JSON.parse(text)
}

async function fetchPreview(
  definitionJson: string,
  convention: string | undefined,
  signal: AbortSignal,
): Promise<PreviewResult> {
  const response = await fetch(href('/api/preview'), {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Accept: 'application/json' },
    body: JSON.stringify({ definition: parsedJson(definitionJson), ...(convention ? { convention } : {}) }),
    signal,
  })
  let body: unknown = null
  try {
    body = await response.json()
  } catch {
    // A non-JSON answer (a proxy's error page) is reported by status below.
  }
  if (!response.ok) {
    const message = isRecord(body) && typeof body.error === 'string' ? body.error : null
    throw new Error(message ?? `The preview could not be made just now (status ${response.status}).`)
  }
  if (!isPreviewResult(body))
    throw new Error('The preview came back in a form this page cannot read. Reload the page and try again.')
  return body
}

/**
 * The live preview of the draft (POST /api/preview), asked again when the draft or the
 * previewed convention changes; the last answer stays shown while the next one loads.
 */
export function usePreview(draft: EditorDraft | null, convention: string | undefined) {
  return useQuery({
    queryKey: ['preview', draft?.json ?? null, convention ?? null],
    queryFn: ({ signal }) => fetchPreview(draft!.json, convention, signal),
    enabled: draft !== null,
    placeholderData: keepPreviousData,
    retry: false,
    staleTime: 60_000,
  })
}
