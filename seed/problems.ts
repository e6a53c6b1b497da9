/**
 * The demo problem bank: invented classroom problems of our own, at least one for every
 * cycle template (ideal gas, steam plants, the calorimeter, refrigeration, steady flow, the
 * combined cycle), a general state-and-process cycle of a gas and one of water. The numbers are plausible
 * teaching values, chosen so that every drawn variant is physical (a sweep of each problem
 * finds no failure: tests/reference/demo-problems.test.ts).
 *
 * Tobias Wrenfield teaches ENTH 210 (engineering convention, per kilogram of air, engines and
 * steam); Amara Okafor-Reyes teaches CHEM 342 (chemistry convention, per mole, monatomic and
 * diatomic gases, isothermal steps). Most problems use the 'course' convention, so the same
 * problem reads right in either course.
 */
import type { Find, Given, ProblemDefinition } from '#app/domain/authoring/definition.ts'
import type { Tolerance } from '#app/domain/grading/index.ts'

export type DemoOwner = 'tobias' | 'amara'
export type DemoVisibility = 'private' | 'department' | 'installation'

export interface DemoProblem {
  readonly owner: DemoOwner
  readonly visibility: DemoVisibility
  /** The current version (the highest number). */
  readonly definition: ProblemDefinition
  /**
   * Earlier versions, oldest first. Each was used by an assignment, so it is frozen, and the
   * current version was made by editing the last of them.
   */
  readonly earlierVersions?: readonly ProblemDefinition[]
  /** Title of the demo problem this one was copied from (its current version at the time). */
  readonly copiedFrom?: string
}

const rel = (value: number): Tolerance => ({ kind: 'relative', value })
const range = (name: string, label: string, unit: string, min: number, max: number, step: number): Given => ({
  name,
  label,
  unit,
  rule: { kind: 'range', min, max, step },
})
const choice = (name: string, label: string, unit: string, values: readonly (number | string)[]): Given => ({
  name,
  label,
  unit,
  rule: { kind: 'choice', values },
})
const output = (
  name: string,
  label: string,
  path: string,
  unit: string,
  points: number,
  extra: Partial<Find> = {},
): Find => ({
  name,
  label,
  source: { kind: 'output', path },
  unit,
  points,
  tolerance: rel(0.01),
  pitfalls: [],
  ...extra,
})

const STEAM_CAUTION =
  '> Teaching values: the steam properties and results in this problem are for learning thermodynamics, not design data.'

// ---- Carnot (chemistry flavour) --------------------------------------------------------

const carnotEngine: ProblemDefinition = {
  format: 2,
  title: 'Carnot engine on one mole of a monatomic gas',
  tags: {
    topics: ['carnot', 'isothermal', 'second law', 'efficiency'],
    difficulty: 'introductory',
    level: 'first-year',
  },
  convention: 'course',
  prompt: [
    'One mole of an ideal monatomic gas runs a reversible Carnot cycle between a hot reservoir at $T_H =$ [TH] and a cold reservoir at $T_L =$ [TL].',
    '',
    'At the start of the isothermal expansion the gas is at [p1 in kPa]; during that expansion its volume grows by a factor of [r] ($V_2/V_1$).',
    '',
    '1. What is the thermal efficiency of the cycle?',
    '2. How much heat $q$ does the gas take in during the isothermal expansion at $T_H$, per mole?',
    '3. What is the net work of the cycle per mole, in the sign convention of your course?',
  ].join('\n'),
  givens: [
    range('TH', 'hot reservoir temperature', 'K', 450, 800, 25),
    range('TL', 'cold reservoir temperature', 'K', 280, 400, 10),
    range('p1', 'pressure at the start of the isothermal expansion', 'kPa', 500, 1500, 100),
    choice('r', 'isothermal expansion ratio V2/V1', '', [1.5, 2, 2.5, 3]),
  ],
  constraints: [
    {
      left: 'TH',
      op: '>=',
      right: 'TL + 100 K',
      message: 'The hot reservoir must be at least 100 K above the cold one.',
    },
  ],
  physics: {
    kind: 'template',
    template: 'carnot-engine',
    inputs: { gas: 'monatomic', Th: 'TH', Tc: 'TL', p1: 'p1', expansionRatio: 'r' },
  },
  finds: [
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2, { sigFigs: { min: 2 } }),
    output('qH', 'Heat taken in at T_H, per mole', 'steps.1.q', 'kJ/mol', 3, {
      pitfalls: ['log10-for-ln', 'kilo-factor'],
    }),
    output('wNet', 'Net work of the cycle, per mole', 'totals.netWork', 'kJ/mol', 3, {
      pitfalls: ['sign-convention-flipped', 'log10-for-ln', 'kilo-factor'],
    }),
  ],
}

const carnotRefrigerator: ProblemDefinition = {
  format: 2,
  title: 'Carnot refrigerator for a cold store',
  tags: {
    topics: ['carnot', 'refrigeration', 'coefficient of performance'],
    difficulty: 'introductory',
    level: 'first-year',
  },
  convention: 'course',
  prompt: [
    'A cold store is kept at [Tc] while the plant room around it is at [Th]. As an upper bound on what any refrigerator could do, model the plant as a reversible Carnot refrigerator with air as the working fluid, taking heat from the cold space at $T_C$ and rejecting it at $T_H$.',
    '',
    'The air enters the isothermal expansion at [p1] and its volume grows by a factor of [r] during that expansion.',
    '',
    'Find:',
    '',
    '1. the coefficient of performance,',
    '2. the heat taken from the cold store per kilogram of air per cycle,',
    "3. the net work of the cycle per kilogram of air (in your course's sign convention).",
  ].join('\n'),
  givens: [
    range('Tc', 'cold store temperature', '°C', -20, 0, 5),
    range('Th', 'plant room temperature', '°C', 25, 40, 5),
    range('p1', 'pressure at the start of the isothermal expansion', 'kPa', 80, 120, 10),
    choice('r', 'isothermal expansion ratio V2/V1', '', [1.5, 1.8, 2]),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'carnot-refrigerator',
    inputs: { gas: 'air', Th: 'Th', Tc: 'Tc', p1: 'p1', expansionRatio: 'r' },
  },
  finds: [
    output('cop', 'Coefficient of performance (refrigerator)', 'totals.copRefrigerator', '', 3, {
      sigFigs: { min: 3 },
      pitfalls: ['celsius-for-kelvin'],
    }),
    output('qL', 'Heat taken from the cold store per kg of air', 'steps.1.q', 'kJ/kg', 3, {
      pitfalls: ['celsius-for-kelvin', 'log10-for-ln'],
    }),
    output('wNet', 'Net work of the cycle per kg of air', 'totals.netWork', 'kJ/kg', 2, {
      pitfalls: ['sign-convention-flipped', 'celsius-for-kelvin'],
    }),
  ],
}

const carnotHeatPump: ProblemDefinition = {
  format: 2,
  title: 'Reversible heat pump on a diatomic gas',
  tags: {
    topics: ['carnot', 'heat pump', 'coefficient of performance', 'per mole'],
    difficulty: 'standard',
    level: 'second-year',
  },
  convention: 'chemistry',
  prompt: [
    'A reversible (Carnot) heat pump uses an ideal diatomic gas ($c_v = \\tfrac{5}{2}R$). It takes heat from outdoor air at $T_C =$ [Tc] and delivers heat indoors at $T_H = T_C +$ [lift] $=$ [Th].',
    '',
    'The gas starts the isothermal expansion at $T_C$ and [p1], and expands to [r] times its volume.',
    '',
    'Using the chemistry convention ($\\Delta U = q + w$, $w$ the work done on the gas), find:',
    '',
    '1. the coefficient of performance,',
    '2. the heat delivered indoors per mole per cycle,',
    '3. the net work $w$ per mole.',
  ].join('\n'),
  givens: [
    range('Tc', 'outdoor (cold) temperature', 'K', 265, 285, 5),
    range('lift', 'temperature lift', 'K', 25, 60, 5),
    { name: 'Th', label: 'indoor (hot) temperature', unit: 'K', rule: { kind: 'expression', expression: 'Tc + lift' } },
    choice('p1', 'pressure at the start of the isothermal expansion', 'kPa', [100, 150, 200]),
    range('r', 'isothermal expansion ratio V2/V1', '', 1.2, 2, 0.2),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'carnot-heat-pump',
    inputs: { gas: 'diatomic', Th: 'Th', Tc: 'Tc', p1: 'p1', expansionRatio: 'r' },
  },
  finds: [
    output('cop', 'Coefficient of performance (heat pump)', 'totals.copHeatPump', '', 3, { sigFigs: { min: 3 } }),
    output('qOut', 'Heat delivered indoors per mole', 'totals.heatOut', 'J/mol', 3, {
      pitfalls: ['log10-for-ln', 'kilo-factor'],
    }),
    output('wNet', 'Net work w on the gas per mole', 'totals.netWork', 'J/mol', 2, {
      pitfalls: ['sign-convention-flipped', 'log10-for-ln'],
    }),
  ],
}

// ---- Reciprocating engines (engineering flavour, per kg of air) -------------------------

const ottoV1: ProblemDefinition = {
  format: 2,
  title: 'Air-standard Otto cycle',
  tags: { topics: ['otto', 'air standard', 'isentropic'], difficulty: 'standard', level: 'first-year' },
  convention: 'course',
  prompt: [
    'An air-standard Otto cycle has a compression ratio of [r]. At the start of compression the air is at [p1] and [T1]; [qin] of heat is added at constant volume.',
    '',
    'Use air with constant specific heats ($c_p = 1.005$ kJ/(kg K), $c_v = 0.718$ kJ/(kg K)). Find:',
    '',
    '1. the temperature at the end of compression,',
    "2. the net work per kilogram (in your course's sign convention),",
    '3. the thermal efficiency.',
  ].join('\n'),
  givens: [
    range('p1', 'pressure at the start of compression', 'kPa', 95, 105, 5),
    range('T1', 'temperature at the start of compression', '°C', 15, 35, 5),
    range('r', 'compression ratio', '', 6, 9, 0.5),
    range('qin', 'heat added per kg', 'kJ/kg', 600, 1000, 50),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'otto',
    inputs: { gas: 'air', p1: 'p1', T1: 'T1', compressionRatio: 'r', heatIn: 'qin' },
  },
  finds: [
    output('T2', 'Temperature at the end of compression', 'states.2.T', 'K', 2, { pitfalls: ['celsius-for-kelvin'] }),
    output('wNet', 'Net work per kg of air', 'totals.netWork', 'kJ/kg', 3, {
      pitfalls: ['sign-convention-flipped', 'kilo-factor'],
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2),
  ],
}

// Version 2: a wider compression-ratio range, a mean-effective-pressure question, and
// efficiency asked to three figures (version 1 was frozen by an assignment in week 6).
const ottoV2: ProblemDefinition = {
  ...ottoV1,
  tags: { ...ottoV1.tags, topics: [...ottoV1.tags.topics, 'mean effective pressure'] },
  prompt: [
    'An air-standard Otto cycle has a compression ratio of [r]. At the start of compression the air is at [p1] and [T1]; [qin] of heat is added at constant volume.',
    '',
    'Use air with constant specific heats ($c_p = 1.005$ kJ/(kg K), $c_v = 0.718$ kJ/(kg K)). Find:',
    '',
    '1. the temperature $T_2$ at the end of compression,',
    "2. the net work per kilogram (in your course's sign convention),",
    '3. the thermal efficiency, to three significant figures,',
    '4. the mean effective pressure $\\mathrm{MEP} = w_\\text{net}/(v_1 - v_2)$.',
  ].join('\n'),
  givens: [ottoV1.givens[0]!, ottoV1.givens[1]!, range('r', 'compression ratio', '', 7, 10, 0.5), ottoV1.givens[3]!],
  finds: [
    ottoV1.finds[0]!,
    ottoV1.finds[1]!,
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2, { sigFigs: { min: 3, max: 4 } }),
    output('mep', 'Mean effective pressure', 'totals.meanEffectivePressure', 'kPa', 2, {
      tolerance: rel(0.02),
      pitfalls: ['kilo-factor'],
    }),
  ],
}

const diesel: ProblemDefinition = {
  format: 2,
  title: 'Air-standard Diesel cycle with a given cutoff ratio',
  tags: { topics: ['diesel', 'air standard', 'cutoff ratio'], difficulty: 'standard', level: 'first-year' },
  convention: 'course',
  prompt: [
    'An air-standard Diesel cycle has a compression ratio of [r] and a cutoff ratio $r_c = V_3/V_2 =$ [rc]. Air enters compression at [p1] and [T1].',
    '',
    'With constant specific heats for air, find:',
    '',
    '1. the temperature at the end of heat addition,',
    '2. the heat added per kilogram,',
    '3. the thermal efficiency.',
  ].join('\n'),
  givens: [
    range('p1', 'pressure at the start of compression', 'kPa', 90, 100, 5),
    range('T1', 'temperature at the start of compression', 'K', 290, 320, 10),
    range('r', 'compression ratio', '', 15, 20, 1),
    range('rc', 'cutoff ratio', '', 1.6, 2.4, 0.2),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'diesel',
    inputs: { gas: 'air', p1: 'p1', T1: 'T1', compressionRatio: 'r', cutoffRatio: 'rc' },
  },
  finds: [
    output('T3', 'Temperature at the end of heat addition', 'states.3.T', 'K', 2),
    output('qin', 'Heat added per kg of air', 'totals.heatIn', 'kJ/kg', 3, {
      pitfalls: ['cp-cv-swapped', 'kilo-factor'],
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '%', 2, { sigFigs: { min: 3 } }),
  ],
}

const dual: ProblemDefinition = {
  format: 2,
  title: 'Dual cycle: heat added at constant volume, then at constant pressure',
  tags: { topics: ['dual', 'air standard', 'limited pressure'], difficulty: 'challenging', level: 'second-year' },
  convention: 'course',
  prompt: [
    'In an air-standard dual cycle, air at [p1] and [T1] is compressed isentropically through a compression ratio of [r]. Heat is then added at constant volume until the pressure has risen by a factor of [rp], and then at constant pressure until the volume has grown by a factor of [rc].',
    '',
    'Find:',
    '',
    '1. the peak pressure,',
    "2. the net work per kilogram (in your course's sign convention),",
    '3. the thermal efficiency.',
  ].join('\n'),
  givens: [
    choice('p1', 'pressure at the start of compression', 'kPa', [95, 100]),
    range('T1', 'temperature at the start of compression', 'K', 290, 310, 10),
    range('r', 'compression ratio', '', 12, 16, 1),
    range('rp', 'pressure ratio of the constant-volume heating p3/p2', '', 1.2, 1.6, 0.1),
    range('rc', 'cutoff ratio of the constant-pressure heating V4/V3', '', 1.2, 1.8, 0.1),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'dual',
    inputs: { gas: 'air', p1: 'p1', T1: 'T1', compressionRatio: 'r', pressureRatio: 'rp', cutoffRatio: 'rc' },
  },
  finds: [
    output('p3', 'Peak pressure', 'states.3.p', 'MPa', 2),
    output('wNet', 'Net work per kg of air', 'totals.netWork', 'kJ/kg', 3, {
      pitfalls: ['sign-convention-flipped', 'cp-cv-swapped'],
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2),
  ],
}

// ---- Gas turbines ------------------------------------------------------------------------

const brayton: ProblemDefinition = {
  format: 2,
  title: 'Gas-turbine (Brayton) cycle with component efficiencies',
  tags: {
    topics: ['brayton', 'gas turbine', 'isentropic efficiency', 'back work ratio'],
    difficulty: 'standard',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    'A simple gas-turbine plant takes in air at 100 kPa and [T1] and compresses it through a pressure ratio of [rp]. The turbine inlet temperature is [TIT]. The compressor and turbine have isentropic efficiencies of [etaC, 2 dp] and [etaT, 2 dp].',
    '',
    'Treat the working fluid as air with constant specific heats throughout (air-standard analysis). Per kilogram of air, find:',
    '',
    '1. the temperature leaving the compressor,',
    "2. the net work (in your course's sign convention),",
    '3. the back work ratio,',
    '4. the thermal efficiency.',
  ].join('\n'),
  givens: [
    range('T1', 'compressor inlet temperature', 'K', 290, 310, 5),
    range('rp', 'compressor pressure ratio', '', 8, 14, 1),
    range('TIT', 'turbine inlet temperature', 'K', 1150, 1400, 50),
    choice('etaC', 'compressor isentropic efficiency', '', [0.8, 0.82, 0.85, 0.88]),
    choice('etaT', 'turbine isentropic efficiency', '', [0.85, 0.88, 0.9]),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'brayton',
    inputs: {
      gas: 'air',
      p1: '100 kPa',
      T1: 'T1',
      pressureRatio: 'rp',
      turbineInletT: 'TIT',
      compressorEfficiency: 'etaC',
      turbineEfficiency: 'etaT',
    },
  },
  finds: [
    output('T2', 'Compressor exit temperature', 'states.2.T', 'K', 2),
    output('wNet', 'Net work per kg of air', 'totals.netWork', 'kJ/kg', 3, {
      pitfalls: ['sign-convention-flipped', 'cp-cv-swapped', 'kilo-factor'],
    }),
    output('bwr', 'Back work ratio', 'totals.backWorkRatio', '', 2),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2),
  ],
}

const braytonRegenerative: ProblemDefinition = {
  format: 2,
  title: 'Regenerative gas turbine',
  tags: {
    topics: ['brayton', 'regeneration', 'gas turbine', 'effectiveness'],
    difficulty: 'challenging',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    'A gas-turbine plant with a regenerator compresses air from 100 kPa and [T1] through a pressure ratio of [rp]; the turbine inlet temperature is [TIT]. The compressor and turbine isentropic efficiencies are [etaC, 2 dp] and 0.88. The regenerator has an effectiveness of [eps, 2 dp].',
    '',
    'With the air-standard assumptions (constant specific heats), find:',
    '',
    '1. the temperature of the air entering the combustor,',
    '2. the heat added in the combustor per kilogram of air,',
    '3. the thermal efficiency.',
  ].join('\n'),
  givens: [
    range('T1', 'compressor inlet temperature', 'K', 290, 310, 10),
    range('rp', 'compressor pressure ratio', '', 4, 7, 0.5),
    range('TIT', 'turbine inlet temperature', 'K', 1100, 1300, 50),
    choice('etaC', 'compressor isentropic efficiency', '', [0.82, 0.85, 0.88]),
    range('eps', 'regenerator effectiveness', '', 0.6, 0.9, 0.05),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'brayton-regenerative',
    inputs: {
      gas: 'air',
      p1: '100 kPa',
      T1: 'T1',
      pressureRatio: 'rp',
      turbineInletT: 'TIT',
      compressorEfficiency: 'etaC',
      turbineEfficiency: '0.88',
      regeneratorEffectiveness: 'eps',
    },
  },
  finds: [
    output('T3', 'Temperature entering the combustor', 'states.3.T', 'K', 2),
    output('qin', 'Heat added in the combustor per kg of air', 'totals.heatIn', 'kJ/kg', 3, {
      pitfalls: ['cp-cv-swapped', 'kilo-factor'],
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 3),
  ],
}

// ---- Regenerative gas cycles --------------------------------------------------------------

const stirling: ProblemDefinition = {
  format: 2,
  title: 'Ideal Stirling engine on a monatomic gas',
  tags: {
    topics: ['stirling', 'isothermal', 'regeneration', 'per mole'],
    difficulty: 'standard',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    'An ideal Stirling engine works with an ideal monatomic gas between [Tc] and [Th], with an ideal regenerator. At the start of the isothermal compression (at $T_C$, largest volume) the gas is at [p1]; the compression ratio $V_1/V_2$ is [r].',
    '',
    'Per mole of gas, find:',
    '',
    '1. the heat taken in during the isothermal expansion at $T_H$,',
    "2. the net work of the cycle (in your course's sign convention),",
    '3. the thermal efficiency.',
    '',
    'Why does the regenerator make the efficiency equal to the Carnot value?',
  ].join('\n'),
  givens: [
    range('Th', 'hot-side gas temperature', 'K', 500, 900, 50),
    range('Tc', 'cold-side gas temperature', 'K', 290, 350, 10),
    range('p1', 'pressure at the start of compression', 'kPa', 100, 400, 50),
    range('r', 'compression ratio V1/V2', '', 2, 5, 0.5),
  ],
  constraints: [
    { left: 'Th', op: '>=', right: 'Tc + 200 K', message: 'The hot side must be at least 200 K above the cold side.' },
  ],
  physics: {
    kind: 'template',
    template: 'stirling',
    inputs: { gas: 'monatomic', Th: 'Th', Tc: 'Tc', p1: 'p1', compressionRatio: 'r' },
  },
  finds: [
    output('qH', 'Heat taken in at T_H, per mole', 'steps.3.q', 'kJ/mol', 3, {
      pitfalls: ['log10-for-ln', 'kilo-factor'],
    }),
    output('wNet', 'Net work of the cycle, per mole', 'totals.netWork', 'kJ/mol', 3, {
      pitfalls: ['sign-convention-flipped', 'log10-for-ln'],
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2),
  ],
}

// Tobias's copy of Amara's Stirling problem, rewritten per kilogram of air for ENTH 210.
const stirlingAir: ProblemDefinition = {
  ...stirling,
  title: 'Ideal Stirling engine per kilogram of air',
  tags: { topics: ['stirling', 'isothermal', 'regeneration'], difficulty: 'standard', level: 'first-year' },
  prompt: [
    'An ideal Stirling engine uses air as its working gas between [Tc] and [Th], with an ideal regenerator. At the start of the isothermal compression (at $T_C$, largest volume) the air is at [p1]; the compression ratio $V_1/V_2$ is [r].',
    '',
    'Per kilogram of air ($R = 0.287$ kJ/(kg K)), find:',
    '',
    '1. the heat added during the isothermal expansion,',
    "2. the net work of the cycle (in your course's sign convention),",
    '3. the thermal efficiency.',
  ].join('\n'),
  physics: {
    kind: 'template',
    template: 'stirling',
    inputs: { gas: 'air', Th: 'Th', Tc: 'Tc', p1: 'p1', compressionRatio: 'r' },
  },
  finds: [
    output('qH', 'Heat added at T_H, per kg of air', 'steps.3.q', 'kJ/kg', 3, {
      pitfalls: ['log10-for-ln', 'kilo-factor'],
    }),
    output('wNet', 'Net work of the cycle, per kg of air', 'totals.netWork', 'kJ/kg', 3, {
      pitfalls: ['sign-convention-flipped', 'log10-for-ln'],
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2),
  ],
}

const ericsson: ProblemDefinition = {
  format: 2,
  title: 'Ideal Ericsson cycle in steady flow',
  tags: {
    topics: ['ericsson', 'isothermal', 'regeneration', 'steady flow'],
    difficulty: 'standard',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    'An ideal Ericsson cycle runs in steady flow with air. The air is compressed isothermally at [Tc] from 100 kPa through a pressure ratio of [rp], heated at constant pressure in an ideal regenerator, expanded isothermally at [Th], and cooled back through the regenerator.',
    '',
    'Per kilogram of air, find:',
    '',
    "1. the shaft work of the isothermal compressor (in your course's sign convention),",
    "2. the net work of the cycle (in your course's sign convention),",
    '3. the thermal efficiency.',
  ].join('\n'),
  givens: [
    range('Th', 'turbine (hot) temperature', 'K', 900, 1200, 50),
    range('Tc', 'compressor (cold) temperature', 'K', 290, 320, 10),
    range('rp', 'pressure ratio p2/p1', '', 3, 8, 1),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'ericsson',
    inputs: { gas: 'air', Th: 'Th', Tc: 'Tc', p1: '100 kPa', pressureRatio: 'rp' },
  },
  finds: [
    output('wC', 'Shaft work of the isothermal compressor per kg', 'steps.1.w', 'kJ/kg', 3, {
      pitfalls: ['sign-convention-flipped', 'log10-for-ln'],
    }),
    output('wNet', 'Net work of the cycle per kg', 'totals.netWork', 'kJ/kg', 3, {
      pitfalls: ['sign-convention-flipped', 'log10-for-ln'],
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2),
  ],
}

// ---- Steam ---------------------------------------------------------------------------------

const rankine: ProblemDefinition = {
  format: 2,
  title: 'Ideal Rankine cycle with superheat',
  tags: {
    topics: ['rankine', 'steam', 'superheat', 'turbine exit quality'],
    difficulty: 'standard',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    STEAM_CAUTION,
    '',
    'A steam power plant runs on the ideal Rankine cycle. Steam leaves the boiler at [pB] and [TIT] and expands in the turbine to the condenser pressure of [pC]; saturated liquid leaves the condenser.',
    '',
    'Per kilogram of steam, find:',
    '',
    '1. the quality at the turbine exit,',
    '2. the net work output (a magnitude),',
    '3. the thermal efficiency.',
  ].join('\n'),
  givens: [
    choice('pB', 'boiler pressure', 'MPa', [3, 4, 5, 6, 8]),
    choice('pC', 'condenser pressure', 'kPa', [10, 20, 50]),
    range('TIT', 'turbine inlet temperature', '°C', 400, 550, 25),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'rankine',
    inputs: { boilerPressure: 'pB', condenserPressure: 'pC', turbineInletTemperature: 'TIT' },
  },
  finds: [
    output('x4', 'Quality at the turbine exit', 'totals.turbineExitQuality', '', 2, { tolerance: rel(0.015) }),
    output('wNet', 'Net work output per kg of steam', 'totals.netWork', 'kJ/kg', 3, { pitfalls: ['kilo-factor'] }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2),
  ],
}

const steamCarnot: ProblemDefinition = {
  format: 2,
  title: 'Carnot cycle with water inside the dome',
  tags: { topics: ['carnot', 'steam', 'two-phase', 'quality'], difficulty: 'standard', level: 'second-year' },
  convention: 'course',
  prompt: [
    STEAM_CAUTION,
    '',
    'Water runs on a steady-flow Carnot cycle inside the saturation dome. In the boiler saturated liquid at [TH] becomes saturated vapour; the vapour expands isentropically to [TL], is partly condensed at that temperature, and the wet mixture is compressed isentropically back to saturated liquid at [TH].',
    '',
    'Per kilogram of water, find:',
    '',
    '1. the heat added in the boiler,',
    '2. the quality at the turbine exit,',
    '3. the net work delivered by the water,',
    '4. the thermal efficiency.',
  ].join('\n'),
  givens: [
    range('TH', 'boiler temperature', '°C', 180, 300, 10),
    choice('TL', 'condenser temperature', '°C', [30, 40, 50]),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'steam-carnot',
    inputs: { hotTemperature: 'TH', coldTemperature: 'TL' },
  },
  finds: [
    output('qH', 'Heat added in the boiler per kg of water', 'totals.heatIn', 'kJ/kg', 2, {
      sense: 'heat-into-system',
      pitfalls: ['kilo-factor'],
    }),
    output('x3', 'Quality at the turbine exit', 'states.3.x', '', 2, { tolerance: rel(0.015) }),
    output('wNet', 'Net work delivered by the water per kg', 'totals.netWork', 'kJ/kg', 3, {
      sense: 'work-by-system',
      pitfalls: ['sign-convention-flipped', 'kilo-factor'],
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2),
  ],
}

const steamCalorimeter: ProblemDefinition = {
  format: 2,
  title: 'Quality of line steam from a throttling calorimeter',
  tags: { topics: ['steam', 'throttling', 'calorimeter', 'quality'], difficulty: 'introductory', level: 'second-year' },
  convention: 'course',
  prompt: [
    STEAM_CAUTION,
    '',
    'A sample of wet steam from a line at [p1] is throttled into a calorimeter open to [p2]. The calorimeter reads [T2].',
    '',
    'Find:',
    '',
    '1. the enthalpy of the line steam,',
    '2. the quality of the line steam.',
  ].join('\n'),
  givens: [
    choice('p1', 'line pressure', 'MPa', [1, 1.5, 2, 2.5, 3]),
    choice('p2', 'calorimeter pressure', 'kPa', [100]),
    range('T2', 'calorimeter temperature', '°C', 115, 130, 1),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'steam-throttling-calorimeter',
    inputs: { linePressure: 'p1', calorimeterPressure: 'p2', calorimeterTemperature: 'T2' },
  },
  finds: [
    output('h1', 'Enthalpy of the line steam', 'totals.enthalpy', 'kJ/kg', 1, { pitfalls: ['kilo-factor'] }),
    output('x1', 'Quality of the line steam', 'totals.quality', '', 2, {
      tolerance: { kind: 'absolute', value: 0.003 },
    }),
  ],
}

const waterPiston: ProblemDefinition = {
  format: 2,
  title: 'Wet steam heated at constant pressure in a piston–cylinder',
  tags: {
    topics: ['steam', 'first law', 'closed system', 'boundary work'],
    difficulty: 'introductory',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    STEAM_CAUTION,
    '',
    'A piston–cylinder device holds [m] of water at [p1] with a quality of [x1]. It is heated at constant pressure until the temperature reaches [T2].',
    '',
    'Find:',
    '',
    '1. the boundary work done by the water,',
    '2. the heat added to the water,',
    '3. the change in the internal energy of the water.',
  ].join('\n'),
  givens: [
    choice('m', 'mass of water', 'kg', [1, 2, 3]),
    choice('p1', 'pressure', 'kPa', [150, 200, 300, 400]),
    range('x1', 'initial quality', '', 0.2, 0.8, 0.1),
    range('T2', 'final temperature', '°C', 200, 400, 25),
  ],
  constraints: [],
  physics: {
    kind: 'cycle',
    cycle: {
      substance: 'water',
      system: 'closed',
      mass: 'm',
      states: [
        { name: '1', p: 'p1', x: 'x1' },
        { name: '2', T: 'T2' },
      ],
      steps: [{ process: 'isobaric', label: 'heating at constant pressure' }],
    },
  },
  finds: [
    output('W', 'Boundary work done by the water', 'steps.1.total.w', 'kJ', 2, {
      sense: 'work-by-system',
      pitfalls: ['sign-convention-flipped', 'kilo-factor'],
    }),
    output('Q', 'Heat added to the water', 'steps.1.total.q', 'kJ', 2, {
      sense: 'heat-into-system',
      pitfalls: ['kilo-factor'],
    }),
    output('dU', 'Change in internal energy', 'steps.1.total.dU', 'kJ', 2, { pitfalls: ['kilo-factor'] }),
  ],
}

const combinedCycle: ProblemDefinition = {
  format: 2,
  title: 'Combined gas–steam plant with a heat-recovery steam generator',
  tags: { topics: ['combined cycle', 'brayton', 'rankine', 'hrsg'], difficulty: 'challenging', level: 'upper-level' },
  convention: 'course',
  prompt: [
    STEAM_CAUTION,
    '',
    'Air enters the compressor of a gas turbine at 100 kPa and 300 K and is compressed with a pressure ratio of [rp] (isentropic efficiency 82 %). It is heated to [TIT] and expands in the turbine (isentropic efficiency 86 %). The exhaust raises steam at 4 MPa and [Ts] in a heat-recovery steam generator and leaves at [T5]. The steam expands in an ideal turbine to 10 kPa and is condensed and pumped back.',
    '',
    'Per kilogram of air, find:',
    '',
    '1. the steam raised,',
    '2. the net work delivered by the plant,',
    '3. the thermal efficiency of the combined cycle.',
  ].join('\n'),
  givens: [
    choice('rp', 'pressure ratio', '', [8, 10, 12]),
    range('TIT', 'turbine inlet temperature', 'K', 1300, 1450, 50),
    choice('Ts', 'steam temperature', '°C', [400, 425]),
    choice('T5', 'stack temperature', 'K', [440, 460]),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'combined-cycle',
    inputs: {
      p1: '100 kPa',
      T1: '300 K',
      pressureRatio: 'rp',
      turbineInletT: 'TIT',
      compressorEfficiency: '0.82',
      gasTurbineEfficiency: '0.86',
      boilerPressure: '4 MPa',
      condenserPressure: '10 kPa',
      steamTemperature: 'Ts',
      stackTemperature: 'T5',
    },
  },
  finds: [
    output('y', 'Steam raised per kg of air', 'totals.steamPerGas', '', 2),
    output('wNet', 'Net work delivered per kg of air', 'totals.netWork', 'kJ/kg', 3, {
      sense: 'work-by-system',
      pitfalls: ['kilo-factor'],
    }),
    output('eta', 'Thermal efficiency of the combined cycle', 'totals.efficiency', '', 2),
  ],
}

const rankineReheat: ProblemDefinition = {
  format: 2,
  title: 'Reheat Rankine cycle',
  tags: { topics: ['rankine', 'steam', 'reheat'], difficulty: 'challenging', level: 'upper-level' },
  convention: 'course',
  prompt: [
    STEAM_CAUTION,
    '',
    'An ideal reheat Rankine cycle: steam enters the high-pressure turbine at [pB] and [TIT], expands to [pR], is reheated at constant pressure to [TR], and expands in the low-pressure turbine to 10 kPa.',
    '',
    'Per kilogram of steam, find:',
    '',
    '1. the total heat added in the boiler and reheater,',
    '2. the quality at the low-pressure turbine exit,',
    '3. the thermal efficiency.',
  ].join('\n'),
  givens: [
    choice('pB', 'boiler pressure', 'MPa', [12, 14, 15, 16]),
    range('TIT', 'high-pressure turbine inlet temperature', '°C', 500, 600, 25),
    choice('pR', 'reheat pressure', 'MPa', [2, 3, 4]),
    range('TR', 'reheat temperature', '°C', 500, 600, 50),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'rankine-reheat',
    inputs: {
      boilerPressure: 'pB',
      condenserPressure: '10 kPa',
      turbineInletTemperature: 'TIT',
      reheatPressure: 'pR',
      reheatTemperature: 'TR',
    },
  },
  finds: [
    output('qin', 'Heat added in the boiler and reheater per kg', 'totals.heatIn', 'kJ/kg', 3, {
      pitfalls: ['kilo-factor'],
    }),
    output('x6', 'Quality at the low-pressure turbine exit', 'totals.turbineExitQuality', '', 2, {
      tolerance: rel(0.015),
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2, { sigFigs: { min: 3 } }),
  ],
}

const rankineRegenerative: ProblemDefinition = {
  format: 2,
  title: 'Regenerative Rankine cycle with an open feedwater heater',
  tags: {
    topics: ['rankine', 'steam', 'feedwater heater', 'regeneration', 'isentropic efficiency'],
    difficulty: 'challenging',
    level: 'upper-level',
  },
  convention: 'course',
  prompt: [
    STEAM_CAUTION,
    '',
    'Steam enters the turbine of a regenerative Rankine plant at 15 MPa and [TIT]. Some steam is bled at [pF] to an open feedwater heater; the rest expands to 10 kPa. Saturated liquid leaves both the condenser and the heater. The turbine has an isentropic efficiency of [etaT, 2 dp] (for each section) and both pumps [etaP, 2 dp].',
    '',
    'Per kilogram of steam through the boiler, find:',
    '',
    '1. the fraction of steam bled to the heater,',
    '2. the net work output (a magnitude),',
    '3. the thermal efficiency.',
  ].join('\n'),
  givens: [
    range('TIT', 'turbine inlet temperature', '°C', 500, 600, 25),
    choice('pF', 'feedwater heater pressure', 'MPa', [0.5, 0.8, 1, 1.2, 1.5]),
    choice('etaT', 'turbine isentropic efficiency', '', [0.85, 0.87, 0.9]),
    choice('etaP', 'pump isentropic efficiency', '', [0.8, 0.85]),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'rankine-regenerative',
    inputs: {
      boilerPressure: '15 MPa',
      condenserPressure: '10 kPa',
      turbineInletTemperature: 'TIT',
      feedwaterHeaterPressure: 'pF',
      turbineEfficiency: 'etaT',
      pumpEfficiency: 'etaP',
    },
  },
  finds: [
    output('y', 'Fraction of steam bled to the heater', 'totals.bleedFraction', '', 3, { tolerance: rel(0.02) }),
    output('wNet', 'Net work output per kg of steam', 'totals.netWork', 'kJ/kg', 3, { pitfalls: ['kilo-factor'] }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2),
  ],
}

// ---- Refrigeration -------------------------------------------------------------------------

const REFRIGERANT_CAUTION =
  '> Teaching values: the refrigerant properties and results in this problem are for learning thermodynamics, not design data.'

const vapourCompression: ProblemDefinition = {
  format: 2,
  title: 'Vapour-compression refrigerator on R-134a',
  tags: {
    topics: ['refrigeration', 'vapour compression', 'R-134a', 'coefficient of performance', 'isentropic efficiency'],
    difficulty: 'standard',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    REFRIGERANT_CAUTION,
    '',
    'A refrigerator runs on a single-stage vapour-compression cycle with R-134a. The refrigerant leaves the evaporator as saturated vapour at [TL] and the condenser as saturated liquid at [TH]. The adiabatic compressor has an isentropic efficiency of [etaC, 2 dp], and [mdot] of refrigerant circulates.',
    '',
    'Find:',
    '',
    '1. the refrigeration effect (heat absorbed in the evaporator) per kilogram of refrigerant,',
    '2. the compressor work input per kilogram, as a positive number,',
    '3. the coefficient of performance,',
    '4. the compressor power input,',
    '5. the quality of the refrigerant leaving the throttling valve.',
  ].join('\n'),
  givens: [
    range('TL', 'evaporator saturation temperature', '°C', -20, -4, 2),
    range('TH', 'condenser saturation temperature', '°C', 30, 46, 4),
    choice('etaC', 'compressor isentropic efficiency', '', [0.75, 0.8, 0.85]),
    range('mdot', 'refrigerant mass flow rate', 'kg/s', 0.04, 0.1, 0.01),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'vapour-compression',
    inputs: {
      refrigerant: 'R134a',
      evaporatorTemperature: 'TL',
      condenserTemperature: 'TH',
      compressorEfficiency: 'etaC',
      massFlow: 'mdot',
    },
  },
  finds: [
    output(
      'qL',
      'Refrigeration effect (heat absorbed in the evaporator) per kg',
      'totals.refrigerationEffect',
      'kJ/kg',
      3,
      {
        sense: 'heat-into-system',
        pitfalls: ['kilo-factor'],
      },
    ),
    output('Win', 'Compressor work input per kg of refrigerant', 'devices.1.w', 'kJ/kg', 3, {
      sense: 'work-on-system',
      pitfalls: ['sign-convention-flipped', 'kilo-factor'],
    }),
    output('cop', 'Coefficient of performance', 'totals.copRefrigerator', '', 2),
    output('Wdot', 'Compressor power input', 'totals.compressorPower', 'kW', 2, { sense: 'work-on-system' }),
    output('x4', 'Quality after the throttling valve', 'states.4.x', '', 2, { tolerance: rel(0.02) }),
  ],
}

// ---- A general state-and-process cycle -------------------------------------------------------

const threeStep: ProblemDefinition = {
  format: 2,
  title: 'Three-step cycle: polytropic compression, isobaric expansion, isochoric cooling',
  tags: {
    topics: ['polytropic', 'isobaric', 'isochoric', 'first law', 'per mole'],
    difficulty: 'challenging',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    'Two moles of an ideal [gas] gas start in state A at 100 kPa and [VA]. The gas is',
    '',
    '1. compressed polytropically ($pV^n$ = const, $n =$ [n, 2 dp]) to state B at [pB],',
    '2. expanded at constant pressure to state C, back at the volume of A,',
    '3. cooled at constant volume back to A.',
    '',
    'For the whole two moles, find:',
    '',
    "1. the work in the compression A→B (in your course's sign convention),",
    '2. the heat added in the expansion B→C,',
    "3. the net work of the cycle (in your course's sign convention),",
    '4. the thermal efficiency $\\eta = W_\\text{net}/Q_\\text{in}$.',
  ].join('\n'),
  givens: [
    choice('gas', 'kind of gas', '', ['monatomic', 'diatomic']),
    range('VA', 'volume in state A', 'L', 30, 50, 5),
    range('n', 'polytropic exponent', '', 1.15, 1.35, 0.05),
    range('pB', 'pressure in state B', 'kPa', 250, 400, 50),
  ],
  constraints: [],
  physics: {
    kind: 'cycle',
    cycle: {
      gas: 'gas',
      system: 'closed',
      amount: '2 mol',
      states: [
        { name: 'A', p: '100 kPa', V: 'VA' },
        { name: 'B', p: 'pB' },
        { name: 'C', V: 'VA' },
      ],
      steps: [
        { process: 'polytropic', n: 'n', label: 'compression' },
        { process: 'isobaric', label: 'expansion' },
        { process: 'isochoric', label: 'cooling' },
      ],
    },
  },
  finds: [
    output('wAB', 'Work in the compression A→B (whole gas)', 'steps.1.total.w', 'kJ', 3, {
      pitfalls: ['sign-convention-flipped', 'kilo-factor'],
    }),
    output('qBC', 'Heat added in the expansion B→C (whole gas)', 'steps.2.total.q', 'kJ', 3, {
      pitfalls: ['cp-cv-swapped', 'gamma-monatomic-diatomic-swapped', 'kilo-factor'],
    }),
    output('wNet', 'Net work of the cycle (whole gas)', 'totals.total.netWork', 'kJ', 2, {
      pitfalls: ['sign-convention-flipped'],
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2),
  ],
}

/** The demo bank, in seeding order (a copy comes after the problem it was copied from). */
// ---- More gas cycles: intercooling and reheat, Atkinson, Miller ----------------------------

const braytonIntercoolReheat: ProblemDefinition = {
  format: 2,
  title: 'Gas turbine with intercooling, reheat and a regenerator',
  tags: {
    topics: ['brayton', 'intercooling', 'reheat', 'regeneration', 'gas turbine'],
    difficulty: 'challenging',
    level: 'upper-level',
  },
  convention: 'course',
  prompt: [
    'A gas-turbine plant compresses air from 100 kPa and [T1] in two stages through an overall pressure ratio of [rp], with an intercooler between them at the geometric-mean pressure that cools the air back to [T1]. It expands in two turbine stages with a reheater between them, at the same intermediate pressure, back to the turbine inlet temperature [TIT]. Every compressor stage has an isentropic efficiency of [etaC, 2 dp] and every turbine stage 0.88; a regenerator of effectiveness [eps, 2 dp] heats the compressed air with the exhaust.',
    '',
    'With constant specific heats (air-standard), find per kilogram of air:',
    '',
    '1. the net work delivered,',
    '2. the back work ratio,',
    '3. the thermal efficiency.',
  ].join('\n'),
  givens: [
    range('T1', 'compressor inlet temperature', 'K', 290, 310, 10),
    range('rp', 'overall pressure ratio', '', 8, 14, 1),
    range('TIT', 'turbine inlet temperature', 'K', 1200, 1400, 50),
    choice('etaC', 'compressor stage isentropic efficiency', '', [0.82, 0.85, 0.88]),
    range('eps', 'regenerator effectiveness', '', 0.7, 0.9, 0.05),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'brayton-intercool-reheat',
    inputs: {
      gas: 'air',
      p1: '100 kPa',
      T1: 'T1',
      pressureRatio: 'rp',
      turbineInletT: 'TIT',
      compressorEfficiency: 'etaC',
      turbineEfficiency: '0.88',
      regeneratorEffectiveness: 'eps',
    },
  },
  finds: [
    output('wNet', 'Net work delivered per kg of air', 'totals.netWork', 'kJ/kg', 3, {
      sense: 'work-by-system',
      pitfalls: ['sign-convention-flipped', 'cp-cv-swapped', 'kilo-factor'],
    }),
    output('bwr', 'Back work ratio', 'totals.backWorkRatio', '', 2),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 3),
  ],
}

const atkinson: ProblemDefinition = {
  format: 2,
  title: 'Air-standard Atkinson cycle',
  tags: { topics: ['atkinson', 'over-expansion', 'spark ignition'], difficulty: 'standard', level: 'second-year' },
  convention: 'course',
  prompt: [
    'An air-standard Atkinson cycle starts at 100 kPa and [T1]. The air is compressed isentropically through a compression ratio of [rc], heated at constant volume to [T3], expanded isentropically all the way down to 100 kPa, and then cooled at constant pressure back to the start.',
    '',
    'With constant specific heats, find per kilogram of air:',
    '',
    '1. the heat added,',
    '2. the net work delivered,',
    '3. the thermal efficiency.',
  ].join('\n'),
  givens: [
    range('T1', 'temperature at the start of compression', 'K', 290, 310, 10),
    range('rc', 'compression ratio', '', 7, 10, 0.5),
    range('T3', 'peak temperature', 'K', 1600, 2000, 50),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'atkinson',
    inputs: { gas: 'air', p1: '100 kPa', T1: 'T1', compressionRatio: 'rc', T3: 'T3' },
  },
  finds: [
    output('qin', 'Heat added per kg of air', 'totals.heatIn', 'kJ/kg', 3, {
      pitfalls: ['cp-cv-swapped', 'kilo-factor'],
    }),
    output('wNet', 'Net work delivered per kg of air', 'totals.netWork', 'kJ/kg', 3, {
      sense: 'work-by-system',
      pitfalls: ['sign-convention-flipped', 'kilo-factor'],
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 3),
  ],
}

const miller: ProblemDefinition = {
  format: 2,
  title: 'Air-standard Miller cycle',
  tags: {
    topics: ['miller', 'over-expansion', 'mean effective pressure'],
    difficulty: 'challenging',
    level: 'upper-level',
  },
  convention: 'course',
  prompt: [
    'An air-standard Miller (over-expanded) cycle starts at 100 kPa and [T1]. The compression ratio is [rc] and the expansion ratio [re]; [qin] of heat is added per kilogram of air at constant volume. After the expansion the air is cooled at constant volume down to 100 kPa and then at constant pressure back to the start.',
    '',
    'With constant specific heats, find:',
    '',
    '1. the net work delivered per kilogram of air,',
    '2. the thermal efficiency,',
    '3. the mean effective pressure.',
  ].join('\n'),
  givens: [
    range('T1', 'temperature at the start of compression', 'K', 290, 310, 10),
    range('rc', 'compression ratio', '', 8, 10, 0.5),
    range('re', 'expansion ratio', '', 11, 13, 0.5),
    range('qin', 'heat added per kg of air', 'kJ/kg', 900, 1300, 100),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'miller',
    inputs: { gas: 'air', p1: '100 kPa', T1: 'T1', compressionRatio: 'rc', expansionRatio: 're', heatIn: 'qin' },
  },
  finds: [
    output('wNet', 'Net work delivered per kg of air', 'totals.netWork', 'kJ/kg', 3, {
      sense: 'work-by-system',
      pitfalls: ['sign-convention-flipped', 'kilo-factor'],
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 3),
    output('mep', 'Mean effective pressure', 'totals.meanEffectivePressure', 'kPa', 2),
  ],
}

// ---- Steady flow with kinetic energy: nozzle, diffuser, turbojet (invented numbers) ------

const FLOW_CAUTION =
  '> Teaching model: an ideal gas in one-dimensional steady flow. The results are for learning thermodynamics, not design data for nozzles or engines.'

const nozzle: ProblemDefinition = {
  format: 2,
  title: 'Air through a converging nozzle',
  tags: {
    topics: ['steady flow', 'nozzle', 'kinetic energy', 'Mach number', 'choked flow', 'isentropic efficiency'],
    difficulty: 'standard',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    FLOW_CAUTION,
    '',
    'Air (constant specific heats, cp = 1.005 kJ/(kg·K)) enters an adiabatic converging nozzle at [p1] and [T1] with a velocity of [V1], and the nozzle discharges into a space at [pb]. The nozzle has an isentropic efficiency of [etaN, 2 dp], and [mdot] of air flows through it.',
    '',
    'Decide first whether the nozzle is choked. Then find:',
    '',
    '1. the exit velocity,',
    '2. the exit temperature,',
    '3. the exit Mach number,',
    '4. the exit area.',
  ].join('\n'),
  givens: [
    range('p1', 'inlet pressure', 'kPa', 200, 400, 25),
    range('T1', 'inlet temperature', 'K', 420, 600, 20),
    range('V1', 'inlet velocity', 'm/s', 30, 90, 10),
    choice('pb', 'back pressure', 'kPa', [100, 140, 180]),
    choice('etaN', 'nozzle isentropic efficiency', '', [0.92, 0.95, 0.98]),
    range('mdot', 'mass flow rate', 'kg/s', 0.5, 2, 0.25),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'nozzle',
    inputs: { gas: 'air', p1: 'p1', T1: 'T1', V1: 'V1', p2: 'pb', efficiency: 'etaN', massFlow: 'mdot' },
  },
  finds: [
    output('V2', 'Exit velocity', 'totals.exitVelocity', 'm/s', 3),
    output('T2', 'Exit temperature', 'totals.exitTemperature', 'K', 2),
    output('M2', 'Exit Mach number', 'totals.exitMach', '', 2),
    output('A2', 'Exit area', 'totals.exitArea', 'cm^2', 2, { tolerance: rel(0.02) }),
  ],
}

const diffuser: ProblemDefinition = {
  format: 2,
  title: 'Diffuser at the inlet of an aircraft engine',
  tags: {
    topics: ['steady flow', 'diffuser', 'kinetic energy', 'stagnation temperature', 'isentropic efficiency'],
    difficulty: 'introductory',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    FLOW_CAUTION,
    '',
    'Air at [p1] and [T1] enters the adiabatic diffuser of an aircraft engine at [V1] through an inlet of [A1]. It leaves at [V2]. The diffuser has an isentropic efficiency of [etaD, 2 dp]; take air with constant specific heats.',
    '',
    'Find:',
    '',
    '1. the mass flow rate of the air,',
    '2. the exit temperature,',
    '3. the exit pressure.',
  ].join('\n'),
  givens: [
    range('p1', 'inlet pressure', 'kPa', 60, 90, 5),
    range('T1', 'inlet temperature', '°C', -20, 10, 5),
    range('V1', 'inlet velocity', 'km/h', 700, 950, 50),
    choice('V2', 'exit velocity', 'm/s', [20, 30, 40]),
    choice('etaD', 'diffuser isentropic efficiency', '', [0.88, 0.92, 0.96]),
    range('A1', 'inlet area', 'cm^2', 3000, 5000, 500),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'diffuser',
    inputs: { gas: 'air', p1: 'p1', T1: 'T1', V1: 'V1', V2: 'V2', efficiency: 'etaD', inletArea: 'A1' },
  },
  finds: [
    output('mdot', 'Mass flow rate of the air', 'totals.massFlow', 'kg/s', 2),
    output('T2', 'Exit temperature', 'totals.exitTemperature', 'K', 2),
    output('p2', 'Exit pressure', 'totals.exitPressure', 'kPa', 3),
  ],
}

const turbojet: ProblemDefinition = {
  format: 2,
  title: 'Turbojet in cruise',
  tags: {
    topics: ['steady flow', 'jet propulsion', 'turbojet', 'thrust', 'propulsive efficiency', 'isentropic efficiency'],
    difficulty: 'challenging',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    FLOW_CAUTION,
    '',
    'A turbojet flies at [V1] where the air is at [pa] and [Ta]. The compressor pressure ratio is [rp] and the gas enters the turbine at [T4]. The compressor and the turbine have isentropic efficiencies of [etaC, 2 dp] and [etaT, 2 dp]; the diffuser and the nozzle are ideal, the nozzle expands to the ambient pressure, and [mdot] of air flows through the engine. Take air with constant specific heats (cp = 1.005 kJ/(kg·K)) for the whole engine and treat the velocities after the diffuser and before the nozzle as negligible.',
    '',
    'Find:',
    '',
    '1. the compressor work input per kilogram of air, as a positive number,',
    '2. the velocity of the exhaust gases,',
    '3. the thrust,',
    '4. the propulsive power,',
    '5. the propulsive efficiency (propulsive power over the kinetic energy gained by the air),',
    '6. the overall efficiency (propulsive power over the rate of heat added).',
  ].join('\n'),
  givens: [
    range('V1', 'flight speed', 'km/h', 800, 1000, 50),
    choice('pa', 'ambient pressure', 'kPa', [26.5, 30.1, 34.5]),
    choice('Ta', 'ambient temperature', '°C', [-50, -45, -40]),
    range('rp', 'compressor pressure ratio', '', 8, 14, 1),
    range('T4', 'turbine inlet temperature', 'K', 1150, 1350, 50),
    choice('etaC', 'compressor isentropic efficiency', '', [0.82, 0.85, 0.88]),
    choice('etaT', 'turbine isentropic efficiency', '', [0.86, 0.89, 0.92]),
    range('mdot', 'air mass flow rate', 'kg/s', 30, 60, 5),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'turbojet',
    inputs: {
      gas: 'air',
      flightSpeed: 'V1',
      ambientPressure: 'pa',
      ambientTemperature: 'Ta',
      pressureRatio: 'rp',
      turbineInletT: 'T4',
      compressorEfficiency: 'etaC',
      turbineEfficiency: 'etaT',
      massFlow: 'mdot',
    },
  },
  finds: [
    output('Wc', 'Compressor work input per kg of air', 'devices.2.w', 'kJ/kg', 2, {
      sense: 'work-on-system',
      pitfalls: ['sign-convention-flipped', 'kilo-factor'],
    }),
    output('V6', 'Velocity of the exhaust gases', 'totals.exitVelocity', 'm/s', 3),
    output('F', 'Thrust', 'totals.thrust', 'kN', 3),
    output('WP', 'Propulsive power', 'totals.propulsivePower', 'kW', 2),
    output('etaP', 'Propulsive efficiency', 'totals.propulsiveEfficiency', '', 2),
    output('etaO', 'Overall efficiency', 'totals.overallEfficiency', '', 2),
  ],
}

// ---- Second law on a template: a gas-turbine plant's power and exergy destroyed ---------------

const braytonExergy: ProblemDefinition = {
  format: 2,
  title: 'Gas-turbine plant: net power, entropy generation and exergy destroyed',
  tags: {
    topics: ['brayton', 'gas turbine', 'second law', 'exergy', 'entropy generation', 'power'],
    difficulty: 'challenging',
    level: 'second-year',
  },
  convention: 'course',
  prompt: [
    'A gas-turbine plant takes in [mdot] of air from the surroundings at 100 kPa and 300 K and compresses it through a pressure ratio of [rp]. The compressor and turbine have isentropic efficiencies of [etaC, 2 dp] and [etaT, 2 dp]. Heat is added at constant pressure up to a turbine inlet temperature of [TIT], from a source at 1,600 K; the exhaust gives its heat to the surroundings at 300 K, which are also the dead state (300 K, 100 kPa).',
    '',
    'Treat the working fluid as air with constant specific heats (air-standard analysis) and neglect kinetic and potential energy. Find:',
    '',
    '1. the net power delivered by the plant,',
    '2. the entropy generated in the heat addition, per kg of air,',
    '3. the rate at which the plant destroys exergy,',
    '4. the second-law efficiency of the plant, against a reversible engine between the source and the surroundings.',
  ].join('\n'),
  givens: [
    range('mdot', 'mass flow rate of air', 'kg/s', 15, 25, 5),
    range('rp', 'compressor pressure ratio', '', 8, 14, 1),
    range('TIT', 'turbine inlet temperature', 'K', 1200, 1400, 50),
    choice('etaC', 'compressor isentropic efficiency', '', [0.82, 0.85, 0.88]),
    choice('etaT', 'turbine isentropic efficiency', '', [0.86, 0.88, 0.9]),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'brayton',
    inputs: {
      gas: 'air',
      p1: '100 kPa',
      T1: '300 K',
      pressureRatio: 'rp',
      turbineInletT: 'TIT',
      compressorEfficiency: 'etaC',
      turbineEfficiency: 'etaT',
      sourceTemperature: '1600 K',
      sinkTemperature: '300 K',
      deadStateTemperature: '300 K',
      deadStatePressure: '100 kPa',
      massFlow: 'mdot',
    },
  },
  finds: [
    output('Wdot', 'Net power delivered by the plant', 'totals.rate.netPower', 'MW', 3, {
      sense: 'work-by-system',
      pitfalls: ['sign-convention-flipped'],
    }),
    output('sgen', 'Entropy generated in the heat addition, per kg of air', 'steps.2.entropyGenerated', 'kJ/(kg K)', 2),
    output('Xdest', 'Rate of exergy destruction', 'totals.rate.exergyDestroyed', 'MW', 3),
    output('etaII', 'Second-law efficiency', 'totals.secondLawEfficiency', '', 2),
  ],
}

// ---- Steam plants: feedwater heaters and cogeneration -------------------------------------

const rankineFeedwater: ProblemDefinition = {
  format: 2,
  title: 'Steam plant with a closed feedwater heater and a deaerator',
  tags: {
    topics: ['rankine', 'steam', 'feedwater heater', 'deaerator', 'regeneration'],
    difficulty: 'challenging',
    level: 'upper-level',
  },
  convention: 'course',
  prompt: [
    STEAM_CAUTION,
    '',
    'Steam leaves the boiler of a regenerative plant at 10 MPa and [TIT] and expands in an ideal turbine to 10 kPa. Steam is bled at [pC] to a closed feedwater heater, whose drain is trapped back into a deaerator (an open heater) fed with steam bled at 0.4 MPa. The closed heater has a terminal temperature difference of [TTD]; the deaerator and the condenser deliver saturated liquid, and the pumps are ideal.',
    '',
    'Per kilogram of steam through the boiler, find:',
    '',
    '1. the fraction of steam bled to the closed heater,',
    '2. the fraction bled to the deaerator,',
    '3. the net work output (a magnitude),',
    '4. the thermal efficiency.',
  ].join('\n'),
  givens: [
    range('TIT', 'turbine inlet temperature', '°C', 500, 575, 25),
    choice('pC', 'closed feedwater heater pressure', 'MPa', [1.5, 2, 2.5]),
    choice('TTD', 'terminal temperature difference of the closed heater', 'K', [0, 3, 5]),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'rankine-feedwater',
    inputs: {
      boilerPressure: '10 MPa',
      condenserPressure: '10 kPa',
      turbineInletTemperature: 'TIT',
      heaters: [
        { kind: 'closed', pressure: 'pC', ttd: 'TTD', drains: 'backward' },
        { kind: 'open', pressure: '0.4 MPa', name: 'deaerator' },
      ],
    },
  },
  finds: [
    output('y1', 'Fraction of steam bled to the closed heater', 'heaters.1.bleedFraction', '', 3, {
      tolerance: rel(0.02),
    }),
    output('y2', 'Fraction of steam bled to the deaerator', 'totals.bleedFractions.2', '', 3, {
      tolerance: rel(0.02),
    }),
    output('wNet', 'Net work output per kg of steam', 'totals.netWork', 'kJ/kg', 3, {
      pitfalls: ['kilo-factor'],
      sense: 'work-by-system',
    }),
    output('eta', 'Thermal efficiency', 'totals.efficiency', '', 2),
  ],
}

const rankineCogeneration: ProblemDefinition = {
  format: 2,
  title: 'Cogeneration plant: process heat and utilisation factor',
  tags: {
    topics: ['rankine', 'steam', 'cogeneration', 'process heat', 'utilisation factor'],
    difficulty: 'standard',
    level: 'upper-level',
  },
  convention: 'course',
  prompt: [
    STEAM_CAUTION,
    '',
    'A small plant raises steam at 7 MPa and 500 °C. A fraction [f, 2 dp] of it is extracted from the turbine at [pP] to a process heater, which returns saturated liquid that is pumped back to the boiler; the rest expands to 10 kPa, is condensed and pumped back. Turbine and pumps are ideal.',
    '',
    'Per kilogram of steam through the boiler, find:',
    '',
    '1. the heat delivered to the process,',
    '2. the net work output (a magnitude),',
    '3. the utilisation factor.',
  ].join('\n'),
  givens: [
    range('f', 'fraction of the steam extracted to the process', '', 0.2, 0.5, 0.05),
    choice('pP', 'process steam pressure', 'kPa', [300, 500, 700]),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'rankine-cogeneration',
    inputs: {
      boilerPressure: '7 MPa',
      condenserPressure: '10 kPa',
      turbineInletTemperature: '500 °C',
      processPressure: 'pP',
      processFraction: 'f',
    },
  },
  finds: [
    output('Qp', 'Heat delivered to the process per kg of steam', 'totals.processHeat', 'kJ/kg', 3, {
      pitfalls: ['kilo-factor'],
    }),
    output('wNet', 'Net work output per kg of steam', 'totals.netWork', 'kJ/kg', 3, {
      pitfalls: ['kilo-factor'],
      sense: 'work-by-system',
    }),
    output('epsU', 'Utilisation factor', 'totals.utilisationFactor', '', 2),
  ],
}

// ---- Refrigeration: two-stage compression and a cascade -----------------------------------

const twoStageFlash: ProblemDefinition = {
  format: 2,
  title: 'Two-stage R-134a refrigerator with a flash chamber',
  tags: {
    topics: ['refrigeration', 'vapour compression', 'two-stage compression', 'flash chamber', 'R-134a'],
    difficulty: 'challenging',
    level: 'upper-level',
  },
  convention: 'course',
  prompt: [
    REFRIGERANT_CAUTION,
    '',
    'A cold store is cooled by a two-stage vapour-compression refrigerator on R-134a. The refrigerant leaves the evaporator as saturated vapour at [TL] and the condenser as saturated liquid at [TH]. The liquid is throttled into an open flash chamber at [pI]; the flash vapour mixes with the low-stage discharge before the high-stage compressor, and the flash liquid is throttled into the evaporator. Both adiabatic compressors have an isentropic efficiency of [etaC, 2 dp], and [mdot] of refrigerant flows through the condenser.',
    '',
    'Find:',
    '',
    '1. the fraction of the refrigerant that flashes to vapour in the flash chamber,',
    '2. the refrigeration effect per kilogram of refrigerant through the condenser,',
    '3. the work input of both compressors per kilogram through the condenser, as a positive number,',
    '4. the coefficient of performance,',
    '5. the mass flow rate through the evaporator,',
    '6. the heat rejected in the condenser per kilogram, as a positive number.',
  ].join('\n'),
  givens: [
    range('TL', 'evaporator saturation temperature', '°C', -30, -20, 2),
    range('TH', 'condenser saturation temperature', '°C', 30, 40, 5),
    choice('pI', 'flash chamber pressure', 'MPa', [0.3, 0.32, 0.36]),
    choice('etaC', 'isentropic efficiency of each compressor', '', [0.8, 0.85, 0.9]),
    range('mdot', 'refrigerant mass flow rate through the condenser', 'kg/s', 0.04, 0.08, 0.01),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'vapour-compression-two-stage',
    inputs: {
      refrigerant: 'R134a',
      evaporatorTemperature: 'TL',
      condenserTemperature: 'TH',
      intermediatePressure: 'pI',
      compressorEfficiency: 'etaC',
      highStageMassFlow: 'mdot',
    },
  },
  finds: [
    output('x6', 'Fraction of the refrigerant that flashes to vapour', 'totals.flashVapourFraction', '', 2),
    output('qL', 'Refrigeration effect per kg through the condenser', 'totals.refrigerationEffect', 'kJ/kg', 3, {
      sense: 'heat-into-system',
      pitfalls: ['kilo-factor'],
    }),
    output('Win', 'Work input of both compressors per kg through the condenser', 'totals.compressorWork', 'kJ/kg', 3, {
      sense: 'work-on-system',
      pitfalls: ['kilo-factor'],
    }),
    output('cop', 'Coefficient of performance', 'totals.copRefrigerator', '', 2),
    output('mLow', 'Mass flow rate through the evaporator', 'totals.lowStageMassFlow', 'kg/s', 2),
    output('qH', 'Heat rejected in the condenser per kg', 'devices.5.q', 'kJ/kg', 2, {
      sense: 'heat-out-of-system',
      pitfalls: ['kilo-factor'],
    }),
  ],
}

const cascadeFreezer: ProblemDefinition = {
  format: 2,
  title: 'Cascade laboratory freezer: R-744 below R-134a',
  tags: {
    topics: ['refrigeration', 'cascade', 'vapour compression', 'R-744', 'R-134a', 'coefficient of performance'],
    difficulty: 'challenging',
    level: 'upper-level',
  },
  convention: 'course',
  prompt: [
    REFRIGERANT_CAUTION,
    '',
    'An ultra-low-temperature laboratory freezer removes [QL] from its cabinet with a cascade of two vapour-compression cycles. The lower cycle runs on R-744 (carbon dioxide): it evaporates at [TL] and condenses at [TX] in the cascade heat exchanger, where the upper cycle, on R-134a, evaporates at −10 °C. The upper cycle condenses at [TH]. Each cycle leaves its evaporator as saturated vapour and its condenser as saturated liquid, the exchanger is adiabatic, and both adiabatic compressors have an isentropic efficiency of [etaC, 2 dp].',
    '',
    'Find:',
    '',
    '1. the mass flow rate of R-134a per unit mass flow rate of R-744,',
    '2. the mass flow rate of R-744,',
    '3. the work input of the upper (R-134a) compressor per kilogram of R-744, as a positive number,',
    '4. the coefficient of performance of the cascade,',
    '5. the total compressor power input.',
  ].join('\n'),
  givens: [
    range('QL', 'refrigeration capacity', 'kW', 1.5, 3, 0.5),
    range('TL', 'R-744 evaporating temperature', '°C', -50, -40, 5),
    range('TX', 'R-744 condensing temperature in the cascade heat exchanger', '°C', -8, -4, 2),
    range('TH', 'R-134a condensing temperature', '°C', 35, 45, 5),
    choice('etaC', 'isentropic efficiency of each compressor', '', [0.75, 0.8, 0.85]),
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'vapour-compression-cascade',
    inputs: {
      lowerRefrigerant: 'R744',
      upperRefrigerant: 'R134a',
      evaporatorTemperature: 'TL',
      lowerCondenserTemperature: 'TX',
      upperEvaporatorTemperature: '-10 °C',
      condenserTemperature: 'TH',
      compressorEfficiency: 'etaC',
      capacity: 'QL',
    },
  },
  finds: [
    output('ratio', 'Mass flow rate of R-134a per unit mass flow rate of R-744', 'totals.massFlowRatio', '', 2),
    output('mB', 'Mass flow rate of R-744', 'totals.lowerMassFlow', 'g/s', 2),
    output('wA', 'Upper compressor work input per kg of R-744', 'totals.upperCompressorWork', 'kJ/kg', 3, {
      sense: 'work-on-system',
      pitfalls: ['kilo-factor'],
    }),
    output('cop', 'Coefficient of performance of the cascade', 'totals.copRefrigerator', '', 2),
    output('Wdot', 'Total compressor power input', 'totals.compressorPower', 'kW', 2, { sense: 'work-on-system' }),
  ],
}

export const DEMO_PROBLEMS: readonly DemoProblem[] = [
  { owner: 'amara', visibility: 'department', definition: carnotEngine },
  { owner: 'tobias', visibility: 'department', definition: carnotRefrigerator },
  { owner: 'amara', visibility: 'private', definition: carnotHeatPump },
  { owner: 'tobias', visibility: 'installation', definition: ottoV2, earlierVersions: [ottoV1] },
  { owner: 'tobias', visibility: 'department', definition: diesel },
  { owner: 'tobias', visibility: 'private', definition: dual },
  { owner: 'tobias', visibility: 'installation', definition: brayton },
  { owner: 'tobias', visibility: 'department', definition: braytonRegenerative },
  { owner: 'tobias', visibility: 'department', definition: braytonIntercoolReheat },
  { owner: 'amara', visibility: 'department', definition: atkinson },
  { owner: 'amara', visibility: 'private', definition: miller },
  { owner: 'amara', visibility: 'department', definition: stirling },
  { owner: 'tobias', visibility: 'private', definition: stirlingAir, copiedFrom: stirling.title },
  { owner: 'amara', visibility: 'installation', definition: ericsson },
  { owner: 'tobias', visibility: 'installation', definition: rankine },
  { owner: 'tobias', visibility: 'department', definition: rankineReheat },
  { owner: 'tobias', visibility: 'private', definition: rankineRegenerative },
  { owner: 'tobias', visibility: 'department', definition: steamCarnot },
  { owner: 'amara', visibility: 'department', definition: steamCalorimeter },
  { owner: 'tobias', visibility: 'department', definition: combinedCycle },
  { owner: 'amara', visibility: 'installation', definition: waterPiston },
  { owner: 'tobias', visibility: 'department', definition: vapourCompression },
  { owner: 'amara', visibility: 'department', definition: threeStep },
  { owner: 'amara', visibility: 'department', definition: nozzle },
  { owner: 'amara', visibility: 'private', definition: diffuser },
  { owner: 'tobias', visibility: 'department', definition: turbojet },
  { owner: 'tobias', visibility: 'department', definition: braytonExergy },
  { owner: 'tobias', visibility: 'department', definition: rankineFeedwater },
  { owner: 'amara', visibility: 'department', definition: rankineCogeneration },
  { owner: 'tobias', visibility: 'department', definition: twoStageFlash },
  { owner: 'amara', visibility: 'department', definition: cascadeFreezer },
]
