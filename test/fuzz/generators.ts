// Generators for fuzzing the analysis, shared by the vitest suite (test/fuzz.test.ts) and the
// standalone runner (test/fuzz/run.ts, `npm run fuzz`): grammar-shaped protocols with plausible,
// often wrong, pieces; random token lines; and mutations (delete, duplicate, insert, swap, digit
// edits) of real protocols. No test framework here, and no file access except `loadExamples`.
//
// Note on fast-check 4: `fc.fullUnicodeString()` was removed in v4; its replacement is
// `fc.string({ unit: 'binary' })` (any code point). Lone surrogates come from a 16-bit unit.
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import * as fc from 'fast-check'

export interface Example {
  name: string
  text: string
}

/** Every `*.cellrun` file in `dir`, sorted by name. */
export function loadExamples(dir: string): Example[] {
  return readdirSync(dir)
    .filter((f) => f.endsWith('.cellrun'))
    .sort()
    .map((f) => ({ name: f, text: readFileSync(join(dir, f), 'utf8') }))
}


export const NEWLINE = fc.constantFrom('\n', '\r\n', '\r')
export const KEYWORDS = [
  'run', 'note', 'conditions', 'let', 'cell', 'vessel', 'compartment', 'separator', 'anode', 'cathode', 'charge', 'step',
  'expect', 'observe', 'handling', 'current', 'voltage', 'for', 'efficiency', 'between', 'and', 'in', 'area', 'solution', 'at',
  'stepp', 'Step', 'cel', 'water', 'H2O',
]
export const UNITS = [
  'g', 'kg', 'mg', 'mol', 'mmol', 'L', 'mL', 'cm^2', 'm^2', 'dm^2', 'A', 'mA', 'kA', 'V', 's', 'min', 'h', 'C', 'Ah', 'mAh', 'Wh',
  'degC', '°C', 'K', 'kPa', 'bar', 'atm', 'mol/L', 'M', 'mM', 'g/L', 'wt%', '%', 'mA/cm^2', 'A/m^2', 'kA/m^2', 'ppmw', 'cm²', 'µA',
]
export const FORMULAS = ['K2CO3', 'KOH', 'NaCl', 'NaOH', 'Cl2', 'H2', 'O2', 'Cu', 'CuSO4·5H2O', 'CuSO4*5H2O', 'CuSO4.5H2O', 'H2SO4', 'SO4^2-', 'OH-', 'Cu^2+', '(NH4)2SO4', 'Xx9', 'C0', 'K2C03', 'H', '[Fe(CN)6]3-']
export const NAMES = ['feed', 'product', 'anolyte', 'catholyte', 'bath', 'area', 'j', 'panel', 'x', '_', 'a-b']
export const KINDS = ['cation-exchange', 'anion-exchange', 'diaphragm', 'none', 'vent', 'scrubber', 'hood', 'ppe', 'bogus']
export const PUNCT = [':', ',', '=', '(', ')', '[', ']', '{', '}', '"', '#', '*', '/', '^', '+', '-', '·', '×', '−', '²', '.', ';', '?', '!', '\t', ' ', '  ']
export const ODD = ['🧪', '𝛼', '\u00a0', '\u200b', '\ud800', '\udfff', 'é', 'µ', '\u0000', '\\', '`']

export const number = fc.oneof(
  fc.integer({ min: -1000, max: 100000 }).map(String),
  fc.double({ noNaN: true, min: -1e6, max: 1e6 }).map((d) => String(d)),
  fc.constantFrom('0', '-0', '.5', '5.', '1e308', '1e400', '1e-400', '1.2.3', '0x1F', '1_000', '90', '100', '3.6', 'NaN', 'Infinity'),
)
export const quantity = fc.oneof(
  fc.tuple(number, fc.constantFrom(...UNITS)).map(([a, u]) => `${a} ${u}`),
  fc.tuple(number, fc.constantFrom(...UNITS), fc.constantFrom('*', '/', '+', '-'), fc.constantFrom(...NAMES, ...UNITS), number).map(
    ([a, u, op, b, c]) => `${a} ${u} ${op} ${b}${op === '+' || op === '-' ? ' ' + c : ''}`,
  ),
  fc.tuple(number, fc.constantFrom(...NAMES)).map(([a, nm]) => `${a} * ${nm}`),
  number,
  fc.constantFrom(...NAMES),
)
export const token = fc.oneof(
  { arbitrary: fc.constantFrom(...KEYWORDS), weight: 4 },
  { arbitrary: fc.constantFrom(...UNITS), weight: 3 },
  { arbitrary: number, weight: 3 },
  { arbitrary: fc.constantFrom(...FORMULAS), weight: 2 },
  { arbitrary: fc.constantFrom(...NAMES), weight: 2 },
  { arbitrary: fc.constantFrom(...KINDS), weight: 1 },
  { arbitrary: fc.constantFrom(...PUNCT), weight: 4 },
  { arbitrary: fc.constantFrom(...ODD), weight: 1 },
)
export const indent = fc.constantFrom('', '', '', '  ', '    ', '\t', ' ')

/** Lines that follow the grammar's shapes with plausible, often wrong, pieces. */
export const templateLine = fc.oneof(
  fc.string({ maxLength: 20 }).map((s) => `run "${s}"`),
  fc.string({ maxLength: 30 }).map((s) => `note ${s}`),
  fc.tuple(quantity, quantity).map(([a, b]) => `conditions ${a}, ${b}`),
  fc.tuple(fc.constantFrom(...NAMES), quantity).map(([nm, q]) => `let ${nm} = ${q}`),
  fc.constant('cell'),
  fc.tuple(indent, fc.constantFrom('polypropylene', 'pvdf', 'glass')).map(([i, m]) => `${i}vessel ${m}`),
  fc.tuple(indent, fc.constantFrom(...NAMES), quantity).map(([i, nm, q]) => `${i}compartment ${nm} ${q}`),
  fc.tuple(indent, fc.constantFrom(...KINDS), fc.constantFrom(...NAMES), fc.constantFrom(...NAMES), fc.option(quantity)).map(
    ([i, k, a, b, q]) => `${i}separator ${k} between ${a} and ${b}${q === null ? '' : `, area ${q}`}`,
  ),
  fc.tuple(indent, fc.constantFrom('anode', 'cathode'), fc.constantFrom('nickel', 'mmo-titanium', 'copper'), fc.constantFrom(...NAMES), fc.option(quantity)).map(
    ([i, r, m, c, q]) => `${i}${r} ${m} in ${c}${q === null ? '' : `, area ${q}`}`,
  ),
  fc.tuple(fc.constantFrom(...NAMES), fc.array(fc.tuple(fc.constantFrom(...FORMULAS, 'water'), quantity, fc.option(quantity)), { minLength: 1, maxLength: 3 })).map(
    ([c, items]) => `charge ${c}: ${items.map(([f, q, conc]) => (conc === null ? `${f} ${q}` : `${f} solution ${q} at ${conc}`)).join(', ')}`,
  ),
  fc.tuple(fc.constantFrom('1', '2', 'main', 'x', '🧪'), fc.array(fc.tuple(fc.constantFrom('current', 'voltage', 'for', 'efficiency', 'curent'), quantity), { minLength: 0, maxLength: 4 })).map(
    ([l, cl]) => `step ${l}: ${cl.map(([k, q]) => `${k} ${q}`).join(', ')}`,
  ),
  fc.tuple(fc.constantFrom('expect', 'observe'), fc.constantFrom(...FORMULAS), quantity, fc.option(fc.constantFrom(...NAMES))).map(
    ([k, f, q, c]) => `${k} ${f} ${q}${c === null ? '' : ` in ${c}`}`,
  ),
  fc.tuple(fc.constantFrom(...KINDS), fc.string({ maxLength: 20 })).map(([k, s]) => `handling ${k}: ${s}`),
)
/** A line of random tokens glued with random separators. */
export const tokenLine = fc
  .tuple(indent, fc.array(fc.tuple(token, fc.constantFrom(' ', '', ', ', ': ', '  ')), { maxLength: 12 }))
  .map(([i, toks]) => i + toks.map(([t, sep]) => t + sep).join(''))
/** A line with a trailing comment, or a template line broken by an edit. */
export const brokenLine = fc.oneof(
  fc.tuple(templateLine, fc.string({ maxLength: 10 })).map(([l, c]) => `${l} # ${c}`),
  fc.tuple(templateLine, fc.nat(), fc.nat({ max: 5 }), token).map(([l, at, del, t]) => {
    const p = at % (l.length + 1)
    return l.slice(0, p) + t + l.slice(p + del)
  }),
)
export const protocolLine = fc.oneof(
  { arbitrary: templateLine, weight: 5 },
  { arbitrary: tokenLine, weight: 3 },
  { arbitrary: brokenLine, weight: 3 },
  { arbitrary: fc.constantFrom('', '   ', '# comment', '\t'), weight: 1 },
)
/** A well-formed cell so that generated steps and yields reach the Faraday and feed-limit code. */
export const CELL = [
  'let area = 50 cm^2',
  'cell',
  '  compartment feed 500 mL',
  '  compartment product 250 mL',
  '  separator cation-exchange between feed and product, area area',
  '  anode nickel in feed, area area',
  '  cathode nickel in product, area area',
  'charge feed: K2CO3 180 g, water 420 mL',
].join('\n')
export const protocolText = fc
  .tuple(fc.boolean(), fc.array(fc.tuple(protocolLine, NEWLINE), { maxLength: 25 }), fc.boolean())
  .map(([withCell, lines, trailing]) => {
    const body = lines.map(([l, nl]) => l + nl).join('')
    return (withCell ? CELL + '\n' : '') + (trailing ? body : body.replace(/(\r\n|\r|\n)$/, ''))
  })

export const lone16 = fc.string({ unit: fc.integer({ min: 0, max: 0xffff }).map((c) => String.fromCharCode(c)), maxLength: 200 })

// ------------------------------------------------------------------------------------------------
// Mutations of real protocols

export type Mutation =
  | { op: 'delete'; at: number; len: number }
  | { op: 'duplicate'; line: number }
  | { op: 'insert'; at: number; text: string }
  | { op: 'swap'; a: number; b: number }
  | { op: 'digits'; at: number; with: string }

export const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ op: fc.constant('delete' as const), at: fc.nat(), len: fc.integer({ min: 1, max: 60 }) }),
  fc.record({ op: fc.constant('duplicate' as const), line: fc.nat() }),
  fc.record({
    op: fc.constant('insert' as const),
    at: fc.nat(),
    text: fc.oneof(token, NEWLINE, fc.string({ maxLength: 8 }), fc.string({ unit: 'binary', maxLength: 4 }), protocolLine.map((l) => `\n${l}\n`)),
  }),
  fc.record({ op: fc.constant('swap' as const), a: fc.nat(), b: fc.nat() }),
  fc.record({ op: fc.constant('digits' as const), at: fc.nat(), with: fc.constantFrom('0', '9', '', '-', '1e400', '0.000', '99999999', 'O', '.') }),
)

export function mutate(text: string, m: Mutation): string {
  const lines = text.split('\n')
  switch (m.op) {
    case 'delete': {
      const at = m.at % (text.length + 1)
      return text.slice(0, at) + text.slice(at + m.len)
    }
    case 'duplicate': {
      const i = m.line % lines.length
      lines.splice(i, 0, lines[i])
      return lines.join('\n')
    }
    case 'insert': {
      const at = m.at % (text.length + 1)
      return text.slice(0, at) + m.text + text.slice(at)
    }
    case 'swap': {
      const a = m.a % lines.length
      const b = m.b % lines.length
      ;[lines[a], lines[b]] = [lines[b], lines[a]]
      return lines.join('\n')
    }
    case 'digits': {
      const digits = [...text.matchAll(/\d+/g)]
      if (digits.length === 0) return text
      const d = digits[m.at % digits.length]
      return text.slice(0, d.index!) + m.with + text.slice(d.index! + d[0].length)
    }
  }
}

export const mutations = fc.array(mutation, { minLength: 1, maxLength: 5 })

/** One of the given protocols with 1-5 random mutations applied. */
export function mutatedExample(examples: readonly Example[]): fc.Arbitrary<string> {
  if (examples.length === 0) throw new Error('no example protocols to mutate')
  return fc.tuple(fc.constantFrom(...examples.map((e) => e.text)), mutations).map(([text, ms]) => ms.reduce(mutate, text))
}

/**
 * The documents of `npm run fuzz` (and of its CI-sized subset in the vitest suite): mostly mutated
 * examples, then grammar-shaped protocols, then mutated grammar-shaped protocols.
 */
export function fuzzDocument(examples: readonly Example[]): fc.Arbitrary<string> {
  return fc.oneof(
    { arbitrary: mutatedExample(examples), weight: 6 },
    { arbitrary: protocolText, weight: 3 },
    { arbitrary: fc.tuple(protocolText, mutations).map(([text, ms]) => ms.reduce(mutate, text)), weight: 1 },
  )
}
