/**
 * The worked solution of one variant. The code lives in ./worked-solution/: shared numbers,
 * units and symbols (common.ts), one module per result shape (ideal-gas.ts, rankine.ts,
 * refrigeration.ts), the givens and key (key.ts), and the assembly and HTML (index.ts).
 */
export * from './worked-solution/index.ts'
