import { useState } from 'react'
import { Button } from '#app/components/ui/button.tsx'
import { fieldId, RULE_KINDS, type EditorState } from '#app/lib/problem-form.ts'
import { inputClass, type FieldKit } from './fields.tsx'
import type { RemoveButton } from './use-row-removal.tsx'

const RULE_WORDS: Record<(typeof RULE_KINDS)[number], string> = {
  range: 'Range',
  choice: 'One of a list',
  expression: 'Expression',
}

/** The givens table: each row drawn per student by a range, a list or an expression. */
export function GivensSection({
  kit,
  state: { values, rows },
  hydrated,
  removeButton,
}: {
  kit: FieldKit
  state: EditorState
  hydrated: boolean
  removeButton: RemoveButton
}) {
  const { describedBy, invalid, hasError, errorText, textInput, cellInput } = kit
  // Without JavaScript every rule's fields show; with it, only those of the chosen kind.
  const [ruleKinds, setRuleKinds] = useState(() =>
    Array.from({ length: rows.givens }, (_, i) => values[`givens.${i}.rule.kind`] || 'range'),
  )
  return (
    <section
      id={fieldId('givens')}
      tabIndex={-1}
      aria-labelledby="givens-title"
      className="rounded-lg border border-line bg-white p-6 shadow-sm"
    >
      <h2 id="givens-title" className="text-xl font-semibold">
        Givens
      </h2>
      <p className="mt-1 text-sm text-muted">
        Drawn per student. A range gives lowest, lowest + step, … up to highest; a list gives one of its values
        (numbers, or words such as gas names); an expression is computed from the givens above it.
      </p>
      {errorText('givens')}
      <div className="mt-4 overflow-x-auto">
        <table className="w-full min-w-[50rem] text-left text-sm">
          <thead className="text-xs text-muted">
            <tr>
              <th scope="col" className="px-1 py-1">
                Name
              </th>
              <th scope="col" className="px-1 py-1">
                Label
              </th>
              <th scope="col" className="px-1 py-1">
                Unit
              </th>
              <th scope="col" className="px-1 py-1">
                How it is drawn
              </th>
              <th scope="col" className="px-1 py-1">
                Shown with
              </th>
              <th scope="col" className="px-1 py-1">
                Remove
              </th>
            </tr>
          </thead>
          <tbody>
            {Array.from({ length: rows.givens }, (_, i) => {
              const p = `givens.${i}`
              const n = i + 1
              const kind = ruleKinds[i] ?? 'range'
              const show = (k: string) => !hydrated || kind === k
              return (
                <tr key={i} className="border-t border-line">
                  {cellInput(`${p}.name`, `Given ${n} name`, 'e.g. T1')}
                  {cellInput(`${p}.label`, `Given ${n} label`, 'e.g. inlet temperature')}
                  {cellInput(`${p}.unit`, `Given ${n} unit`, 'e.g. K')}
                  <td className="px-1 py-1 align-top">
                    <select
                      id={fieldId(`${p}.rule.kind`)}
                      name={`${p}.rule.kind`}
                      aria-label={`Given ${n}: how it is drawn`}
                      defaultValue={kind}
                      aria-invalid={invalid(`${p}.rule.kind`)}
                      aria-describedby={describedBy(`${p}.rule.kind`)}
                      onChange={(e) => {
                        const next = [...ruleKinds]
                        next[i] = e.target.value
                        setRuleKinds(next)
                      }}
                      className={inputClass(hasError(`${p}.rule.kind`))}
                    >
                      {RULE_KINDS.map((k) => (
                        <option key={k} value={k}>
                          {RULE_WORDS[k]}
                        </option>
                      ))}
                    </select>
                    {errorText(`${p}.rule.kind`)}
                    <div hidden={!show('range')} className="mt-1 grid grid-cols-3 gap-1">
                      {(['min', 'max', 'step'] as const).map((f) => (
                        <div key={f} className="flex flex-col">
                          <label htmlFor={fieldId(`${p}.rule.${f}`)} className="text-xs text-muted">
                            {f === 'min' ? 'lowest' : f === 'max' ? 'highest' : 'step'}
                          </label>
                          {textInput(`${p}.rule.${f}`, { inputMode: 'decimal' })}
                          {errorText(`${p}.rule.${f}`)}
                        </div>
                      ))}
                    </div>
                    <div hidden={!show('choice')} className="mt-1 flex flex-col">
                      <label htmlFor={fieldId(`${p}.rule.values`)} className="text-xs text-muted">
                        values, separated by commas
                      </label>
                      {textInput(`${p}.rule.values`, { placeholder: 'e.g. 95, 100, 105' })}
                      {errorText(`${p}.rule.values`)}
                    </div>
                    <div hidden={!show('expression')} className="mt-1 flex flex-col">
                      <label htmlFor={fieldId(`${p}.rule.expression`)} className="text-xs text-muted">
                        expression
                      </label>
                      {textInput(`${p}.rule.expression`, { placeholder: 'e.g. T1 + 500 K' })}
                      {errorText(`${p}.rule.expression`)}
                    </div>
                  </td>
                  <td className="px-1 py-1 align-top">
                    <div className="grid grid-cols-2 gap-1">
                      {(['decimals', 'sigFigs'] as const).map((f) => (
                        <div key={f} className="flex flex-col">
                          <label htmlFor={fieldId(`${p}.display.${f}`)} className="text-xs text-muted">
                            {f === 'decimals' ? 'decimals' : 'sig. figs'}
                          </label>
                          {textInput(`${p}.display.${f}`, { inputMode: 'numeric' })}
                          {errorText(`${p}.display.${f}`)}
                        </div>
                      ))}
                    </div>
                  </td>
                  <td className="px-1 py-1 text-center align-top">{removeButton('givens', i)}</td>
                </tr>
              )
            })}
          </tbody>
        </table>
      </div>
      <Button type="submit" name="intent" value="add-given" variant="secondary" className="mt-3" formNoValidate>
        Add a given
      </Button>
    </section>
  )
}
