import { Button } from '#app/components/ui/button.tsx'
import {
  addHeaterIntent,
  fieldId,
  heaterRowCount,
  removeHeaterIntent,
  type EditorState,
} from '#app/lib/problem-form.ts'
import { inputClass, type FieldKit } from './fields.tsx'

const KINDS = [
  { value: 'open', label: 'open (direct contact, e.g. a deaerator)' },
  { value: 'closed', label: 'closed (tube and shell)' },
] as const
const DRAINS = [
  { value: '', label: 'default (backward)' },
  { value: 'backward', label: 'backward, through a trap' },
  { value: 'forward', label: 'forward, pumped into the feedwater' },
] as const

/**
 * A steam plant's feedwater heaters as rows, highest pressure first: kind, pressure, name,
 * terminal temperature difference and drains (the last two for closed heaters), each row
 * with a "Remove" button naming it, and "Add a heater". The buttons are submit buttons, so
 * the list works without JavaScript (the server action adds or drops the row); a row left
 * without pressure, name and TTD is dropped. A text field may name a given, as any input.
 */
export function HeaterListInput({
  kit,
  state,
  input,
  required,
  datalistId,
}: {
  kit: FieldKit
  state: EditorState
  input: string
  required: boolean
  datalistId: string
}) {
  const { v, describedBy, invalid, hasError, errorText, textInput } = kit
  const rows = state.heaterRows ?? heaterRowCount(state.values, input)
  const headingId = `${fieldId(`physics.inputs.${input}`)}-heading`
  const select = (path: string, label: string, choices: readonly { value: string; label: string }[]) => {
    const current = v(path)
    const known = choices.some((c) => c.value === current)
    return (
      <td className="px-1 py-1 align-top">
        <select
          id={fieldId(path)}
          name={path}
          aria-label={label}
          defaultValue={current || choices[0]!.value}
          aria-invalid={invalid(path)}
          aria-describedby={describedBy(path)}
          className={inputClass(hasError(path))}
        >
          {choices.map((c) => (
            <option key={c.value} value={c.value}>
              {c.label}
            </option>
          ))}
          {current !== '' && !known ? <option value={current}>{current} (as typed)</option> : null}
        </select>
        {errorText(path)}
      </td>
    )
  }
  return (
    <fieldset
      id={fieldId(`physics.inputs.${input}`)}
      tabIndex={-1}
      aria-labelledby={headingId}
      aria-describedby={`${headingId}-hint`}
      className="mt-4 md:col-span-2"
    >
      <legend id={headingId} className="text-sm font-medium">
        <code>{input}</code>{' '}
        <span className="font-normal text-muted">({required ? 'required' : 'optional'}): feedwater heaters</span>
      </legend>
      <p id={`${headingId}-hint`} className="text-xs text-muted">
        List the heaters from the highest pressure (nearest the boiler) to the lowest. A closed heater’s terminal
        temperature difference (TTD) is T_sat at its pressure minus the feedwater exit temperature, such as “3 K”
        (default 0 K); an open heater takes neither TTD nor drains. Pressure and TTD may be a given’s name.
      </p>
      {errorText(`physics.inputs.${input}`)}
      <div className="mt-2 overflow-x-auto">
        <table className="w-full min-w-[44rem] text-left text-sm">
          <thead className="text-xs text-muted">
            <tr>
              <th scope="col" className="px-1 py-1">
                Heater
              </th>
              <th scope="col" className="px-1 py-1">
                Kind
              </th>
              <th scope="col" className="px-1 py-1">
                Pressure
              </th>
              <th scope="col" className="px-1 py-1">
                Name (optional)
              </th>
              <th scope="col" className="px-1 py-1">
                TTD (closed)
              </th>
              <th scope="col" className="px-1 py-1">
                Drains (closed)
              </th>
              <th scope="col" className="px-1 py-1">
                Remove
              </th>
            </tr>
          </thead>
          <tbody>
            {Array.from({ length: rows }, (_, i) => {
              const p = `physics.inputs.${input}.${i}`
              const n = i + 1
              const name = v(`${p}.name`).trim()
              const removeLabel = `Remove heater ${n}${name ? ` (${name})` : ''}`
              return (
                <tr key={i} className="border-t border-line">
                  <th scope="row" className="px-1 py-1 align-top font-normal text-muted">
                    {n}
                  </th>
                  {select(`${p}.kind`, `Heater ${n} kind`, KINDS)}
                  <td className="px-1 py-1 align-top">
                    {textInput(`${p}.pressure`, {
                      ariaLabel: `Heater ${n} pressure`,
                      placeholder: 'e.g. 0.5 MPa',
                      list: `${datalistId}-givens`,
                    })}
                    {errorText(`${p}.pressure`)}
                  </td>
                  <td className="px-1 py-1 align-top">
                    {textInput(`${p}.name`, { ariaLabel: `Heater ${n} name`, placeholder: 'e.g. deaerator' })}
                    {errorText(`${p}.name`)}
                  </td>
                  <td className="px-1 py-1 align-top">
                    {textInput(`${p}.ttd`, {
                      ariaLabel: `Heater ${n} terminal temperature difference`,
                      placeholder: 'e.g. 3 K',
                      list: `${datalistId}-givens`,
                    })}
                    {errorText(`${p}.ttd`)}
                  </td>
                  {select(`${p}.drains`, `Heater ${n} drains`, DRAINS)}
                  <td className="px-1 py-1 text-center align-top">
                    <Button
                      type="submit"
                      name="intent"
                      value={removeHeaterIntent(input, i)}
                      variant="secondary"
                      formNoValidate
                      aria-label={removeLabel}
                    >
                      Remove
                    </Button>
                  </td>
                </tr>
              )
            })}
          </tbody>
        </table>
      </div>
      <Button
        type="submit"
        name="intent"
        value={addHeaterIntent(input)}
        variant="secondary"
        className="mt-3"
        formNoValidate
      >
        Add a heater
      </Button>
    </fieldset>
  )
}
