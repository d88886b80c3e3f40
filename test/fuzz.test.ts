// Property tests of the analysis core with fast-check: whatever text comes in, `analyze` must not
// throw, must give exactly one syntax node per line, and every position it reports must lie inside
// the document (and inside the node's own line for syntax-tree spans). Also: mutation fuzzing of
// the example protocols, determinism, and hostile expressions against the mathjs sandbox.
//
// Note on fast-check 4: `fc.fullUnicodeString()` was removed in v4; its replacement is
// `fc.string({ unit: 'binary' })` (any code point). Lone surrogates come from a 16-bit unit.
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import * as fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { analyze, hoverAt, outline, type Analysis, type OutlineItem } from '../server/src/core/analyze'

/** Multiply the run counts for a deeper local session: CELLRUN_FUZZ_SCALE=20 npx vitest run test/fuzz.test.ts */
const SCALE = Math.max(1, Number(process.env.CELLRUN_FUZZ_SCALE) || 1)
const runs = (n: number) => ({ numRuns: n * SCALE })

const ROOT = fileURLToPath(new URL('..', import.meta.url))
const EXAMPLES = readdirSync(join(ROOT, 'examples'))
  .filter((f) => f.endsWith('.cellrun'))
  .sort()
  .map((f) => ({ name: f, text: readFileSync(join(ROOT, 'examples', f), 'utf8') }))

// ------------------------------------------------------------------------------------------------
// Invariants

interface SpanLike {
  start: number
  end: number
}

function isSpan(v: unknown): v is SpanLike {
  return typeof v === 'object' && v !== null && typeof (v as SpanLike).start === 'number' && typeof (v as SpanLike).end === 'number'
}

/** Every span-shaped object reachable in plain data (syntax nodes are plain objects and arrays). */
function spansIn(v: unknown, path: string, out: { path: string; span: SpanLike }[] = []): { path: string; span: SpanLike }[] {
  if (Array.isArray(v)) v.forEach((x, i) => spansIn(x, `${path}[${i}]`, out))
  else if (typeof v === 'object' && v !== null) {
    if (isSpan(v)) out.push({ path, span: v })
    for (const [k, x] of Object.entries(v)) if (typeof x === 'object') spansIn(x, `${path}.${k}`, out)
  }
  return out
}

/** Line bounds computed here, independently of the core's LineIndex: [start, end) without the break. */
function lineBounds(text: string): { start: number; end: number }[] {
  const out: { start: number; end: number }[] = []
  const re = /\r\n|\r|\n/g
  let from = 0
  for (let m = re.exec(text); m; m = re.exec(text)) {
    out.push({ start: from, end: m.index })
    from = m.index + m[0].length
  }
  out.push({ start: from, end: text.length })
  return out
}

function expectSpan(span: SpanLike, lo: number, hi: number, what: string): void {
  const ok = Number.isInteger(span.start) && Number.isInteger(span.end) && lo <= span.start && span.start <= span.end && span.end <= hi
  if (!ok) throw new Error(`${what}: span ${JSON.stringify(span)} is not within [${lo}, ${hi}] with start <= end`)
}

function expectOffset(offset: number, hi: number, what: string): void {
  if (!Number.isInteger(offset) || offset < 0 || offset > hi) throw new Error(`${what}: offset ${offset} is outside [0, ${hi}]`)
}

/** Analyse `text` and check every structural invariant; returns the analysis for further checks. */
function checkAll(text: string): Analysis {
  const a = analyze(text)
  const n = text.length
  const lines = lineBounds(text)

  // One node per line, in order, with its own line number.
  expect(text.split(/\r\n|\r|\n/).length).toBe(lines.length)
  if (a.tree.lines.length !== lines.length) throw new Error(`${a.tree.lines.length} syntax nodes for ${lines.length} lines`)
  a.tree.lines.forEach((node, i) => {
    if (node.line !== i) throw new Error(`node ${i} says it is on line ${node.line}`)
    // Every span in a node (statement, keyword, tokens, comment, error, fix) stays on its own line.
    for (const { path, span } of spansIn(node, `line ${i} (${node.kind})`)) expectSpan(span, lines[i].start, lines[i].end, path)
  })

  for (const d of a.diagnostics) {
    expectSpan(d.span, 0, n, `diagnostic ${d.code}`)
    for (const f of d.fixes) for (const e of f.edits) expectSpan(e.span, 0, n, `fix "${f.title}" of ${d.code}`)
    // The core's defensive catch-alls turn a crash into a diagnostic; none should ever fire.
    if (/internal (parser )?error/.test(d.message)) throw new Error(`a rule or the parser crashed: ${d.message}`)
  }
  for (const c of a.computed) {
    expectSpan(c.span, 0, n, `computed ${c.key} span`)
    expectOffset(c.anchor, n, `computed ${c.key} anchor`)
  }
  for (const q of a.model.quantities) expectSpan(q.expr.span, 0, n, `quantity ${q.role}`)
  for (const f of a.model.formulas) expectSpan(f.tok.span, 0, n, `formula ${f.tok.text}`)
  for (const r of a.model.refs) expectSpan(r.tok.span, 0, n, `reference ${r.tok.text}`)
  for (const d of a.model.declarations) expectSpan(d.tok.span, 0, n, `declaration ${d.tok.text}`)

  // The editor-facing views must hold up too.
  const walk = (items: OutlineItem[]): void => {
    for (const it of items) {
      expectSpan(it.span, 0, n, `outline ${it.name} span`)
      expectSpan(it.selection, 0, n, `outline ${it.name} selection`)
      walk(it.children)
    }
  }
  walk(outline(a))
  const probes = new Set([0, n, n >> 1, ...a.diagnostics.map((d) => d.span.start), ...a.computed.map((c) => c.anchor)])
  for (const o of probes) {
    const h = hoverAt(a, o)
    if (h) expectSpan(h.span, 0, n, `hover at ${o}`)
  }
  return a
}

// ------------------------------------------------------------------------------------------------
// Generators

const NEWLINE = fc.constantFrom('\n', '\r\n', '\r')
const KEYWORDS = [
  'run', 'note', 'conditions', 'let', 'cell', 'vessel', 'compartment', 'separator', 'anode', 'cathode', 'charge', 'step',
  'expect', 'observe', 'handling', 'current', 'voltage', 'for', 'efficiency', 'between', 'and', 'in', 'area', 'solution', 'at',
  'stepp', 'Step', 'cel', 'water', 'H2O',
]
const UNITS = [
  'g', 'kg', 'mg', 'mol', 'mmol', 'L', 'mL', 'cm^2', 'm^2', 'dm^2', 'A', 'mA', 'kA', 'V', 's', 'min', 'h', 'C', 'Ah', 'mAh', 'Wh',
  'degC', '°C', 'K', 'kPa', 'bar', 'atm', 'mol/L', 'M', 'mM', 'g/L', 'wt%', '%', 'mA/cm^2', 'A/m^2', 'kA/m^2', 'ppmw', 'cm²', 'µA',
]
const FORMULAS = ['K2CO3', 'KOH', 'NaCl', 'NaOH', 'Cl2', 'H2', 'O2', 'Cu', 'CuSO4·5H2O', 'CuSO4*5H2O', 'CuSO4.5H2O', 'H2SO4', 'SO4^2-', 'OH-', 'Cu^2+', '(NH4)2SO4', 'Xx9', 'C0', 'K2C03', 'H', '[Fe(CN)6]3-']
const NAMES = ['feed', 'product', 'anolyte', 'catholyte', 'bath', 'area', 'j', 'panel', 'x', '_', 'a-b']
const KINDS = ['cation-exchange', 'anion-exchange', 'diaphragm', 'none', 'vent', 'scrubber', 'hood', 'ppe', 'bogus']
const PUNCT = [':', ',', '=', '(', ')', '[', ']', '{', '}', '"', '#', '*', '/', '^', '+', '-', '·', '×', '−', '²', '.', ';', '?', '!', '\t', ' ', '  ']
const ODD = ['🧪', '𝛼', '\u00a0', '\u200b', '\ud800', '\udfff', 'é', 'µ', '\u0000', '\\', '`']

const number = fc.oneof(
  fc.integer({ min: -1000, max: 100000 }).map(String),
  fc.double({ noNaN: true, min: -1e6, max: 1e6 }).map((d) => String(d)),
  fc.constantFrom('0', '-0', '.5', '5.', '1e308', '1e400', '1e-400', '1.2.3', '0x1F', '1_000', '90', '100', '3.6', 'NaN', 'Infinity'),
)
const quantity = fc.oneof(
  fc.tuple(number, fc.constantFrom(...UNITS)).map(([a, u]) => `${a} ${u}`),
  fc.tuple(number, fc.constantFrom(...UNITS), fc.constantFrom('*', '/', '+', '-'), fc.constantFrom(...NAMES, ...UNITS), number).map(
    ([a, u, op, b, c]) => `${a} ${u} ${op} ${b}${op === '+' || op === '-' ? ' ' + c : ''}`,
  ),
  fc.tuple(number, fc.constantFrom(...NAMES)).map(([a, nm]) => `${a} * ${nm}`),
  number,
  fc.constantFrom(...NAMES),
)
const token = fc.oneof(
  { arbitrary: fc.constantFrom(...KEYWORDS), weight: 4 },
  { arbitrary: fc.constantFrom(...UNITS), weight: 3 },
  { arbitrary: number, weight: 3 },
  { arbitrary: fc.constantFrom(...FORMULAS), weight: 2 },
  { arbitrary: fc.constantFrom(...NAMES), weight: 2 },
  { arbitrary: fc.constantFrom(...KINDS), weight: 1 },
  { arbitrary: fc.constantFrom(...PUNCT), weight: 4 },
  { arbitrary: fc.constantFrom(...ODD), weight: 1 },
)
const indent = fc.constantFrom('', '', '', '  ', '    ', '\t', ' ')

/** Lines that follow the grammar's shapes with plausible, often wrong, pieces. */
const templateLine = fc.oneof(
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
const tokenLine = fc
  .tuple(indent, fc.array(fc.tuple(token, fc.constantFrom(' ', '', ', ', ': ', '  ')), { maxLength: 12 }))
  .map(([i, toks]) => i + toks.map(([t, sep]) => t + sep).join(''))
/** A line with a trailing comment, or a template line broken by an edit. */
const brokenLine = fc.oneof(
  fc.tuple(templateLine, fc.string({ maxLength: 10 })).map(([l, c]) => `${l} # ${c}`),
  fc.tuple(templateLine, fc.nat(), fc.nat({ max: 5 }), token).map(([l, at, del, t]) => {
    const p = at % (l.length + 1)
    return l.slice(0, p) + t + l.slice(p + del)
  }),
)
const protocolLine = fc.oneof(
  { arbitrary: templateLine, weight: 5 },
  { arbitrary: tokenLine, weight: 3 },
  { arbitrary: brokenLine, weight: 3 },
  { arbitrary: fc.constantFrom('', '   ', '# comment', '\t'), weight: 1 },
)
/** A well-formed cell so that generated steps and yields reach the Faraday and feed-limit code. */
const CELL = [
  'let area = 50 cm^2',
  'cell',
  '  compartment feed 500 mL',
  '  compartment product 250 mL',
  '  separator cation-exchange between feed and product, area area',
  '  anode nickel in feed, area area',
  '  cathode nickel in product, area area',
  'charge feed: K2CO3 180 g, water 420 mL',
].join('\n')
const protocolText = fc
  .tuple(fc.boolean(), fc.array(fc.tuple(protocolLine, NEWLINE), { maxLength: 25 }), fc.boolean())
  .map(([withCell, lines, trailing]) => {
    const body = lines.map(([l, nl]) => l + nl).join('')
    return (withCell ? CELL + '\n' : '') + (trailing ? body : body.replace(/(\r\n|\r|\n)$/, ''))
  })

const lone16 = fc.string({ unit: fc.integer({ min: 0, max: 0xffff }).map((c) => String.fromCharCode(c)), maxLength: 200 })

// ------------------------------------------------------------------------------------------------
// Mutations of real protocols

type Mutation =
  | { op: 'delete'; at: number; len: number }
  | { op: 'duplicate'; line: number }
  | { op: 'insert'; at: number; text: string }
  | { op: 'swap'; a: number; b: number }
  | { op: 'digits'; at: number; with: string }

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
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

function mutate(text: string, m: Mutation): string {
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

const mutations = fc.array(mutation, { minLength: 1, maxLength: 5 })
const mutatedExample = fc
  .tuple(fc.constantFrom(...EXAMPLES.map((e) => e.text)), mutations)
  .map(([text, ms]) => ms.reduce(mutate, text))

// ------------------------------------------------------------------------------------------------

describe('analyze on arbitrary text', () => {
  it('never throws and keeps every span in range: ASCII-ish strings', () => {
    fc.assert(fc.property(fc.string({ maxLength: 300 }), (s) => void checkAll(s)), runs(300))
  })

  it('never throws and keeps every span in range: any code point (the v4 fullUnicodeString)', () => {
    fc.assert(fc.property(fc.string({ unit: 'binary', maxLength: 300 }), (s) => void checkAll(s)), runs(300))
  })

  it('never throws and keeps every span in range: 16-bit units including lone surrogates', () => {
    fc.assert(fc.property(lone16, (s) => void checkAll(s)), runs(200))
  })

  it('never throws and keeps every span in range: plausible-but-broken protocols', () => {
    fc.assert(fc.property(protocolText, (s) => void checkAll(s)), runs(400))
  })

  it('handles the edge cases of line breaks', () => {
    for (const s of ['', '\n', '\r', '\r\n', '\n\r', '\r\r\n\n', 'cell\r  compartment a 1 L\r\n', 'step 1: current 1 A for 1 h\r']) {
      const a = checkAll(s)
      expect(a.tree.lines).toHaveLength(s.split(/\r\n|\r|\n/).length)
    }
  })

  it('the grammar generator does reach the deeper analysis (sanity check of the generator)', () => {
    // Not a property of the code under test: makes sure the fuzzing above is not only exercising
    // the parser's error path. Over a sample, some documents must have computed values and steps.
    const sample = fc.sample(protocolText, { numRuns: 200, seed: 42 })
    const analyses = sample.map((s) => analyze(s))
    expect(analyses.filter((a) => a.computed.length > 0).length).toBeGreaterThan(10)
    expect(analyses.filter((a) => a.model.steps.length > 0).length).toBeGreaterThan(10)
    expect(analyses.filter((a) => a.diagnostics.some((d) => d.code !== 'syntax')).length).toBeGreaterThan(10)
  })
})

describe('mutation fuzzing of the examples', () => {
  it('found the example files', () => {
    expect(EXAMPLES.length).toBeGreaterThanOrEqual(3)
    // Unmutated, each example satisfies the invariants and has no error.
    for (const e of EXAMPLES) {
      const a = checkAll(e.text)
      expect(a.diagnostics.filter((d) => d.severity === 'error'), e.name).toEqual([])
    }
  })

  for (const e of EXAMPLES) {
    it(`${e.name}: 1-5 random mutations never throw and keep spans in range`, () => {
      fc.assert(
        fc.property(mutations, (ms) => void checkAll(ms.reduce(mutate, e.text))),
        runs(300),
      )
    })
  }
})

describe('determinism', () => {
  const view = (a: Analysis) => ({
    diagnostics: a.diagnostics,
    computed: a.computed.map((c) => ({ key: c.key, label: c.label, span: c.span, anchor: c.anchor, working: c.working })),
    nodes: a.tree.lines,
  })

  it('analysing the same text twice gives deep-equal results, also with other analyses in between', () => {
    fc.assert(
      fc.property(fc.oneof(protocolText, mutatedExample), fc.oneof(protocolText, mutatedExample), (s, other) => {
        const first = view(analyze(s))
        const second = view(analyze(s))
        expect(second).toEqual(first)
        analyze(other)
        expect(view(analyze(s))).toEqual(first)
      }),
      runs(150),
    )
  })
})

describe('the mathjs sandbox against hostile `let` expressions', () => {
  const HOSTILE: [string, string][] = [
    ['import', 'import({}, {})'],
    ['createUnit', 'createUnit("foo")'],
    ['evaluate', 'evaluate("1")'],
    ['parse', 'parse("1")'],
    ['matrix', '[1,2,3]'],
    ['object', '{a: 1}'],
    ['property access', 'x.constructor'],
    ['prototype access', 'x["constructor"]["constructor"]("return process")()'],
    ['function definition', 'f(x) = x'],
    ['assignment', 'pi = 3'],
    ['conditional', '1 ? 2 : 3'],
    ['comparison', '1 == 1'],
    ['range', '1:3'],
    ['block', '1; 2'],
    ['string constant', '"abc"'],
    ['disallowed function', 'cos(0)'],
    ['simplify', 'simplify("x + x")'],
    ['tower of powers', '10^10^10^10'],
    ['division by zero', '1 / 0 A'],
    ['0/0', '0 / 0'],
    ['10,000-deep parentheses', '('.repeat(10_000) + '1' + ')'.repeat(10_000)],
    ['33-deep parentheses (short)', '('.repeat(33) + '1 A' + ')'.repeat(33)],
    ['deep unary minus chain (short)', '-'.repeat(390) + '1'],
    ['deep power chain (short)', '2^'.repeat(190) + '2'],
    ['1 MB line', '1 + '.repeat(262_144) + '1'],
  ]

  for (const [what, expr] of HOSTILE) {
    it(`${what}: an error diagnostic on the expression, fast, without throwing`, () => {
      const line = `let x = ${expr}`
      const text = `${line}\nlet y = 2 A\n`
      const exprStart = 'let x = '.length
      const t0 = performance.now()
      const a = analyze(text)
      const ms = performance.now() - t0
      expect(ms, `${what} took ${ms.toFixed(1)} ms`).toBeLessThan(200)
      const errors = a.diagnostics.filter((d) => d.severity === 'error' && (d.code === 'bad-expression' || d.code === 'syntax'))
      expect(errors.length, JSON.stringify(a.diagnostics.map((d) => [d.code, d.message.slice(0, 120)]))).toBeGreaterThanOrEqual(1)
      // The error points into the expression, not somewhere else.
      for (const d of errors) {
        expect(d.span.start).toBeGreaterThanOrEqual(exprStart)
        expect(d.span.end).toBeLessThanOrEqual(line.length)
      }
      // The hostile value was not bound; the next line is unaffected.
      expect(a.model.values.has('x')).toBe(false)
      expect(a.model.values.has('y')).toBe(true)
      expect(a.diagnostics.filter((d) => d.span.start > line.length)).toEqual([])
    })
  }

  it('the same hostile expressions as step clauses and charge amounts are refused too', () => {
    for (const [what, expr] of HOSTILE) {
      if (expr.length > 1000) continue
      for (const line of [`step 1: current ${expr} for 1 h`, `charge feed: NaCl ${expr}`, `conditions ${expr}`]) {
        const t0 = performance.now()
        const a = checkAll(line)
        expect(performance.now() - t0, `${what} in ${line.slice(0, 40)}`).toBeLessThan(200)
        expect(
          a.diagnostics.some((d) => d.severity === 'error' && (d.code === 'bad-expression' || d.code === 'syntax')),
          `${what} in \`${line.slice(0, 60)}\`: ${JSON.stringify(a.diagnostics.map((d) => d.code))}`,
        ).toBe(true)
      }
    }
  })
})

describe('regression: a syntax error at the very end of an expression', () => {
  const CASES: [string, string][] = [
    ['conditions 0-', '0-'], // last line: the span ran past the end of the document
    ['let x = (1 + 2\nlet y = 2 A\n', '(1 + 2'], // mid-document: the span covered the line break
    ['let x = 2 *', '2 *'],
    ['step 1: current 2 A for 3 h +\nnote hi', '3 h +'],
  ]

  it('is reported as a bad-expression error on that line', () => {
    for (const [text, expr] of CASES) {
      const a = analyze(text)
      const at = text.indexOf(expr)
      const line = text.slice(0, text.indexOf('\n') < 0 ? text.length : text.indexOf('\n'))
      const d = a.diagnostics.filter((x) => x.code === 'bad-expression')
      expect(d, text).toHaveLength(1)
      expect(d[0].severity).toBe('error')
      expect(d[0].span.start, text).toBeGreaterThanOrEqual(at)
      expect(d[0].span.start, text).toBeLessThanOrEqual(line.length)
    }
  })

  // Regression: mathjs reports an error at the end of the input at length + 1; the span must still
  // end inside the expression (it used to run one character past it).
  it('has a span inside the expression', () => {
    for (const [text, expr] of CASES) {
      const a = analyze(text)
      const at = text.indexOf(expr)
      const d = a.diagnostics.find((x) => x.code === 'bad-expression')!
      expect(d.span.end, `${JSON.stringify(text)}: ${JSON.stringify(d.span)}`).toBeLessThanOrEqual(at + expr.length)
      expect(d.span.end).toBeLessThanOrEqual(text.length)
    }
  })
})
