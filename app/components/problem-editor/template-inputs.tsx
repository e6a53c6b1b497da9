import { HEATER_LIST, type EditorState, type TemplateChoice } from '#app/lib/problem-form.ts'
import type { FieldKit } from './fields.tsx'
import { HeaterListInput } from './heater-list-input.tsx'

/**
 * The chosen template's inputs, each a given's name (offered from a list) or a fixed value,
 * and any inputs left over from another template, to be emptied.
 */
export function TemplateInputs({
  kit,
  state,
  chosen,
  datalistId,
}: {
  kit: FieldKit
  state: EditorState
  chosen: TemplateChoice | undefined
  datalistId: string
}) {
  const { labelled, textInput } = kit
  const { values, rows } = state
  const templateInputNames = new Set(chosen?.inputs.map((i) => i.name) ?? [])
  const leftoverInputs = Object.keys(values)
    .filter(
      (k) =>
        k.startsWith('physics.inputs.') &&
        k.split('.').length === 3 &&
        values[k] !== '' &&
        !templateInputNames.has(k.slice('physics.inputs.'.length)),
    )
    .map((k) => k.slice('physics.inputs.'.length))
  const givenNames = Array.from({ length: rows.givens }, (_, i) => values[`givens.${i}.name`]).filter(
    (n): n is string => Boolean(n),
  )
  return (
    <div className="mt-4">
      {chosen ? <p className="text-sm text-muted">{chosen.description}</p> : null}
      <p className="mt-2 text-sm text-muted">
        Each input takes a given’s name{givenNames.length > 0 ? ` (${givenNames.join(', ')})` : ''}, or a fixed value
        with its unit such as “100 kPa”; leave optional inputs empty.
      </p>
      <div className="mt-3 grid gap-4 md:grid-cols-2">
        {chosen?.inputs.map((input) => {
          const path = `physics.inputs.${input.name}`
          if (input.dimension === HEATER_LIST)
            return (
              <HeaterListInput
                key={path}
                kit={kit}
                state={state}
                input={input.name}
                required={input.required}
                datalistId={datalistId}
              />
            )
          return (
            <div key={path}>
              {labelled(
                path,
                <>
                  <code>{input.name}</code>{' '}
                  <span className="font-normal text-muted">({input.required ? 'required' : 'optional'})</span>
                </>,
                textInput(path, { hint: true, list: `${datalistId}-givens`, remember: true }),
                <>
                  {input.description}
                  {input.unit ? `; in ${input.unit}` : ''}
                </>,
              )}
            </div>
          )
        })}
        {leftoverInputs.map((name) => {
          const path = `physics.inputs.${name}`
          return (
            <div key={path}>
              {labelled(
                path,
                <code>{name}</code>,
                textInput(path, { hint: true }),
                'Not an input of this template: empty it to drop it.',
              )}
            </div>
          )
        })}
      </div>
      <datalist id={`${datalistId}-givens`}>
        {givenNames.map((n) => (
          <option key={n} value={n} />
        ))}
      </datalist>
    </div>
  )
}
