import { useState } from 'react'
import { FIND_SENSES, FIND_SENSE_WORDS } from '#app/domain/authoring/definition.ts'
import { fieldId, type EditorOptions } from '#app/lib/problem-form.ts'
import { inputClass, type FieldKit } from './fields.tsx'
import { FindPitfalls } from './find-pitfalls.tsx'
import type { RemoveButton } from './use-row-removal.tsx'

/**
 * One find: its name and question, where the answer comes from (a solver output or an
 * expression), unit, points, tolerance, sense, significant figures and pitfalls. Without
 * JavaScript every source's and tolerance's fields show; with it, only the chosen ones.
 */
export function FindRow({
  kit,
  values,
  i,
  hydrated,
  datalistId,
  offered,
  pitfalls,
  senseNotes,
  removeButton,
}: {
  kit: FieldKit
  values: Readonly<Record<string, string>>
  i: number
  hydrated: boolean
  datalistId: string
  offered: EditorOptions['pitfalls']
  pitfalls: EditorOptions['pitfalls']
  senseNotes: readonly string[]
  removeButton: RemoveButton
}) {
  const { v, describedBy, invalid, hasError, errorText, labelled, textInput } = kit
  const p = `finds.${i}`
  const n = i + 1
  const [source, setSource] = useState(() => values[`${p}.source.kind`] || 'output')
  const [tolerance, setTolerance] = useState(() => values[`${p}.tolerance.kind`] || 'relative')
  return (
    <fieldset key={i} className="rounded-md border border-line p-4">
      <legend className="px-1 text-sm font-semibold">Find {n}</legend>
      <div className="grid gap-3 md:grid-cols-4">
        {labelled(`${p}.name`, 'Name', textInput(`${p}.name`, { placeholder: 'e.g. wnet' }))}
        <div className="md:col-span-3">
          {labelled(
            `${p}.label`,
            'Question beside the answer box',
            textInput(`${p}.label`, { placeholder: 'e.g. Net work per kilogram of air' }),
          )}
        </div>
        {labelled(
          `${p}.source.kind`,
          'Answer comes from',
          <select
            id={fieldId(`${p}.source.kind`)}
            name={`${p}.source.kind`}
            defaultValue={source}
            onChange={(e) => setSource(e.target.value)}
            aria-invalid={invalid(`${p}.source.kind`)}
            aria-describedby={describedBy(`${p}.source.kind`)}
            className={inputClass(hasError(`${p}.source.kind`))}
          >
            <option value="output">A solver output</option>
            <option value="expression">An expression</option>
          </select>,
        )}
        <div hidden={hydrated && source !== 'output'} className="md:col-span-3">
          {labelled(
            `${p}.source.path`,
            'Output path',
            textInput(`${p}.source.path`, {
              list: `${datalistId}-paths`,
              placeholder: 'e.g. totals.netWork',
              hint: true,
            }),
            'For example totals.efficiency, states.3.T, steps.2.q.',
          )}
        </div>
        <div hidden={hydrated && source !== 'expression'} className="md:col-span-3">
          {labelled(
            `${p}.source.expression`,
            'Expression',
            textInput(`${p}.source.expression`, { placeholder: 'e.g. wnet / qin' }),
          )}
        </div>
        {labelled(
          `${p}.unit`,
          'Unit',
          textInput(`${p}.unit`, { placeholder: 'e.g. kJ/kg', hint: true }),
          'Empty for a pure number.',
        )}
        {labelled(`${p}.points`, 'Points', textInput(`${p}.points`, { inputMode: 'decimal', placeholder: 'e.g. 1' }))}
        {labelled(
          `${p}.tolerance.kind`,
          'Tolerance',
          <select
            id={fieldId(`${p}.tolerance.kind`)}
            name={`${p}.tolerance.kind`}
            defaultValue={tolerance}
            onChange={(e) => setTolerance(e.target.value)}
            aria-invalid={invalid(`${p}.tolerance.kind`)}
            aria-describedby={describedBy(`${p}.tolerance.kind`)}
            className={inputClass(hasError(`${p}.tolerance.kind`))}
          >
            <option value="relative">Relative</option>
            <option value="absolute">Absolute</option>
          </select>,
        )}
        {labelled(
          `${p}.tolerance.value`,
          'Tolerance value',
          textInput(`${p}.tolerance.value`, {
            placeholder: tolerance === 'relative' ? 'e.g. 0.01' : 'e.g. 2',
            hint: true,
          }),
          hydrated && tolerance === 'absolute'
            ? 'In the tolerance unit.'
            : 'Relative: a fraction (0.01) or a percentage (1 %).',
        )}
        <div hidden={hydrated && tolerance !== 'absolute'}>
          {labelled(
            `${p}.tolerance.unit`,
            'Tolerance unit (absolute)',
            textInput(`${p}.tolerance.unit`, { placeholder: 'e.g. K', hint: true }),
            'Empty: the find’s unit.',
          )}
        </div>
        <div className="md:col-span-2">
          {labelled(
            `${p}.sense`,
            'Sense (work and heat)',
            <select
              id={fieldId(`${p}.sense`)}
              name={`${p}.sense`}
              defaultValue={v(`${p}.sense`)}
              aria-invalid={invalid(`${p}.sense`)}
              aria-describedby={
                [describedBy(`${p}.sense`, true), senseNotes.length > 0 ? `${fieldId(`${p}.sense`)}-warning` : null]
                  .filter(Boolean)
                  .join(' ') || undefined
              }
              className={inputClass(hasError(`${p}.sense`))}
            >
              <option value="">Not stated: the course’s convention decides the sign</option>
              {FIND_SENSES.map((sense) => (
                <option key={sense} value={sense}>
                  Positive for {FIND_SENSE_WORDS[sense]}
                </option>
              ))}
            </select>,
            'Stated, the key has this sign in every course; the convention only picks the symbol (w or W, q or Q).',
          )}
          {senseNotes.length > 0 ? (
            <p id={`${fieldId(`${p}.sense`)}-warning`} className="mt-1 text-xs text-warn">
              {senseNotes.join(' ')}
            </p>
          ) : null}
        </div>
        {labelled(
          `${p}.sigFigs.min`,
          'Fewest significant figures',
          textInput(`${p}.sigFigs.min`, { inputMode: 'numeric' }),
        )}
        {labelled(
          `${p}.sigFigs.max`,
          'Most significant figures',
          textInput(`${p}.sigFigs.max`, { inputMode: 'numeric' }),
        )}
      </div>
      <div className="mt-3 flex flex-wrap gap-x-6 gap-y-2 text-sm">
        <label className="flex items-center gap-2">
          <input
            type="checkbox"
            id={fieldId(`${p}.isDifference`)}
            name={`${p}.isDifference`}
            defaultChecked={Boolean(values[`${p}.isDifference`])}
            className="size-4"
          />
          A temperature difference (°C and °F carry no offset)
        </label>
        <label className="flex items-center gap-2">
          <input
            type="checkbox"
            id={fieldId(`${p}.allowBareNumber`)}
            name={`${p}.allowBareNumber`}
            defaultChecked={Boolean(values[`${p}.allowBareNumber`])}
            className="size-4"
          />
          Accept a number without a unit (read in the find’s unit)
        </label>
      </div>
      {errorText(`${p}.isDifference`)}
      {errorText(`${p}.allowBareNumber`)}
      <FindPitfalls kit={kit} values={values} i={i} offered={offered} pitfalls={pitfalls} />
      <div className="mt-3">{removeButton('finds', i)}</div>
    </fieldset>
  )
}
