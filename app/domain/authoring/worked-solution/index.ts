/**
 * The worked solution of one variant: the givens as drawn, the sign convention, each state and
 * step with its relations and the variant's numbers substituted, the cycle totals, and the key.
 * Every number comes from the variant's solution (or its spec, for a step's n, η or ε), so
 * the derivation and the key cannot disagree. Numbers are shown to 4 significant figures in
 * the units a student writes (kPa or MPa, K, kJ/kg, kJ/(kg·K), m³/kg).
 *
 * Symbols follow the convention: chemistry writes q and w (w done ON the system, ΔU = q + w),
 * engineering writes Q and W (W done BY the system, ΔU = Q − W). Pure.
 */
import { type ProblemDefinition, type Variant } from '../definition.ts'
import { escapeHtml, renderMath } from '../prompt.ts'
import { splitIdentifiers } from '../quantities.ts'
import {
  isCalorimeterSolution,
  isCascadeSolution,
  isCombinedSolution,
  isIdealGasSolution,
  isRankineSolution,
  isRefrigerationSolution,
  isSteadyFlowSolution,
  isSteamCycleSolution,
  isTwoStageSolution,
} from '../solution-kind.ts'
import { kineticEnergyLine, steadyFlowSections } from './steady-flow.ts'
import { calorimeterSections } from './calorimeter.ts'
import { steamCycleSections } from './steam-cycle.ts'
import type { WorkedSection, WorkedSolution } from './types.ts'
import { conventionSection, symbolsFor } from './common.ts'
import { idealGasSections } from './ideal-gas.ts'
import { rankineSections } from './rankine.ts'
import { refrigerationSections } from './refrigeration.ts'
import { cascadeSections, twoStageSections } from './multi-stage-refrigeration.ts'
import { givensSection, keySection } from './key.ts'
import { combinedSections } from './combined.ts'

export type { WorkedLine, WorkedSection, WorkedSolution } from './types.ts'
export { WORKED_SIG_FIGS } from './types.ts'
export { n4, q4, pressureTex, texName } from './common.ts'
export { shortSource } from './refrigeration.ts'

/** The step-by-step solution of one variant. */
export function workedSolution(variant: Variant, def: ProblemDefinition): WorkedSolution {
  const sol = variant.solution
  const convention = sol.convention.name
  const sym = symbolsFor(convention)
  let conv: { text: string; section: WorkedSection }
  let physics: WorkedSection[]
  let caution: string | undefined
  if (isRefrigerationSolution(sol)) {
    conv = conventionSection(convention, true, 'refrigerant')
    physics = refrigerationSections(sol, variant, sym)
    caution = sol.notice
  } else if (isTwoStageSolution(sol)) {
    conv = conventionSection(convention, true, 'refrigerant')
    physics = twoStageSections(sol, variant, sym)
    caution = sol.notice
  } else if (isCascadeSolution(sol)) {
    conv = conventionSection(convention, true, 'refrigerant')
    physics = cascadeSections(sol, variant, sym)
    caution = sol.notice
  } else if (isSteadyFlowSolution(sol)) {
    const base = conventionSection(convention, true)
    conv = { text: base.text, section: { ...base.section, lines: [...base.section.lines, kineticEnergyLine(sym)] } }
    physics = steadyFlowSections(sol, variant, sym)
    caution = sol.notice
  } else if (isCombinedSolution(sol)) {
    conv = conventionSection(convention, true, 'working fluid')
    physics = combinedSections(sol, variant, sym)
    caution = sol.notice
  } else if (isCalorimeterSolution(sol)) {
    conv = conventionSection(convention, true, 'steam')
    physics = calorimeterSections(sol)
    caution = sol.notice
  } else if (isSteamCycleSolution(sol)) {
    conv = conventionSection(convention, sol.system === 'flow', 'water')
    physics = steamCycleSections(sol, sym)
    caution = sol.notice
  } else if (isRankineSolution(sol)) {
    conv = conventionSection(convention, true)
    physics = rankineSections(sol, variant, sym)
    caution = sol.notice
  } else if (isIdealGasSolution(sol)) {
    conv = conventionSection(convention, sol.system === 'flow')
    physics = idealGasSections(sol, variant, sym)
  } else {
    conv = conventionSection(convention, false)
    physics = []
  }
  return {
    convention: conv.text,
    sections: [givensSection(variant, def), conv.section, ...physics, keySection(variant, def)],
    ...(caution !== undefined ? { caution } : {}),
  }
}

/** A note as HTML: plain text, with any identifier a student should see typeset (T_H) as math. */
function noteHtml(note: string): string {
  return splitIdentifiers(note)
    .map((p) => (p.tex !== undefined ? renderMath(p.tex, false).html : escapeHtml(p.text ?? '')))
    .join('')
}

/** A worked solution as HTML: KaTeX with MathML for every line, notes as text. */
export function renderWorkedSolution(ws: WorkedSolution): string {
  const parts: string[] = ['<div class="worked-solution">']
  parts.push(`<p class="worked-convention">${escapeHtml(ws.convention)}</p>`)
  for (const section of ws.sections) {
    parts.push(`<section><h3>${escapeHtml(section.title)}</h3><ul>`)
    for (const line of section.lines) {
      const math = line.tex ? `<span class="worked-math">${renderMath(line.tex, false).html}</span> ` : ''
      parts.push(`<li>${math}${line.note ? `<span class="worked-note">${noteHtml(line.note)}</span>` : ''}</li>`)
    }
    parts.push('</ul></section>')
  }
  if (ws.caution) parts.push(`<p class="worked-caution" role="note">${escapeHtml(ws.caution)}</p>`)
  parts.push('</div>')
  return parts.join('')
}
