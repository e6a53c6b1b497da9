/**
 * The editor offers exactly the templates bank problems may use (the catalog's bank flag),
 * grouped by family, and every demo problem's template and inputs are among them — so an
 * author opening a demo problem never sees "not a known template" or an input flagged as
 * foreign to its template.
 */
import { describe, expect, test } from 'vitest'
import { bankTemplateIds } from '#app/domain/thermo/catalog.ts'
import { findTemplate } from '#app/lib/problem-form.ts'
import { editorOptions } from '#app/server/problem-editor.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'

describe('the editor’s template choices', () => {
  const options = editorOptions()
  const offered = options.templateGroups.flatMap((g) => g.templates.map((t) => t.id))

  test('are the bank templates, each once, and nothing else', () => {
    expect([...offered].sort()).toEqual([...bankTemplateIds()].sort())
    expect(new Set(offered).size).toBe(offered.length)
  })

  test('group the refrigerator under Refrigeration and leave out families with no bank template', () => {
    const refrigeration = options.templateGroups.find((g) => g.label === 'Refrigeration')
    expect(refrigeration?.templates.map((t) => t.id)).toContain('vapour-compression')
    expect(options.templateGroups.every((g) => g.templates.length > 0)).toBe(true)
  })

  test.each(DEMO_PROBLEMS.map((p) => [p.definition.title, p.definition] as const))(
    'include the template and inputs of the demo problem “%s”',
    (_title, def) => {
      if (def.physics.kind !== 'template') return
      const chosen = findTemplate(options, def.physics.template)
      expect(chosen, def.physics.template).toBeDefined()
      const names = new Set(chosen!.inputs.map((i) => i.name))
      for (const name of Object.keys(def.physics.inputs)) expect(names.has(name), name).toBe(true)
    },
  )
})
