// Turns what students (and instructors) actually type into the plain ASCII syntax the
// restricted parser reads. Pure string work; no mathjs here except through the
// `isUnitName` callback the caller passes in.
//
// The rules, in the order they run (documented for the integrator in the report/docs):
//  1. Unicode NFC; no-break, thin and other special spaces become a plain space;
//     zero-width characters are removed; tabs and line breaks inside stay as they are
//     (a line break later reads as "two expressions" and is refused).
//  2. Minus signs: − (U+2212), ‒ – (figure/en dash), ﹣ and － become "-".
//  3. Superscripts: a run such as ³ or ⁻¹ becomes ^3 or ^-1 (m³ → m^3, 10⁴ → 10^4).
//  4. Temperatures: °C, ºC, ˚C, ℃, "deg C", "degrees Celsius", "Celsius" → degC;
//     the same for F → degF, °R → degR; °K and "Kelvin" → K. A lone ° becomes the angle
//     unit deg (so "27°" is read as an angle and refused for a temperature, with a hint).
//  5. Powers of ten: 1.2×10^4, 1.2 x 10^4, 1.2X10^4, 1.2*10^4, 1.2·10^4, 1.2×10^(−4)
//     → 1.2e4 / 1.2e-4 (the mantissa as typed is kept, so its significant figures count).
//  6. µ and μ (micro) → u, the mathjs micro prefix; π → pi; ÷ → /.
//  7. A dot between two letters is a multiplication dot: kg.K → kg·K.
//  8. The slash rule for units: after a "/", a chain of unit names joined by ·, * or
//     spaces is the whole denominator: kJ/kg·K = kJ/kg*K = kJ/kg K = kJ/(kg·K).
//     Only applied when every name in the chain is a unit (not a variable, constant or
//     function). Write (kJ/kg)·K to mean the other thing.
//  9. Remaining ·, ⋅, ∙, •, × become "*".

const SPECIAL_SPACES = /[\u00A0\u1680\u2000-\u200A\u202F\u205F\u3000]/g
const ZERO_WIDTH = /[\u00AD\u200B-\u200D\u2060\uFEFF]/g
const MINUSES = /[\u2212\u2012\u2013\uFE63\uFF0D]/g

const SUPERSCRIPTS: Readonly<Record<string, string>> = {
  '\u2070': '0',
  '\u00B9': '1',
  '\u00B2': '2',
  '\u00B3': '3',
  '\u2074': '4',
  '\u2075': '5',
  '\u2076': '6',
  '\u2077': '7',
  '\u2078': '8',
  '\u2079': '9',
  '\u207B': '-',
  '\u207A': '+',
}
const SUPERSCRIPT_RUN = /[\u2070\u00B9\u00B2\u00B3\u2074-\u2079\u207B\u207A]+/g

const DEGREE = '[\u00B0\u00BA\u02DA]'
const TEMPERATURE_RULES: ReadonlyArray<readonly [RegExp, string]> = [
  [/\u2103/g, ' degC'],
  [/\u2109/g, ' degF'],
  [new RegExp(`${DEGREE}\\s*C(?![A-Za-z0-9_])`, 'g'), ' degC'],
  [new RegExp(`${DEGREE}\\s*F(?![A-Za-z0-9_])`, 'g'), ' degF'],
  [new RegExp(`${DEGREE}\\s*R(?![A-Za-z0-9_])`, 'g'), ' degR'],
  [new RegExp(`${DEGREE}\\s*K(?![A-Za-z0-9_])`, 'g'), ' K'],
  [/\bdeg(?:ree)?s?\.?\s*(?:Celsius|celsius|C)(?![A-Za-z0-9_])/g, ' degC'],
  [/\bdeg(?:ree)?s?\.?\s*(?:Fahrenheit|fahrenheit|F)(?![A-Za-z0-9_])/g, ' degF'],
  [/\bCelsius\b/g, ' degC'],
  [/\bFahrenheit\b/g, ' degF'],
  [/\bKelvins?\b/g, ' K'],
  [new RegExp(DEGREE, 'g'), ' deg'],
]

// mantissa (digits, optional point) × 10 ^ exponent → mantissa e exponent
// The mantissa must be a whole literal (not the tail of a name or of 1e3), and the exponent
// must end there (no 10^3.5, no 10^3^2).
const TIMES_TEN_SIGNS = '\\u00D7*\\u00B7\\u22C5\\u2219\\u2022'
function timesTenPattern(letterX: boolean): RegExp {
  const signs = (letterX ? 'xX' : '') + TIMES_TEN_SIGNS
  return new RegExp(
    `(?<![A-Za-z0-9_.])(\\d+\\.?\\d*|\\.\\d+)\\s*[${signs}]\\s*10\\s*\\^\\s*(?:\\(\\s*([+-]?\\d+)\\s*\\)|([+-]?\\d+)(?![\\d.^]))`,
    'g',
  )
}
const TIMES_TEN_WITH_X = timesTenPattern(true)
const TIMES_TEN_WITHOUT_X = timesTenPattern(false)

const MIDDLE_DOTS = /[\u00B7\u22C5\u2219\u2022]/g
const LETTER_DOT_LETTER = /(?<=[A-Za-z])\.(?=[A-Za-z])/g

export interface TypographyOptions {
  /** Decides which names the slash rule may group (units, not variables or constants). */
  readonly isUnitName: (name: string) => boolean
  /** Whether a letter x/X between a number and 10^n is a times sign (default true). Pass
   *  false when x or X is a variable name. */
  readonly letterXIsTimes?: boolean
}

/** Normalises typography; see the rules in the header. Never throws on a string. */
export function normalizeTypography(text: string, options: TypographyOptions): string {
  const { isUnitName } = options
  let s = text.normalize('NFC')
  s = s.replace(SPECIAL_SPACES, ' ').replace(ZERO_WIDTH, '').replace(MINUSES, '-')
  s = s.replace(SUPERSCRIPT_RUN, (run) => '^' + Array.from(run, (c) => SUPERSCRIPTS[c] ?? '').join(''))
  for (const [pattern, replacement] of TEMPERATURE_RULES) s = s.replace(pattern, replacement)
  const timesTen = options.letterXIsTimes === false ? TIMES_TEN_WITHOUT_X : TIMES_TEN_WITH_X
  s = s.replace(timesTen, (_m, mantissa: string, inParens?: string, bare?: string) => {
    return `${mantissa}e${inParens ?? bare ?? ''}`
  })
  s = s
    .replace(/[\u00B5\u03BC]/g, 'u')
    .replace(/\u03C0/g, 'pi')
    .replace(/\u00F7/g, '/')
  s = s.replace(LETTER_DOT_LETTER, '\u00B7')
  s = s.replace(MIDDLE_DOTS, '\u00B7')
  s = s.replace(/ {2,}/g, ' ').replace(/\( /g, '(').replace(/ \)/g, ')')
  s = applySlashRule(s, isUnitName)
  s = s.replace(/[\u00B7\u00D7]/g, '*')
  return s.trim()
}

const IDENT_START = /[A-Za-z_]/
const IDENT_PART = /[A-Za-z0-9_]/

interface ChainMember {
  readonly name: string
  readonly end: number
}

/**
 * The slash rule (see the header). Scans for "/", then reads `ident[^exp] (joiner ident[^exp])*`
 * where a joiner is ·, * or whitespace. With two or more members, all of them units and
 * no "(" right after the chain (that would make the last name a function), the chain is
 * wrapped in parentheses.
 */
export function applySlashRule(s: string, isUnitName: (name: string) => boolean): string {
  let out = ''
  let i = 0
  while (i < s.length) {
    const c = s[i]
    if (c !== '/') {
      out += c
      i++
      continue
    }
    out += '/'
    i++
    let j = skipSpaces(s, i)
    const members: ChainMember[] = []
    let chainEnd = -1
    for (;;) {
      const member = readUnitFactor(s, j)
      if (!member) break
      members.push(member)
      chainEnd = member.end
      // a joiner, then another factor?
      let k = member.end
      const afterSpaces = skipSpaces(s, k)
      let joined = afterSpaces > k
      k = afterSpaces
      if (s[k] === '\u00B7' || s[k] === '*') {
        joined = true
        k = skipSpaces(s, k + 1)
      }
      if (!joined || !s[k] || !IDENT_START.test(s[k] ?? '')) break
      j = k
    }
    const next = chainEnd >= 0 ? s[skipSpaces(s, chainEnd)] : undefined
    if (members.length >= 2 && next !== '(' && members.every((m) => isUnitName(m.name))) {
      out += '(' + s.slice(skipSpaces(s, i), chainEnd) + ')'
      i = chainEnd
    }
  }
  return out
}

function skipSpaces(s: string, i: number): number {
  let k = i
  while (k < s.length && (s[k] === ' ' || s[k] === '\t')) k++
  return k
}

/** ident, optionally followed by ^[+-]digits[.digits]; returns null when s[i] starts no name. */
function readUnitFactor(s: string, i: number): ChainMember | null {
  if (!IDENT_START.test(s[i] ?? '')) return null
  let k = i + 1
  while (k < s.length && IDENT_PART.test(s[k] ?? '')) k++
  const name = s.slice(i, k)
  if (s[k] === '(') return { name, end: k } // a function call: the caller refuses the chain
  const exp = /^\^[+-]?\d+(?:\.\d+)?/.exec(s.slice(k))
  if (exp) k += exp[0].length
  return { name, end: k }
}
