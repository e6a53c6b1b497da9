import { describe, expect, test } from 'vitest'
import type { DrawnGiven } from './definition.ts'
import { UNCLOSED_DISPLAY, UNCLOSED_INLINE, renderMarkdown, renderPrompt } from './prompt.ts'

const T1: DrawnGiven = { name: 'T1', label: 'inlet temperature', value: 300, unit: 'K', text: '300 K' }
const r: DrawnGiven = { name: 'r', label: 'compression ratio', value: 8, unit: '', text: '8' }

describe('renderPrompt', () => {
  test('Markdown, placeholders in text and in math', () => {
    const out = renderPrompt('Air enters at **[T1]** ([T1 in °C]). With $r = [r]$ and $T_1 = [T1]$:', [T1, r])
    expect(out.errors).toEqual([])
    expect(out.html).toContain('<strong>300\u00A0K</strong> (26.85\u00A0°C)')
    // KaTeX with MathML beside the HTML, the annotation keeping the TeX source.
    expect(out.html.match(/<math/g)).toHaveLength(2)
    expect(out.html).toContain('<annotation encoding="application/x-tex">T_1 = 300\\,\\mathrm{K}</annotation>')
    expect(out.html).toContain('<annotation encoding="application/x-tex">r = 8</annotation>')
  })

  test('display math, as a block and inline', () => {
    const out = renderPrompt(
      'Efficiency:\n\n$$\n\\eta = 1 - r^{1-\\gamma}\n$$\n\nand $$W = Q_{in} - Q_{out}$$ too.',
      [],
    )
    expect(out.errors).toEqual([])
    expect(out.html).toContain('<div class="math-display">')
    expect(out.html.match(/class="katex-display"/g)).toHaveLength(2)
    expect(out.html.match(/display="block"/g)).toHaveLength(2)
  })

  test('Markdown does not reach inside math: _ and * stay TeX', () => {
    const out = renderPrompt('$a_1 * b_2$ and _this_ is emphasis', [])
    expect(out.html).toContain('<annotation encoding="application/x-tex">a_1 * b_2</annotation>')
    expect(out.html).toContain('<em>this</em>')
  })

  test('$ inside code spans and code blocks stays literal, and so does [T1]', () => {
    const out = renderPrompt('Use `$x$ and [T1]` here.\n\n```\n$$ y $$\n```\n', [T1])
    expect(out.html).toContain('<code>$x$ and [T1]</code>')
    expect(out.html).toContain('<pre><code>$$ y $$\n</code></pre>')
    expect(out.html).not.toContain('<math')
    expect(out.errors).toEqual([])
  })

  test('\\$ is a literal dollar and money is not math', () => {
    const out = renderPrompt('Fuel costs \\$5 per litre, not $5 and $6.', [])
    expect(out.html).toContain('Fuel costs $5 per litre, not $5 and $6.')
    expect(out.html).not.toContain('<math')
    expect(out.errors).toEqual([])
  })

  test('an unclosed $ is reported and its text still shows', () => {
    const out = renderPrompt('The fee is $x per **kg**.', [])
    expect(out.errors).toEqual([{ message: 'A $ starts math that is never closed; write \\$ for a dollar sign.' }])
    expect(out.html).toContain('The fee is $x per <strong>kg</strong>.')
    expect(out.html).not.toContain('<math')
  })

  test('a closing $ must be in the same paragraph', () => {
    const out = renderPrompt('Start $x here\n\nand $y$ there', [])
    expect(out.errors).toEqual([{ message: UNCLOSED_INLINE }])
    expect(out.html).toContain('<p>Start $x here</p>')
    expect(out.html.match(/<math/g)).toHaveLength(1)
  })

  test('each unclosed $ is reported once, an unclosed $$ once as display math', () => {
    const out = renderPrompt('Energy $$E = mc^2 and $a, then $b.', [])
    expect(out.errors).toEqual([
      { message: UNCLOSED_DISPLAY },
      { message: UNCLOSED_INLINE },
      { message: UNCLOSED_INLINE },
    ])
    expect(out.html).toContain('Energy $$E = mc^2 and $a, then $b.')
    const block = renderPrompt('$$\n\\eta = 1\n\nNo closing line.', [])
    expect(block.errors).toEqual([{ message: UNCLOSED_DISPLAY }])
  })

  test.each([
    ['money: a digit after the $', 'It costs $5 and $6 per tonne.'],
    ['money at the end of a sentence', 'Fuel was $3.'],
    ['a $ before a space is no opener', 'Pay $ 5 now'],
    ['a $ at the end', 'Priced in US$'],
    ['an escaped dollar', 'Write \\$x for a dollar.'],
    ['in a code span', 'Type `$x` here.'],
    ['closed math', 'With $x$ and $$y$$.'],
  ])('no unclosed-math error: %s', (_name, text) => {
    expect(renderPrompt(text, []).errors).toEqual([])
  })

  test('\\[ shows a bracket that is only a bracket; @{ is plain text now', () => {
    const out = renderPrompt('write \\[T1] and @{T1}', [T1])
    expect(out.html).toContain('write [T1] and @{T1}')
    expect(out.errors).toEqual([])
  })

  test('a link stays a link, and a placeholder in its text still works', () => {
    const out = renderPrompt('See [the tables at [T1]](https://example.org/t) and [T1].', [T1])
    expect(out.html).toContain(
      '<a href="https://example.org/t" rel="nofollow noopener noreferrer">the tables at 300\u00A0K</a> and 300\u00A0K.',
    )
    expect(out.errors).toEqual([])
  })

  test('TeX brackets stay TeX: \\sqrt[n] and \\left[', () => {
    const out = renderPrompt('$\\sqrt[n]{x} + \\left[T1 \\right] = [T1]$', [T1])
    expect(out.errors).toEqual([])
    expect(out.html).toContain(
      '<annotation encoding="application/x-tex">\\sqrt[n]{x} + \\left[T1 \\right] = 300\\,\\mathrm{K}</annotation>',
    )
  })

  test('raw HTML is escaped, never passed through', () => {
    const out = renderPrompt(
      '<script>alert(1)</script>\n\nHi <img src=x onerror=alert(1)> <b onmouseover="x()">b</b>',
      [],
    )
    expect(out.html).not.toMatch(/<script|<img|<b /)
    expect(out.html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;')
    expect(out.html).toContain('&lt;img src=x onerror=alert(1)&gt;')
  })

  test('only http, https and mailto links; no images', () => {
    const out = renderPrompt(
      '[a](javascript:alert(1)) [b](https://example.org/x) [c](mailto:staff@example.org) [d](data:text/html,hi) ![e](https://example.org/e.png)',
      [],
    )
    expect(out.html).not.toContain('href="javascript')
    expect(out.html).not.toContain('href="data:')
    expect(out.html).toContain('<a href="https://example.org/x" rel="nofollow noopener noreferrer">b</a>')
    expect(out.html).toContain('<a href="mailto:staff@example.org" rel="nofollow noopener noreferrer">c</a>')
    expect(out.html).not.toContain('<img')
  })

  test('TeX cannot smuggle links or HTML (KaTeX trust off)', () => {
    const out = renderPrompt('$\\href{javascript:alert(1)}{x}$ $\\htmlClass{a}{b}$', [])
    expect(out.html).not.toContain('href="javascript')
    expect(out.html).not.toContain('class="a"')
  })

  test('unknown givens and bad options show a marked span and an error, never a throw', () => {
    const out = renderPrompt('At [T9], [T1, 3 sig] and $[T9]$ and [see note]', [T1])
    expect(out.html).toContain('<span class="placeholder-error" role="note">[unknown given T9]</span>')
    expect(out.html).toContain('[unknown option')
    expect(out.html).toContain('[cannot read [see note]')
    expect(out.html).toContain('<math')
    const messages = out.errors.map((e) => e.message)
    expect(messages).toHaveLength(4)
    expect(messages).toEqual(
      expect.arrayContaining([
        'placeholder [T9]: unknown given T9',
        expect.stringMatching(/^placeholder: unknown option/),
        'placeholder in math: unknown given T9',
        expect.stringMatching(/^placeholder: cannot read \[see note\]/),
      ]),
    )
  })

  test('a TeX error is reported and the rest still renders', () => {
    const out = renderPrompt('Before $\\frac{1}{$ after **bold**', [])
    expect(out.errors).toEqual([{ message: expect.stringMatching(/^math: KaTeX parse error/) }])
    expect(out.html).toContain('<strong>bold</strong>')
  })

  test('renderMarkdown: the same pipeline without givens', () => {
    const out = renderMarkdown('A *note* with $x^2$.')
    expect(out.errors).toEqual([])
    expect(out.html).toContain('<em>note</em>')
    expect(out.html).toContain('<math')
  })
})
