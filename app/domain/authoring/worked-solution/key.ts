/** The givens as drawn and the answer key, with each find's expression or solver quantity. Pure. */
import type { MathNode } from 'mathjs'
import { mathCore } from '#app/domain/grading/math-instance.ts'
import { FIND_SENSE_WORDS, type Find, type ProblemDefinition, type Variant } from '../definition.ts'
import { formatGivenValue } from '../placeholders.ts'
import { quantityAtPath, symbolTex } from '../quantities.ts'
import { isCombinedSolution, isRankineSolution, isSteadyFlowSolution, isSteamCycleSolution } from '../solution-kind.ts'
import type { WorkedLine, WorkedSection } from './types.ts'
import { q4, texName } from './common.ts'

// ---- Givens and key -----------------------------------------------------------------

export function givensSection(variant: Variant, def: ProblemDefinition): WorkedSection {
  const lines: WorkedLine[] = variant.givens.map((g) => {
    const display = def.givens.find((d) => d.name === g.name)?.display
    const shown = formatGivenValue(g, display, { tex: true })
    // A given drawn as words (a kind of gas) reads as words: its label and its text.
    if (!shown.ok || Number.isNaN(g.value)) return { tex: '', note: `${g.label}: ${g.text}` }
    return { tex: `${texName(g.name)} = ${shown.text}`, note: g.label }
  })
  return { title: 'Given', lines }
}

/**
 * An expression as TeX with every name typeset (eta * 100 → \eta \cdot 100), or, with
 * `values`, every given and earlier find replaced by its number and unit. Null when the
 * expression does not parse (the caller then shows only the result).
 */
function expressionTex(
  expression: string,
  values?: ReadonlyMap<string, { value: number; unit: string }>,
): string | null {
  try {
    const node = mathCore.parse(expression)
    return node.toTex({
      handler: (n: MathNode) => {
        if (!isSymbolNode(n)) return undefined
        const v = values?.get(n.name)
        if (v) return `\\left(${q4(v.value, v.unit)}\\right)`
        return symbolTex(n.name)
      },
    })
  } catch {
    return null
  }
}

function isSymbolNode(n: MathNode): n is MathNode & { name: string } {
  return n.type === 'SymbolNode'
}

export function keySection(variant: Variant, def: ProblemDefinition): WorkedSection {
  const values = new Map<string, { value: number; unit: string }>()
  for (const g of variant.givens) if (!Number.isNaN(g.value)) values.set(g.name, { value: g.value, unit: g.unit })
  const stateNames = 'states' in variant.solution ? variant.solution.states.map((s) => s.name) : undefined
  const deviceNames = 'devices' in variant.solution ? variant.solution.devices.map((d) => d.device) : undefined
  const ctx = {
    convention: variant.solution.convention.name,
    steam: isRankineSolution(variant.solution),
    ...(isSteadyFlowSolution(variant.solution) ? { flow: variant.solution.template } : {}),
    ...(isCombinedSolution(variant.solution) ? { combined: true } : {}),
    ...(isSteamCycleSolution(variant.solution) ? { fluid: 'water' } : {}),
    ...(stateNames ? { stateNames } : {}),
    ...(deviceNames ? { deviceNames } : {}),
  }
  const plain = (tex: string) => tex.replace(/\\text\{([^}]*)\}/g, '$1').replace(/[{}]/g, '')
  const lines: WorkedLine[] = []
  for (const k of variant.key) {
    const find: Find | undefined = def.finds.find((f) => f.name === k.name)
    const value = q4(k.value, k.unit)
    const symbol = symbolTex(k.name)
    if (find?.source.kind === 'expression') {
      const general = expressionTex(find.source.expression)
      const numbers = expressionTex(find.source.expression, values)
      const middle = general && numbers ? ` = ${general} = ${numbers}` : ''
      lines.push({ tex: `${symbol}${middle} = ${value}`, note: `${k.label} (${k.points} pt)` })
    } else {
      // The solver's quantity by its own symbol when it differs from the find's (q_H = Q_{12}).
      const q = k.path ? quantityAtPath(k.path, ctx) : null
      // A find named wNet in an engineering course reads W_net: the convention's case wins.
      const sameName = q !== null && plain(q.tex).toLowerCase() === plain(symbol).toLowerCase()
      // A find whose stated sense is the opposite of the solver's quantity in this course is
      // that quantity negated (−w_net when the question asks for the work done by the gas in a
      // course where w is work done on it).
      const solverTex = q ? (k.flipped ? `-${q.tex}` : q.tex) : null
      const lead = q && sameName ? solverTex : symbol
      const senseNote = find?.sense ? `, ${FIND_SENSE_WORDS[find.sense]}` : ''
      const quantityNote = q && (!sameName || k.flipped) ? `: ${k.flipped ? 'minus ' : ''}the ${q.name}` : ''
      lines.push({
        tex: `${lead}${q && !sameName ? ` = ${solverTex}` : ''} = ${value}`,
        note: `${k.label} (${k.points} pt)${senseNote}${quantityNote}`,
      })
    }
    values.set(k.name, { value: k.value, unit: k.unit })
  }
  return { title: 'Answers', lines }
}
