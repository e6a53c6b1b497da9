import { Button } from '#app/components/ui/button.tsx'
import { CONSTRAINT_OPS, fieldId, type EditorRows } from '#app/lib/problem-form.ts'
import { inputClass, type FieldKit } from './fields.tsx'
import type { RemoveButton } from './use-row-removal.tsx'

const OP_WORDS: Record<(typeof CONSTRAINT_OPS)[number], string> = {
  '<': '<',
  '<=': '≤',
  '>': '>',
  '>=': '≥',
  '!=': '≠',
}

/** The constraints table: combinations of givens a variant must satisfy. */
export function ConstraintsSection({
  kit,
  rows,
  removeButton,
}: {
  kit: FieldKit
  rows: EditorRows
  removeButton: RemoveButton
}) {
  const { v, describedBy, invalid, hasError, errorText, cellInput } = kit
  return (
    <section
      id={fieldId('constraints')}
      tabIndex={-1}
      aria-labelledby="constraints-title"
      className="rounded-lg border border-line bg-white p-6 shadow-sm"
    >
      <h2 id="constraints-title" className="text-xl font-semibold">
        Constraints
      </h2>
      <p className="mt-1 text-sm text-muted">
        Combinations of givens a variant must satisfy; others are drawn again. Both sides may use givens and units (“TH
        − TL” ≥ “100 K”).
      </p>
      {errorText('constraints')}
      <div className="mt-4 overflow-x-auto">
        <table className="w-full min-w-[40rem] text-left text-sm">
          <thead className="text-xs text-muted">
            <tr>
              <th scope="col" className="px-1 py-1">
                Left side
              </th>
              <th scope="col" className="px-1 py-1">
                Comparison
              </th>
              <th scope="col" className="px-1 py-1">
                Right side
              </th>
              <th scope="col" className="px-1 py-1">
                Message if it can never be met
              </th>
              <th scope="col" className="px-1 py-1">
                Remove
              </th>
            </tr>
          </thead>
          <tbody>
            {Array.from({ length: rows.constraints }, (_, i) => {
              const p = `constraints.${i}`
              const n = i + 1
              return (
                <tr key={i} className="border-t border-line">
                  {cellInput(`${p}.left`, `Constraint ${n} left side`, 'e.g. T3')}
                  <td className="px-1 py-1 align-top">
                    <select
                      id={fieldId(`${p}.op`)}
                      name={`${p}.op`}
                      aria-label={`Constraint ${n} comparison`}
                      defaultValue={v(`${p}.op`) || '<'}
                      aria-invalid={invalid(`${p}.op`)}
                      aria-describedby={describedBy(`${p}.op`)}
                      className={inputClass(hasError(`${p}.op`))}
                    >
                      {CONSTRAINT_OPS.map((op) => (
                        <option key={op} value={op}>
                          {OP_WORDS[op]}
                        </option>
                      ))}
                    </select>
                    {errorText(`${p}.op`)}
                  </td>
                  {cellInput(`${p}.right`, `Constraint ${n} right side`, 'e.g. 2000 K')}
                  {cellInput(`${p}.message`, `Constraint ${n} message`)}
                  <td className="px-1 py-1 text-center align-top">{removeButton('constraints', i)}</td>
                </tr>
              )
            })}
          </tbody>
        </table>
      </div>
      <Button type="submit" name="intent" value="add-constraint" variant="secondary" className="mt-3" formNoValidate>
        Add a constraint
      </Button>
    </section>
  )
}
