/**
 * The problem editor: one plain form whose field names are the definition's dotted paths
 * (app/lib/problem-form.ts), so it saves, adds rows, switches templates and previews without
 * JavaScript. With JavaScript it also drafts the definition from the form as the author
 * types and shows a live preview of a few seeded variants (POST /api/preview), removes a row
 * at once, and inserts a given's placeholder at the prompt's cursor.
 *
 * On wide screens (Tailwind's xl, 1280 px and up) the preview stays beside the form; below
 * that it follows the form.
 */
import { keepPreviousData, useQuery } from '@tanstack/react-query'
import { useEffect, useId, useRef, useState, type ReactNode } from 'react'
import { Form, useNavigation } from 'react-router'
import { Button } from '#app/components/ui/button.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { VariantPreview } from '#app/components/variant-preview.tsx'
import {
  DIFFICULTIES,
  FIND_SENSES,
  FIND_SENSE_WORDS,
  LEVELS,
  type ProblemDefinition,
} from '#app/domain/authoring/definition.ts'
import { placeholderText } from '#app/domain/authoring/placeholder-syntax.ts'
import { senseWarnings, type ProblemVisibility, type SenseFinding } from '#app/domain/authoring/sense.ts'
import { applicablePitfalls } from '#app/domain/grading/applicable-pitfalls.ts'
import { difficultyLabel, levelLabel, visibilityLabel } from '#app/lib/bank-labels.ts'
import { cn } from '#app/lib/cn.ts'
import { conventionText } from '#app/lib/conventions.ts'
import type { PreviewResult } from '#app/lib/preview.ts'
import {
  COMMON_OUTPUT_PATHS,
  CONSTRAINT_OPS,
  definitionFromForm,
  describeField,
  editorStateWithout,
  fieldId,
  fieldPathForIssue,
  findTemplate,
  GENERAL_CYCLE,
  mergeIssues,
  removeIntent,
  RULE_KINDS,
  type EditorOptions,
  type EditorState,
  type FormIssue,
  type RowTable,
} from '#app/lib/problem-form.ts'
import { VISIBILITIES } from '#app/lib/problem-schema.ts'

export interface ProblemEditorProps {
  readonly state: EditorState
  /** Issues from the last submission, shown beside their fields and in the summary. */
  readonly issues: readonly FormIssue[]
  readonly options: EditorOptions
  /** The preview the "Preview variants" button asked for (the page without JavaScript). */
  readonly preview: PreviewResult | null
  /** Move focus to the error summary when the page shows a refused save. */
  readonly focusSummary: boolean
  readonly saveLabel: string
  /** Shown above the save button (e.g. what saving a frozen version does). */
  readonly saveNote?: ReactNode
}

const RULE_WORDS: Record<(typeof RULE_KINDS)[number], string> = {
  range: 'Range',
  choice: 'One of a list',
  expression: 'Expression',
}
const OP_WORDS: Record<(typeof CONSTRAINT_OPS)[number], string> = {
  '<': '<',
  '<=': '≤',
  '>': '>',
  '>=': '≥',
  '!=': '≠',
}
const PREVIEW_DEBOUNCE_MS = 600
const FORM_ID = 'problem-form'

// Placeholder text is a hint, not a value: lighter and in italics, so an empty row never looks filled in.
const inputClass = (invalid: boolean) =>
  cn(
    'w-full min-w-0 rounded-md border bg-white px-2 py-1.5 text-sm shadow-sm placeholder:font-normal placeholder:italic placeholder:text-muted/70',
    invalid ? 'border-danger' : 'border-line focus:border-accent',
  )
const TABLE_WORDS: Record<RowTable, string> = { givens: 'given', constraints: 'constraint', finds: 'find' }

function useHydrated() {
  const [hydrated, setHydrated] = useState(false)
  useEffect(() => setHydrated(true), [])
  return hydrated
}

function issuesByField(issues: readonly FormIssue[]): Map<string, string[]> {
  const map = new Map<string, string[]>()
  for (const issue of issues) {
    const field = fieldPathForIssue(issue.path)
    const list = map.get(field) ?? []
    if (!list.includes(issue.message)) list.push(issue.message)
    map.set(field, list)
  }
  return map
}

function isPreviewResult(x: unknown): x is PreviewResult {
  return (
    typeof x === 'object' &&
    x !== null &&
    Array.isArray((x as PreviewResult).issues) &&
    Array.isArray((x as PreviewResult).variants)
  )
}

async function fetchPreview(
  definitionJson: string,
  convention: string | undefined,
  signal: AbortSignal,
): Promise<PreviewResult> {
  const response = await fetch('/api/preview', {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Accept: 'application/json' },
    body: JSON.stringify({ definition: JSON.parse(definitionJson) as unknown, ...(convention ? { convention } : {}) }),
    signal,
  })
  let body: unknown = null
  try {
    body = await response.json()
  } catch {
    // A non-JSON answer (a proxy's error page) is reported by status below.
  }
  if (!response.ok) {
    const message =
      typeof body === 'object' && body !== null && typeof (body as { error?: unknown }).error === 'string'
        ? (body as { error: string }).error
        : null
    throw new Error(message ?? `The preview could not be made just now (status ${response.status}).`)
  }
  if (!isPreviewResult(body))
    throw new Error('The preview came back in a form this page cannot read. Reload the page and try again.')
  return body
}

/**
 * The editor, remounted with a new state when a row is removed in the browser (the fields are
 * uncontrolled, so a remount is what refills them renumbered, exactly as the server would).
 */
export function ProblemEditor(props: ProblemEditorProps) {
  const [local, setLocal] = useState<{ state: EditorState; count: number; focus: RowTable; said: string } | null>(null)
  return (
    <>
      <p className="sr-only" aria-live="polite">
        {local?.said ?? ''}
      </p>
      <EditorForm
        key={local?.count ?? 0}
        {...props}
        state={local?.state ?? props.state}
        // Issues and a no-JavaScript preview name rows by their old numbers: they go with the removal.
        issues={local ? [] : props.issues}
        preview={local ? null : props.preview}
        focusSummary={local ? false : props.focusSummary}
        focusTable={local?.focus}
        onRemoved={(state, focus, said) => setLocal((l) => ({ state, count: (l?.count ?? 0) + 1, focus, said }))}
      />
    </>
  )
}

function EditorForm({
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
  onRemoved: (state: EditorState, focus: RowTable, said: string) => void
}) {
  const { values, rows } = state
  const hydrated = useHydrated()
  const busy = useNavigation().state === 'submitting'
  const formRef = useRef<HTMLFormElement>(null)
  const summaryRef = useRef<HTMLDivElement>(null)
  const timer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined)
  const [template, setTemplate] = useState(values['physics.template'] || 'otto')
  const [ruleKinds, setRuleKinds] = useState(() =>
    Array.from({ length: rows.givens }, (_, i) => values[`givens.${i}.rule.kind`] || 'range'),
  )
  const [sourceKinds, setSourceKinds] = useState(() =>
    Array.from({ length: rows.finds }, (_, i) => values[`finds.${i}.source.kind`] || 'output'),
  )
  const [toleranceKinds, setToleranceKinds] = useState(() =>
    Array.from({ length: rows.finds }, (_, i) => values[`finds.${i}.tolerance.kind`] || 'relative'),
  )
  // Template inputs typed before a switch of template come back when a template with the
  // same input is chosen again (the inputs unmount while another template is shown).
  const typedInputs = useRef<Record<string, string>>({})
  const [draft, setDraft] = useState<{
    json: string
    convention: string
    formIssues: FormIssue[]
    definition: ProblemDefinition
    visibility: string
  } | null>(null)
  const [previewConvention, setPreviewConvention] = useState(values._previewConvention || 'engineering')
  const errors = issuesByField(issues)

  function readDraft() {
    if (!formRef.current) return
    const { draft: d, formIssues, visibility } = definitionFromForm(new FormData(formRef.current))
    setDraft({
      json: JSON.stringify(d),
      convention: (d as { convention?: string }).convention ?? '',
      formIssues,
      definition: d as ProblemDefinition,
      visibility,
    })
  }
  function scheduleDraft() {
    clearTimeout(timer.current)
    timer.current = setTimeout(readDraft, PREVIEW_DEBOUNCE_MS)
  }
  useEffect(() => {
    readDraft()
    return () => clearTimeout(timer.current)
  }, [])
  useEffect(() => {
    if (focusSummary) summaryRef.current?.focus()
  }, [focusSummary])
  useEffect(() => {
    // After a removal the focus goes to the table it was in (its section takes focus).
    if (focusTable) document.getElementById(fieldId(focusTable))?.focus()
  }, [focusTable])
  // Row names as typed, so each "Remove" button names its row even before the draft catches up.
  const [typedNames, setTypedNames] = useState<Record<string, string>>({})
  const rowName = (table: RowTable, i: number) =>
    (typedNames[`${table}.${i}.name`] ?? values[`${table}.${i}.name`] ?? '').trim()
  const removeLabel = (table: RowTable, i: number) => {
    const name = table === 'constraints' ? '' : rowName(table, i)
    return name
      ? `Remove ${TABLE_WORDS[table]} ${name}`
      : `Remove ${TABLE_WORDS[table]} ${i + 1}${table === 'constraints' ? '' : ' (no name yet)'}`
  }
  const removeButton = (table: RowTable, i: number) => (
    <Button
      type="submit"
      name="intent"
      value={removeIntent(table, i)}
      variant="secondary"
      formNoValidate
      aria-label={removeLabel(table, i)}
      onClick={(e) => {
        if (!formRef.current) return
        e.preventDefault()
        const label = removeLabel(table, i).replace(/^Remove /, '')
        onRemoved(
          editorStateWithout(new FormData(formRef.current), table, i),
          table,
          `${label.charAt(0).toUpperCase()}${label.slice(1)} removed.`,
        )
      }}
    >
      Remove
    </Button>
  )
  const promptRef = useRef<HTMLTextAreaElement>(null)
  const [inserted, setInserted] = useState('')
  function insertAtCursor(text: string) {
    const area = promptRef.current
    if (!area) return
    const start = area.selectionStart ?? area.value.length
    const end = area.selectionEnd ?? start
    area.focus()
    area.setRangeText(text, start, end, 'end')
    // The form listens for input: the live preview picks the change up like typing.
    area.dispatchEvent(new Event('input', { bubbles: true }))
    setInserted(`Inserted ${text} into the prompt.`)
  }

  const courseConvention = (draft?.convention ?? values.convention) === 'course'
  const previewQuery = useQuery({
    queryKey: ['preview', draft?.json ?? null, courseConvention ? previewConvention : null],
    queryFn: ({ signal }) => fetchPreview(draft!.json, courseConvention ? previewConvention : undefined, signal),
    enabled: draft !== null,
    placeholderData: keepPreviousData,
    retry: false,
    staleTime: 60_000,
  })
  const shownPreview = (hydrated ? previewQuery.data : undefined) ?? preview
  const previewIssues = mergeIssues(hydrated ? (draft?.formIssues ?? []) : [], shownPreview?.issues ?? [])
  // Light checks run on the draft in the browser: which pitfalls can fire for each find, and
  // the sense warnings (a question's words against its key's sign). Without JavaScript every
  // pitfall is offered and the lint refuses one that cannot fire when saving.
  const draftDefinition = hydrated ? (draft?.definition ?? null) : null
  const offeredPitfalls = (i: number) => {
    if (draftDefinition === null) return options.pitfalls
    const fit = new Set<string>(applicablePitfalls(draftDefinition, i))
    return options.pitfalls.filter((pf) => fit.has(pf.id))
  }
  const warnings = new Map<string, string[]>()
  if (draftDefinition !== null) {
    let found: SenseFinding[] = []
    try {
      found = Array.isArray(draftDefinition.finds)
        ? senseWarnings(draftDefinition, { visibility: draft!.visibility as ProblemVisibility })
        : []
    } catch {
      found = []
    }
    for (const w of found) warnings.set(w.path, [...(warnings.get(w.path) ?? []), w.message])
  }

  // ---- field helpers (plain functions returning JSX, so no remounts) ------------------
  const v = (path: string) => values[path] ?? ''
  const describedBy = (path: string, hint?: boolean) =>
    [hint ? `${fieldId(path)}-hint` : null, errors.has(path) ? `${fieldId(path)}-error` : null]
      .filter(Boolean)
      .join(' ') || undefined
  const invalid = (path: string) => (errors.has(path) ? true : undefined)
  const errorText = (path: string) =>
    errors.has(path) ? (
      <p id={`${fieldId(path)}-error`} className="text-xs text-danger">
        {errors.get(path)!.join(' ')}
      </p>
    ) : null
  const labelled = (path: string, label: ReactNode, control: ReactNode, hint?: ReactNode) => (
    <div className="flex min-w-0 flex-col gap-1">
      <label htmlFor={fieldId(path)} className="text-sm font-medium">
        {label}
      </label>
      {control}
      {hint ? (
        <p id={`${fieldId(path)}-hint`} className="text-xs text-muted">
          {hint}
        </p>
      ) : null}
      {errorText(path)}
    </div>
  )
  const textInput = (
    path: string,
    extra: {
      ariaLabel?: string
      placeholder?: string
      hint?: boolean
      list?: string
      inputMode?: 'decimal' | 'numeric'
      required?: boolean
      remember?: boolean
    } = {},
  ) => (
    <input
      id={fieldId(path)}
      name={path}
      defaultValue={extra.remember ? (typedInputs.current[path] ?? v(path)) : v(path)}
      onChange={extra.remember ? (e) => (typedInputs.current[path] = e.target.value) : undefined}
      aria-label={extra.ariaLabel}
      aria-invalid={invalid(path)}
      aria-describedby={describedBy(path, extra.hint)}
      placeholder={extra.placeholder}
      list={extra.list}
      inputMode={extra.inputMode}
      required={extra.required}
      className={inputClass(errors.has(path))}
    />
  )
  const cellInput = (path: string, ariaLabel: string, placeholder?: string, inputMode?: 'decimal') => (
    <td className="px-1 py-1 align-top">
      {textInput(path, { ariaLabel, placeholder, inputMode })}
      {errorText(path)}
    </td>
  )

  const chosen = template === GENERAL_CYCLE ? undefined : findTemplate(options, template)
  const templateInputNames = new Set(chosen?.inputs.map((i) => i.name) ?? [])
  const leftoverInputs = Object.keys(values)
    .filter(
      (k) =>
        k.startsWith('physics.inputs.') &&
        values[k] !== '' &&
        !templateInputNames.has(k.slice('physics.inputs.'.length)),
    )
    .map((k) => k.slice('physics.inputs.'.length))
  const givenNames = Array.from({ length: rows.givens }, (_, i) => values[`givens.${i}.name`]).filter(
    (n): n is string => Boolean(n),
  )
  const datalistId = useId()

  const promptGivens = (
    draftDefinition && Array.isArray(draftDefinition.givens)
      ? draftDefinition.givens.map((g) => ({
          name: typeof g?.name === 'string' ? g.name : '',
          label: typeof g?.label === 'string' ? g.label : '',
        }))
      : Array.from({ length: rows.givens }, (_, i) => ({
          name: (values[`givens.${i}.name`] ?? '').trim(),
          label: (values[`givens.${i}.label`] ?? '').trim(),
        }))
  ).filter((g) => /^[A-Za-z][A-Za-z0-9_]{0,31}$/.test(g.name))

  return (
    // Wide screens: the editor takes the window's width (beyond the page column), form and
    // preview side by side, the preview sticky while the form scrolls.
    <div
      data-editor-layout
      className="flex flex-col gap-8 xl:mx-[calc(50%-50vw+1.5rem)] xl:grid xl:grid-cols-[minmax(0,2fr)_minmax(24rem,1fr)] xl:items-start"
    >
      {issues.length > 0 ? (
        <div
          ref={summaryRef}
          tabIndex={-1}
          aria-labelledby="editor-issues-title"
          className="rounded-md border border-danger/30 bg-danger-soft px-4 py-3 text-sm text-danger xl:col-span-2"
        >
          <h2 id="editor-issues-title" className="font-semibold">
            Nothing was saved: {issues.length === 1 ? 'one thing needs' : `${issues.length} things need`} your attention
          </h2>
          <ul className="mt-2 list-disc pl-5">
            {issues.map((issue, i) => (
              <li key={i}>
                <a
                  href={`#${fieldId(fieldPathForIssue(issue.path))}`}
                  className="text-danger underline"
                  onClick={(e) => {
                    const target = document.getElementById(fieldId(fieldPathForIssue(issue.path)))
                    if (!target) return
                    e.preventDefault()
                    target.scrollIntoView({ block: 'center' })
                    target.focus()
                  }}
                >
                  {describeField(issue.path)}
                </a>
                : {issue.message}
              </li>
            ))}
          </ul>
        </div>
      ) : null}

      <Form
        id={FORM_ID}
        method="post"
        ref={formRef}
        onInput={(e) => {
          scheduleDraft()
          const t = e.target as HTMLInputElement
          if (/^(givens|finds)\.\d+\.name$/.test(t.name ?? '')) setTypedNames((n) => ({ ...n, [t.name]: t.value }))
        }}
        onChange={scheduleDraft}
        className="flex min-w-0 flex-col gap-8"
        noValidate
      >
        {values._basedOn ? (
          <input type="hidden" id={fieldId('_basedOn')} name="_basedOn" value={values._basedOn} />
        ) : null}
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
                className={inputClass(errors.has('tags.difficulty'))}
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
                className={inputClass(errors.has('tags.level'))}
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
                className={inputClass(errors.has('visibility'))}
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
                className={inputClass(errors.has('convention'))}
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

        <section aria-labelledby="prompt-title" className="rounded-lg border border-line bg-white p-6 shadow-sm">
          <h2 id="prompt-title" className="text-xl font-semibold">
            Prompt
          </h2>
          <div className="mt-4 grid gap-4 lg:grid-cols-[minmax(0,1fr)_14rem]">
            {labelled(
              'prompt',
              'What students read',
              <textarea
                ref={promptRef}
                id={fieldId('prompt')}
                name="prompt"
                rows={8}
                defaultValue={v('prompt')}
                aria-invalid={invalid('prompt')}
                aria-describedby={describedBy('prompt', true)}
                className={cn(inputClass(errors.has('prompt')), 'font-mono')}
              />,
              <>
                Markdown. <code>[T1]</code> shows a given with its unit, <code>[p1 in kPa]</code> converts it,{' '}
                <code>[r, 3 sf]</code> or <code>[r, 2 dp]</code> rounds it; <code>\[</code> is a bracket that is only a
                bracket. Math goes between <code>$…$</code> (inline) or <code>$$…$$</code> (display). More in the{' '}
                <a href="/help/authoring#placeholders">author guide</a>.
              </>,
            )}
            <div
              role="group"
              aria-labelledby="insert-given-title"
              aria-describedby="insert-given-hint"
              className="flex flex-col gap-1"
            >
              <h3 id="insert-given-title" className="text-sm font-medium">
                Insert a given
              </h3>
              <p id="insert-given-hint" className="text-xs text-muted">
                {hydrated ? 'Puts its placeholder at the cursor in the prompt.' : 'Copy a placeholder into the prompt.'}
              </p>
              {promptGivens.length === 0 ? (
                <p className="text-xs text-muted">Name a given below and it shows here.</p>
              ) : (
                <ul className="flex flex-col gap-1">
                  {promptGivens.map((g) => {
                    const text = placeholderText(g.name)
                    const label = g.label ? <span className="truncate text-xs text-muted">{g.label}</span> : null
                    return (
                      <li key={g.name}>
                        {hydrated ? (
                          <button
                            type="button"
                            onClick={() => insertAtCursor(text)}
                            className="flex w-full min-w-0 items-baseline gap-2 rounded-md border border-line bg-white px-2 py-1 text-left text-sm hover:bg-paper focus-visible:outline-2 focus-visible:outline-accent"
                          >
                            <span className="sr-only">Insert </span>
                            <code>{text}</code>
                            {label}
                          </button>
                        ) : (
                          <span className="flex min-w-0 items-baseline gap-2 px-2 py-1 text-sm">
                            <code className="select-all">{text}</code>
                            {label}
                          </span>
                        )}
                      </li>
                    )
                  })}
                </ul>
              )}
              <p className="sr-only" aria-live="polite">
                {inserted}
              </p>
            </div>
          </div>
        </section>

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
                          className={inputClass(errors.has(`${p}.rule.kind`))}
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
            Combinations of givens a variant must satisfy; others are drawn again. Both sides may use givens and units
            (“TH − TL” ≥ “100 K”).
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
                          className={inputClass(errors.has(`${p}.op`))}
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
          <Button
            type="submit"
            name="intent"
            value="add-constraint"
            variant="secondary"
            className="mt-3"
            formNoValidate
          >
            Add a constraint
          </Button>
        </section>

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
                  className={inputClass(errors.has('physics.template'))}
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
                  className={cn(inputClass(errors.has('physics.cycle')), 'font-mono')}
                />,
                <>
                  The <code>cycle</code> object of a spec file: gas, system, amount, states and steps
                  (docs/spec-format.md). A text that is exactly a given’s name becomes that given’s value with its unit;{' '}
                  <code>@{'{name}'}</code> works inside longer texts (in the physics only; the prompt writes{' '}
                  <code>[name]</code>).
                </>,
              )}
            </div>
          ) : (
            <div className="mt-4">
              {chosen ? <p className="text-sm text-muted">{chosen.description}</p> : null}
              <p className="mt-2 text-sm text-muted">
                Each input takes a given’s name{givenNames.length > 0 ? ` (${givenNames.join(', ')})` : ''}, or a fixed
                value with its unit such as “100 kPa”; leave optional inputs empty.
              </p>
              <div className="mt-3 grid gap-4 md:grid-cols-2">
                {chosen?.inputs.map((input) => {
                  const path = `physics.inputs.${input.name}`
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
          )}
        </section>

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
            {Array.from({ length: rows.finds }, (_, i) => {
              const p = `finds.${i}`
              const n = i + 1
              const source = sourceKinds[i] ?? 'output'
              const tolerance = toleranceKinds[i] ?? 'relative'
              const picked = new Set((values[`${p}.pitfalls`] ?? '').split(',').filter(Boolean))
              const offered = offeredPitfalls(i)
              const senseNotes = warnings.get(`${p}.sense`) ?? []
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
                        onChange={(e) => {
                          const next = [...sourceKinds]
                          next[i] = e.target.value
                          setSourceKinds(next)
                        }}
                        aria-invalid={invalid(`${p}.source.kind`)}
                        aria-describedby={describedBy(`${p}.source.kind`)}
                        className={inputClass(errors.has(`${p}.source.kind`))}
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
                    {labelled(
                      `${p}.points`,
                      'Points',
                      textInput(`${p}.points`, { inputMode: 'decimal', placeholder: 'e.g. 1' }),
                    )}
                    {labelled(
                      `${p}.tolerance.kind`,
                      'Tolerance',
                      <select
                        id={fieldId(`${p}.tolerance.kind`)}
                        name={`${p}.tolerance.kind`}
                        defaultValue={tolerance}
                        onChange={(e) => {
                          const next = [...toleranceKinds]
                          next[i] = e.target.value
                          setToleranceKinds(next)
                        }}
                        aria-invalid={invalid(`${p}.tolerance.kind`)}
                        aria-describedby={describedBy(`${p}.tolerance.kind`)}
                        className={inputClass(errors.has(`${p}.tolerance.kind`))}
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
                            [
                              describedBy(`${p}.sense`, true),
                              senseNotes.length > 0 ? `${fieldId(`${p}.sense`)}-warning` : null,
                            ]
                              .filter(Boolean)
                              .join(' ') || undefined
                          }
                          className={inputClass(errors.has(`${p}.sense`))}
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
                  <fieldset
                    id={fieldId(`${p}.pitfalls`)}
                    tabIndex={-1}
                    aria-describedby={errors.has(`${p}.pitfalls`) ? `${fieldId(`${p}.pitfalls`)}-error` : undefined}
                    className="mt-3"
                  >
                    <legend className="text-sm font-medium">Pitfalls to recognise in wrong answers</legend>
                    <div className="mt-1 grid gap-1 text-sm sm:grid-cols-2">
                      {offered.length === 0 ? (
                        <p className="text-muted">
                          None can be recognised for this find (pitfalls need a solver output).
                        </p>
                      ) : null}
                      {offered.map((pf) => (
                        <label key={pf.id} className="flex items-center gap-2">
                          <input
                            type="checkbox"
                            name={`${p}.pitfalls`}
                            value={pf.id}
                            defaultChecked={picked.has(pf.id)}
                            className="size-4"
                          />
                          {pf.title}
                        </label>
                      ))}
                    </div>
                    {(() => {
                      const dropped = options.pitfalls.filter(
                        (pf) => picked.has(pf.id) && !offered.some((o) => o.id === pf.id),
                      )
                      return dropped.length > 0 ? (
                        <p className="mt-1 text-xs text-warn">
                          Ticked before but never recognised for this find, so saving drops it:{' '}
                          {dropped.map((pf) => pf.title).join(', ')}.
                        </p>
                      ) : null
                    })()}
                    {errorText(`${p}.pitfalls`)}
                  </fieldset>
                  <div className="mt-3">{removeButton('finds', i)}</div>
                </fieldset>
              )
            })}
          </div>
          <Button type="submit" name="intent" value="add-find" variant="secondary" className="mt-3" formNoValidate>
            Add a find
          </Button>
        </section>

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

      <section
        id="preview"
        aria-labelledby="preview-title"
        className="flex min-w-0 flex-col gap-3 xl:sticky xl:top-4 xl:max-h-[calc(100vh-2rem)] xl:overflow-y-auto xl:rounded-lg xl:border xl:border-line xl:bg-white xl:p-4 xl:shadow-sm"
      >
        <h2 id="preview-title" className="text-xl font-semibold">
          Preview
        </h2>
        <p className="text-sm text-muted">
          {hydrated
            ? 'A few seeded variants, as students would see them, updated as you type.'
            : 'Press “Preview variants” (below the form) to see a few seeded variants as students would see them.'}
        </p>
        {courseConvention ? (
          <div className="flex items-center gap-2 text-sm">
            <label htmlFor="preview-convention">Preview in</label>
            <select
              id="preview-convention"
              form={FORM_ID}
              name="_previewConvention"
              value={previewConvention}
              onChange={(e) => setPreviewConvention(e.target.value)}
              className="rounded-md border border-line bg-white px-2 py-1"
            >
              <option value="engineering">{conventionText.engineering.label}</option>
              <option value="chemistry">{conventionText.chemistry.label}</option>
            </select>
          </div>
        ) : null}
        <p aria-live="polite" className="min-h-5 text-sm text-muted">
          {hydrated && previewQuery.isFetching ? 'Updating preview…' : ''}
        </p>
        {hydrated && previewQuery.isError ? <Notice tone="error">{previewQuery.error.message}</Notice> : null}
        {previewIssues.length > 0 ? (
          <Notice tone="warn">
            <p className="font-semibold">The problem is not finished yet</p>
            <ul className="mt-1 list-disc pl-5">
              {previewIssues.map((issue, i) => (
                <li key={i}>
                  <a href={`#${fieldId(fieldPathForIssue(issue.path))}`}>{describeField(issue.path)}</a>:{' '}
                  {issue.message}
                </li>
              ))}
            </ul>
          </Notice>
        ) : null}
        {shownPreview ? <VariantPreview variants={shownPreview.variants} /> : null}
      </section>
    </div>
  )
}
