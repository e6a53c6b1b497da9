/**
 * The editor's field helpers: plain functions returning JSX (not components, so a re-render
 * never remounts an uncontrolled field), bound to the typed values and the issues of the
 * last submission.
 */
import type { ReactNode, RefObject } from 'react'
import { cn } from '#app/lib/cn.ts'
import { fieldId, fieldPathForIssue, type FormIssue } from '#app/lib/problem-form.ts'

export const FORM_ID = 'problem-form'

// Placeholder text is a hint, not a value: lighter and in italics, so an empty row never looks filled in.
export const inputClass = (invalid: boolean) =>
  cn(
    'w-full min-w-0 rounded-md border bg-white px-2 py-1.5 text-sm shadow-sm placeholder:font-normal placeholder:text-muted/70 placeholder:italic',
    invalid ? 'border-danger' : 'border-line focus:border-accent',
  )

export function issuesByField(issues: readonly FormIssue[]): Map<string, string[]> {
  const map = new Map<string, string[]>()
  for (const issue of issues) {
    const field = fieldPathForIssue(issue.path)
    const list = map.get(field) ?? []
    if (!list.includes(issue.message)) list.push(issue.message)
    map.set(field, list)
  }
  return map
}

export interface TextInputOptions {
  ariaLabel?: string
  placeholder?: string
  hint?: boolean
  list?: string
  inputMode?: 'decimal' | 'numeric'
  required?: boolean
  /** Keep what was typed across a template switch (the template's inputs unmount meanwhile). */
  remember?: boolean
}

export type FieldKit = ReturnType<typeof fieldKit>

export function fieldKit(
  values: Readonly<Record<string, string>>,
  errors: Map<string, string[]>,
  typedInputs: RefObject<Record<string, string>>,
) {
  const v = (path: string) => values[path] ?? ''
  const describedBy = (path: string, hint?: boolean) =>
    [hint ? `${fieldId(path)}-hint` : null, errors.has(path) ? `${fieldId(path)}-error` : null]
      .filter(Boolean)
      .join(' ') || undefined
  const invalid = (path: string) => (errors.has(path) ? true : undefined)
  const hasError = (path: string) => errors.has(path)
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
  const textInput = (path: string, extra: TextInputOptions = {}) => (
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
  return { v, describedBy, invalid, hasError, errorText, labelled, textInput, cellInput }
}
