import { describe, expect, test } from 'vitest'
import { quantityAtPath, splitIdentifiers, symbolTex } from './quantities.ts'

describe('symbolTex: a given or find name as students see it', () => {
  test.each([
    ['T3', 'T_{3}'],
    ['W_net', 'W_{\\text{net}}'],
    ['r_c', 'r_{c}'],
    ['eta', '\\eta'],
    ['etaT', '\\eta_{T}'],
    ['eps', '\\varepsilon'],
    ['wNet', 'w_{\\text{net}}'],
    ['qH', 'q_{H}'],
    ['qin', 'q_{\\text{in}}'],
    ['rc', 'r_{c}'],
    ['pB', 'p_{B}'],
    ['wAB', 'w_{AB}'],
    ['cop', '\\mathrm{COP}'],
    ['mep', '\\mathrm{MEP}'],
    ['bwr', '\\mathrm{bwr}'],
    ['η_t', '\\eta_{t}'],
    ['gas', '\\mathrm{gas}'],
    ['lift', '\\mathrm{lift}'],
  ])('%s → %s', (name, tex) => {
    expect(symbolTex(name)).toBe(tex)
  })
})

describe('quantityAtPath: a solver output by its grammar, never the path itself', () => {
  test('totals follow the convention', () => {
    expect(quantityAtPath('totals.netWork', { convention: 'engineering' })).toEqual({
      tex: 'W_{\\text{net}}',
      name: 'net work done by the gas per unit amount',
    })
    expect(quantityAtPath('totals.netWork', { convention: 'chemistry' })?.tex).toBe('w_{\\text{net}}')
    expect(quantityAtPath('totals.heatIn', { convention: 'chemistry' })).toEqual({
      tex: 'q_{\\text{in}}',
      name: 'heat added per unit amount',
    })
    expect(quantityAtPath('totals.efficiency', { convention: 'chemistry' })?.tex).toBe('\\eta')
    expect(quantityAtPath('totals.total.netWork', { convention: 'engineering' })?.name).toBe(
      'net work done by the gas for the whole amount',
    )
    expect(quantityAtPath('totals.netWork', { convention: 'engineering', steam: true })?.name).toBe(
      'net work delivered per kg through the boiler',
    )
  })
  test('states and steps take the state names as subscripts', () => {
    expect(quantityAtPath('states.3.T', { convention: 'engineering' })).toEqual({
      tex: 'T_{3}',
      name: 'temperature at state 3',
    })
    const names = ['A', 'B', 'C']
    expect(quantityAtPath('steps.2.q', { convention: 'engineering', stateNames: names })).toEqual({
      tex: 'Q_{BC}',
      name: 'heat of step B → C, per unit amount',
    })
    expect(quantityAtPath('steps.3.total.w', { convention: 'chemistry', stateNames: names })?.tex).toBe('w_{CA}')
  })
  test('an unknown path is null, so the caller falls back to the find’s own name', () => {
    expect(quantityAtPath('totals.nothing', { convention: 'engineering' })).toBeNull()
    expect(quantityAtPath('states.x.T', { convention: 'engineering' })).toBeNull()
    expect(quantityAtPath('gas.R', { convention: 'engineering' })).toBeNull()
  })
})

test('splitIdentifiers typesets T_H in a label and leaves words alone', () => {
  expect(splitIdentifiers('Heat taken in at T_H, per mole')).toEqual([
    { text: 'Heat taken in at ' },
    { tex: 'T_{H}' },
    { text: ', per mole' },
  ])
  expect(splitIdentifiers('compression ratio V1/V2')).toEqual([{ text: 'compression ratio V1/V2' }])
})

test('second-law paths read as symbols and names (entropy generated, exergy destroyed, η_II, rates)', () => {
  const ctx = { convention: 'engineering' as const, stateNames: ['1', '2', '3', '4'] }
  expect(quantityAtPath('steps.2.entropyGenerated', ctx)).toEqual({
    tex: '{S_{\\text{gen}}}_{23}',
    name: 'entropy generated of step 2 → 3, per unit amount',
  })
  expect(quantityAtPath('steps.4.total.exergyDestroyed', ctx)?.tex).toBe('{X_{\\text{dest}}}_{41}')
  expect(quantityAtPath('totals.exergyDestroyed', ctx)?.name).toBe('exergy destroyed per cycle, per unit amount')
  expect(quantityAtPath('totals.total.exergyDestroyed', ctx)?.name).toBe(
    'exergy destroyed per cycle, for the whole amount',
  )
  expect(quantityAtPath('totals.secondLawEfficiency', ctx)).toEqual({
    tex: '\\eta_{\\text{II}}',
    name: 'second-law efficiency',
  })
  expect(quantityAtPath('totals.rate.netPower', ctx)?.name).toBe('net power')
  expect(quantityAtPath('totals.rate.nothing', ctx)).toBeNull()
})
