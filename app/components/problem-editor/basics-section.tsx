import { DIFFICULTIES, LEVELS } from '#app/domain/authoring/definition.ts'
import { difficultyLabel, levelLabel, visibilityLabel } from '#app/lib/bank-labels.ts'
import { conventionText } from '#app/lib/conventions.ts'
import { fieldId } from '#app/lib/problem-form.ts'
import { VISIBILITIES } from '#app/lib/problem-schema.ts'
import { inputClass, type FieldKit } from './fields.tsx'

/** Title, tags, who can use the problem and its sign convention. */
export function BasicsSection({ kit }: { kit: FieldKit }) {
  const { v, describedBy, invalid, hasError, labelled, textInput } = kit
  return (
    <section aria-labelledby="basics-title" className="rounded-lg border border-line bg-white p-6 shadow-sm">
      <h2 id="basics-title" className="text-xl font-semibold">
        Basics
      </h2>
      <div className="mt-4 grid gap-4 md:grid-cols-2">
        <div className="md:col-span-2">{labelled('title', 'Title', textInput('title', { required: true }))}</div>
        {labelled(
          'tags.topics',
          'Topics',
          textInput('tags.topics', { hint: true, placeholder: 'e.g. otto, air standard' }),
          'Words separated by commas; they help colleagues find the problem.',
        )}
        {labelled(
          'tags.difficulty',
          'Difficulty',
          <select
            id={fieldId('tags.difficulty')}
            name="tags.difficulty"
            defaultValue={v('tags.difficulty') || 'standard'}
            aria-invalid={invalid('tags.difficulty')}
            aria-describedby={describedBy('tags.difficulty')}
            className={inputClass(hasError('tags.difficulty'))}
          >
            {DIFFICULTIES.map((d) => (
              <option key={d} value={d}>
                {difficultyLabel[d]}
              </option>
            ))}
          </select>,
        )}
        {labelled(
          'tags.level',
          'Level',
          <select
            id={fieldId('tags.level')}
            name="tags.level"
            defaultValue={v('tags.level') || 'second-year'}
            aria-invalid={invalid('tags.level')}
            aria-describedby={describedBy('tags.level')}
            className={inputClass(hasError('tags.level'))}
          >
            {LEVELS.map((l) => (
              <option key={l} value={l}>
                {levelLabel[l]}
              </option>
            ))}
          </select>,
        )}
        {labelled(
          'visibility',
          'Who can use it',
          <select
            id={fieldId('visibility')}
            name="visibility"
            defaultValue={v('visibility') || 'private'}
            aria-invalid={invalid('visibility')}
            aria-describedby={describedBy('visibility')}
            className={inputClass(hasError('visibility'))}
          >
            {VISIBILITIES.map((x) => (
              <option key={x} value={x}>
                {visibilityLabel[x]}
              </option>
            ))}
          </select>,
        )}
        {labelled(
          'convention',
          'Sign convention',
          <select
            id={fieldId('convention')}
            name="convention"
            defaultValue={v('convention') || 'course'}
            aria-invalid={invalid('convention')}
            aria-describedby={describedBy('convention', true)}
            className={inputClass(hasError('convention'))}
          >
            <option value="course">The course’s convention</option>
            <option value="engineering">
              {conventionText.engineering.label} ({conventionText.engineering.equation})
            </option>
            <option value="chemistry">
              {conventionText.chemistry.label} ({conventionText.chemistry.equation})
            </option>
          </select>,
          'With “the course’s convention” the problem follows each course it is assigned in, so one problem serves both; choose one convention to fix it everywhere.',
        )}
      </div>
    </section>
  )
}
