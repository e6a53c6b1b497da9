import { useState } from 'react'
import { Button } from '#app/components/ui/button.tsx'
import { cn } from '#app/lib/cn.ts'
import { fieldId, findTemplate, GENERAL_CYCLE, type EditorOptions, type EditorState } from '#app/lib/problem-form.ts'
import { inputClass, type FieldKit } from './fields.tsx'
import { TemplateInputs } from './template-inputs.tsx'

/**
 * The physics: a template chosen from the list (its inputs below, each a given's name or a
 * fixed value), or a general cycle written as JSON. Without JavaScript "Use this template"
 * reloads the form with the chosen template's inputs.
 */
export function PhysicsSection({
  kit,
  state,
  options,
  hydrated,
  datalistId,
}: {
  kit: FieldKit
  state: EditorState
  options: EditorOptions
  hydrated: boolean
  datalistId: string
}) {
  const { v, describedBy, invalid, hasError, labelled } = kit
  const [template, setTemplate] = useState(state.values['physics.template'] || 'otto')
  const chosen = template === GENERAL_CYCLE ? undefined : findTemplate(options, template)
  return (
    <section aria-labelledby="physics-title" className="rounded-lg border border-line bg-white p-6 shadow-sm">
      <h2 id="physics-title" className="text-xl font-semibold">
        Physics
      </h2>
      <div className="mt-4 flex flex-wrap items-end gap-3">
        <div className="min-w-[18rem] flex-1">
          {labelled(
            'physics.template',
            'Cycle',
            <select
              id={fieldId('physics.template')}
              name="physics.template"
              defaultValue={template}
              onChange={(e) => setTemplate(e.target.value)}
              aria-invalid={invalid('physics.template')}
              aria-describedby={describedBy('physics.template')}
              className={inputClass(hasError('physics.template'))}
            >
              {options.templateGroups.map((g) => (
                <optgroup key={g.label} label={g.label}>
                  {g.templates.map((t) => (
                    <option key={t.id} value={t.id}>
                      {t.title}
                    </option>
                  ))}
                </optgroup>
              ))}
              <optgroup label="Other">
                <option value={GENERAL_CYCLE}>General state-and-process cycle</option>
              </optgroup>
              {template !== GENERAL_CYCLE && !chosen ? (
                <option value={template}>{template} (not a known template)</option>
              ) : null}
            </select>,
          )}
        </div>
        {hydrated ? null : (
          <Button type="submit" name="intent" value="change-template" variant="secondary" formNoValidate>
            Use this template
          </Button>
        )}
      </div>
      {template === GENERAL_CYCLE ? (
        <div className="mt-4">
          {labelled(
            'physics.cycle',
            'Cycle description (JSON)',
            <textarea
              id={fieldId('physics.cycle')}
              name="physics.cycle"
              rows={14}
              defaultValue={v('physics.cycle')}
              spellCheck={false}
              aria-invalid={invalid('physics.cycle')}
              aria-describedby={describedBy('physics.cycle', true)}
              className={cn(inputClass(hasError('physics.cycle')), 'font-mono')}
            />,
            <>
              The <code>cycle</code> object of a spec file: gas, system, amount, states and steps (docs/spec-format.md);
              for water, <code>"substance": "water"</code> with system, mass, states and steps (the author guide). A
              text that is exactly a given’s name becomes that given’s value with its unit; <code>@{'{name}'}</code>{' '}
              works inside longer texts (in the physics only; the prompt writes <code>[name]</code>).
            </>,
          )}
        </div>
      ) : (
        <TemplateInputs kit={kit} state={state} chosen={chosen} datalistId={datalistId} />
      )}
    </section>
  )
}
