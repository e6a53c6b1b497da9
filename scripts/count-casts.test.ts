import { describe, expect, it } from 'vitest'
import { assertionsIn } from './count-casts.ts'

describe('count:casts', () => {
  it('counts `as T` and `<T>x`, a double assertion twice, and leaves `as const` out', () => {
    const found = assertionsIn(
      'x.ts',
      [
        'const a = b as string',
        'const c = <number>d',
        'const e = f as unknown as Date',
        "const g = ['x'] as const",
        '// a comment that says "as string" is not code',
        "const h = 'as T in a string'",
      ].join('\n'),
    )
    expect(found.map((f) => [f.line, f.text])).toEqual([
      [1, 'b as string'],
      [2, '<number>d'],
      [3, 'f as unknown as Date'],
      [3, 'f as unknown'],
    ])
  })

  it('reads TSX, where `<T>x` cannot be written', () => {
    expect(assertionsIn('x.tsx', 'const el = <div>{(n as number) + 1}</div>').map((f) => f.text)).toEqual([
      'n as number',
    ])
  })
})
