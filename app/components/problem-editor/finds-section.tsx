import { Button } from '#app/components/ui/button.tsx'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { senseWarnings, type SenseFinding } from '#app/domain/authoring/sense.ts'
import { applicablePitfalls } from '#app/domain/grading/applicable-pitfalls.ts'
import { isOneOf } from '#app/lib/guards.ts'
import { VISIBILITIES } from '#app/lib/problem-schema.ts'
import { COMMON_OUTPUT_PATHS, fieldId, type EditorOptions, type EditorState } from '#app/lib/problem-form.ts'
import type { FieldKit } from './fields.tsx'
import { FindRow } from './find-row.tsx'
import type { RemoveButton } from './use-row-removal.tsx'

/**
 * Light checks on the draft in the browser: the sense warnings (a question's words against
 * its key's sign), by field path.
 */
function senseNotesOf(draftDefinition: ProblemDefinition | null, visibility: string): Map<string, string[]> {
  const warnings = new Map<string, string[]>()
  if (draftDefinition !== null) {
    let found: SenseFinding[] = []
    try {
      found = Array.isArray(draftDefinition.finds)
        ? senseWarnings(draftDefinition, { visibility: isOneOf(VISIBILITIES, visibility) ? visibility : 'private' })
        : []
    } catch {
      found = []
    }
    for (const w of found) warnings.set(w.path, [...(warnings.get(w.path) ?? []), w.message])
  }
  return warnings
}

/**
 * What students answer. With a draft (JavaScript), each find offers only the pitfalls that
 * can fire for it; without, every pitfall is offered and the lint refuses one that cannot
 * fire when saving.
 */
export function FindsSection({
  kit,
  state: { values, rows },
  options,
  hydrated,
  datalistId,
  draftDefinition,
  visibility,
  removeButton,
}: {
  kit: FieldKit
  state: EditorState
  options: EditorOptions
  hydrated: boolean
  datalistId: string
  draftDefinition: ProblemDefinition | null
  visibility: string
  removeButton: RemoveButton
}) {
  const { errorText } = kit
  const offeredPitfalls = (i: number) => {
    if (draftDefinition === null) return options.pitfalls
    const fit = new Set<string>(applicablePitfalls(draftDefinition, i))
    return options.pitfalls.filter((pf) => fit.has(pf.id))
  }
  const warnings = senseNotesOf(draftDefinition, visibility)
  return (
    <section
      id={fieldId('finds')}
      tabIndex={-1}
      aria-labelledby="finds-title"
      className="rounded-lg border border-line bg-white p-6 shadow-sm"
    >
      <h2 id="finds-title" className="text-xl font-semibold">
        Finds
      </h2>
      <p className="mt-1 text-sm text-muted">
        What students answer. Each comes from a solver output or an expression over the givens and earlier finds.
      </p>
      {errorText('finds')}
      <datalist id={`${datalistId}-paths`}>
        {COMMON_OUTPUT_PATHS.map((o) => (
          <option key={o.path} value={o.path} label={o.label} />
        ))}
      </datalist>
      <div className="mt-4 flex flex-col gap-4">
        {Array.from({ length: rows.finds }, (_, i) => (
          <FindRow
            key={i}
            kit={kit}
            values={values}
            i={i}
            hydrated={hydrated}
            datalistId={datalistId}
            offered={offeredPitfalls(i)}
            pitfalls={options.pitfalls}
            senseNotes={warnings.get(`finds.${i}.sense`) ?? []}
            removeButton={removeButton}
          />
        ))}
      </div>
      <Button type="submit" name="intent" value="add-find" variant="secondary" className="mt-3" formNoValidate>
        Add a find
      </Button>
    </section>
  )
}
