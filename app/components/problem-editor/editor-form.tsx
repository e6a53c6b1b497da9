import { useEffect, useId, useRef, useState } from 'react'
import { Form, useNavigation } from 'react-router'
import { Button } from '#app/components/ui/button.tsx'
import { fieldId, mergeIssues, type RowTable } from '#app/lib/problem-form.ts'
import { BasicsSection } from './basics-section.tsx'
import { ConstraintsSection } from './constraints-section.tsx'
import { fieldKit, FORM_ID, issuesByField } from './fields.tsx'
import { FindsSection } from './finds-section.tsx'
import { GivensSection } from './givens-section.tsx'
import type { ProblemEditorProps } from './index.tsx'
import { IssueSummary } from './issue-summary.tsx'
import { PhysicsSection } from './physics-section.tsx'
import { PromptSection } from './prompt-section.tsx'
import { SidePreview } from './side-preview.tsx'
import { useDraft } from './use-draft.ts'
import { useHydrated } from './use-hydrated.ts'
import { usePreview } from './use-preview.ts'
import { useRowRemoval, type OnRemoved } from './use-row-removal.tsx'

/** The form and the preview beside it, for one state of the editor. */
export function EditorForm({
  state,
  issues,
  options,
  preview,
  focusSummary,
  saveLabel,
  saveNote,
  focusTable,
  onRemoved,
}: ProblemEditorProps & {
  focusTable: RowTable | undefined
  onRemoved: OnRemoved
}) {
  const { values, rows } = state
  const hydrated = useHydrated()
  const busy = useNavigation().state === 'submitting'
  const formRef = useRef<HTMLFormElement>(null)
  const summaryRef = useRef<HTMLDivElement>(null)
  // Template inputs typed before a switch of template come back when a template with the
  // same input is chosen again (the inputs unmount while another template is shown).
  const typedInputs = useRef<Record<string, string>>({})
  const { draft, scheduleDraft } = useDraft(formRef)
  const [previewConvention, setPreviewConvention] = useState(values._previewConvention || 'engineering')
  const kit = fieldKit(values, issuesByField(issues), typedInputs)
  const { noteTyped, removeButton } = useRowRemoval(values, formRef, onRemoved)

  useEffect(() => {
    if (focusSummary) summaryRef.current?.focus()
  }, [focusSummary])
  useEffect(() => {
    // After a removal the focus goes to the table it was in (its section takes focus).
    if (focusTable) document.getElementById(fieldId(focusTable))?.focus()
  }, [focusTable])

  const courseConvention = (draft?.convention ?? values.convention) === 'course'
  const previewQuery = usePreview(draft, courseConvention ? previewConvention : undefined)
  const shownPreview = (hydrated ? previewQuery.data : undefined) ?? preview
  const previewIssues = mergeIssues(hydrated ? (draft?.formIssues ?? []) : [], shownPreview?.issues ?? [])
  // Light checks run on the draft in the browser (the insertable givens, the pitfalls each
  // find can recognise, the sense warnings); without JavaScript the server's lint decides.
  const draftDefinition = hydrated ? (draft?.definition ?? null) : null
  const datalistId = useId()

  return (
    // Wide screens: the editor takes the window's width (beyond the page column), form and
    // preview side by side, the preview sticky while the form scrolls.
    <div
      data-editor-layout
      className="flex flex-col gap-8 xl:mx-[calc(50%-50vw+1.5rem)] xl:grid xl:grid-cols-[minmax(0,2fr)_minmax(24rem,1fr)] xl:items-start"
    >
      {issues.length > 0 ? <IssueSummary issues={issues} summaryRef={summaryRef} /> : null}

      <Form
        id={FORM_ID}
        method="post"
        ref={formRef}
        onInput={(e) => {
          scheduleDraft()
          if (e.target instanceof HTMLInputElement) noteTyped(e.target)
        }}
        onChange={scheduleDraft}
        className="flex min-w-0 flex-col gap-8"
        noValidate
      >
        {values._basedOn ? (
          <input type="hidden" id={fieldId('_basedOn')} name="_basedOn" value={values._basedOn} />
        ) : null}
        <BasicsSection kit={kit} />
        <PromptSection
          kit={kit}
          state={state}
          draftGivens={hydrated ? (draft?.givens ?? null) : null}
          hydrated={hydrated}
        />
        <GivensSection kit={kit} state={state} hydrated={hydrated} removeButton={removeButton} />
        <ConstraintsSection kit={kit} rows={rows} removeButton={removeButton} />
        <PhysicsSection kit={kit} state={state} options={options} hydrated={hydrated} datalistId={datalistId} />
        <FindsSection
          kit={kit}
          state={state}
          options={options}
          hydrated={hydrated}
          datalistId={datalistId}
          draftDefinition={draftDefinition}
          visibility={draft?.visibility ?? ''}
          removeButton={removeButton}
        />

        <div className="flex flex-col gap-3">
          {saveNote}
          <div className="flex flex-wrap gap-3">
            <Button type="submit" name="intent" value="save" disabled={busy}>
              {busy ? 'Working…' : saveLabel}
            </Button>
            {hydrated ? null : (
              <Button type="submit" name="intent" value="preview" variant="secondary" formNoValidate>
                Preview variants
              </Button>
            )}
          </div>
        </div>
      </Form>

      <SidePreview
        hydrated={hydrated}
        previewQuery={previewQuery}
        shownPreview={shownPreview}
        previewIssues={previewIssues}
        courseConvention={courseConvention}
        previewConvention={previewConvention}
        setPreviewConvention={setPreviewConvention}
      />
    </div>
  )
}
