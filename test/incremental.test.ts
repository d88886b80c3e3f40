// Incremental re-parsing: `reparse` reuses the nodes of the lines an edit did not touch. Whatever the
// edits, the tree it gives must be the tree a fresh `parse` of the same text gives (the oracle here
// is the full parser, which the other parser tests check against the grammar). The edits are
// applied one after another, each re-parse starting from the previous one's result, as the
// language server does on every keystroke.
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import * as fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { TextDocument } from 'vscode-languageserver-textdocument'
import { analyze } from '../server/src/core/analyze'
import { parse, reparse } from '../server/src/core/parser'
import { LineIndex } from '../server/src/core/positions'

const ROOT = fileURLToPath(new URL('..', import.meta.url))
const EXAMPLES = readdirSync(join(ROOT, 'examples'))
  .filter((f) => f.endsWith('.cellrun'))
  .sort()
  .map((f) => readFileSync(join(ROOT, 'examples', f), 'utf8'))

/** Starting documents: the examples, small made-up ones, and ones with every kind of line break. */
const SMALL = [
  '',
  'cell\n  compartment a 1 L\n  compartment b 1 L\nstep 1: current 2 A for 1 h\n',
  'cell\r\n  compartment a 1 L\r\n\r\n  anode nickel in a\rnote x\r',
  'let x = 2 A\n# c\n\nstep s: current x for 10 min  # ok\nobserve H2 1 L in a\n',
  'run "🧪 test"\ncell\n  vessel glass\nnote µ and 𝛼 and \u00a0 space\n',
]
const START = [...EXAMPLES, ...SMALL]

/** What an edit inserts: pieces that change the line structure and the cell block, and plain text. */
const INSERTS = [
  '', '\n', '\r\n', '\r', '\n\n', 'cell\n', '\ncell', '  ', '\t', 'x', '1', '#', '"', ':', ',', ' A', 'step 2: current 1 A for 1 h\n',
  '  compartment c 2 L\n', 'note n\n', 'let y = 3 g\n', '🧪', '\ud83e', '\udde0', 'é', 'charge a: NaCl 10 g, water 1 L\n', 'cel', 'l',
]

interface Edit {
  at: number
  del: number
  text: string
}
const edit: fc.Arbitrary<Edit> = fc.record({
  at: fc.nat(),
  del: fc.oneof(fc.constant(0), fc.integer({ min: 0, max: 3 }), fc.integer({ min: 0, max: 80 })),
  text: fc.oneof(fc.constantFrom(...INSERTS), fc.string({ maxLength: 6 }), fc.string({ unit: 'binary', maxLength: 3 })),
})

/** Apply an edit to a string; the offset is taken modulo the length so every edit lands somewhere. */
function applyEdit(text: string, e: Edit): string {
  const at = e.at % (text.length + 1)
  return text.slice(0, at) + e.text + text.slice(at + e.del)
}

const sequence = fc.record({ start: fc.constantFrom(...START), edits: fc.array(edit, { minLength: 1, maxLength: 6 }) })

describe('reparse after random edit sequences', () => {
  it('10,000 sequences: after every edit the re-used tree equals a fresh parse of the same text', () => {
    let reusedLines = 0
    let totalLines = 0
    fc.assert(
      fc.property(sequence, ({ start, edits }) => {
        let text = start
        let index = new LineIndex(text)
        let tree = parse(text, index)
        for (const e of edits) {
          const next = applyEdit(text, e)
          const nextIndex = new LineIndex(next)
          const inc = reparse({ text, index, tree }, next, nextIndex)
          const fresh = parse(next, new LineIndex(next))
          // Same JSON: same kinds, lines, spans, tokens, errors and fixes, in the same order.
          if (JSON.stringify(inc) !== JSON.stringify(fresh)) {
            expect(inc).toEqual(fresh) // shows the difference
          }
          reusedLines += inc.lines.filter((n) => tree.lines.includes(n)).length
          totalLines += inc.lines.length
          text = next
          index = nextIndex
          tree = inc
        }
      }),
      { numRuns: 10_000, seed: 20261202 },
    )
    // Not a property of the result, a check that the test exercises reuse: lines before an edit are
    // the very same objects; most of the lines of a multi-line document are reused.
    expect(reusedLines / totalLines).toBeGreaterThan(0.3)
  }, 120_000)

  it('every offset in a syntax node is a `start` or `end` number (what reparse moves)', () => {
    // reparse's `moved()` shifts every `start` and `end` (spans and tokens alike) and every `line`; a
    // number under any other key (but the indentation width) would be left unmoved, so the naming is
    // part of the contract.
    const odd = new Set<string>()
    let offsets = 0
    const walk = (v: unknown, path: string): void => {
      if (Array.isArray(v)) v.forEach((x, i) => walk(x, `${path}[${i}]`))
      else if (v && typeof v === 'object') {
        const o = v as Record<string, unknown>
        for (const k of Object.keys(o)) {
          if (typeof o[k] === 'number') {
            if (k === 'start' || k === 'end') offsets++
            else if (k !== 'line' && k !== 'indent') odd.add(`${path}.${k}`)
          }
          walk(o[k], `${path}.${k}`)
        }
      }
    }
    for (const text of START) parse(text).lines.forEach((n, i) => walk(n, `line ${i}`))
    expect([...odd]).toEqual([])
    expect(offsets).toBeGreaterThan(100)
  })

  it('lines before an edit are reused as they are; lines after it are moved to their new offsets', () => {
    const text = EXAMPLES[0]
    const index = new LineIndex(text)
    const tree = parse(text, index)
    const at = text.indexOf('\ncell') + 1
    const next = text.slice(0, at) + 'note inserted line\n' + text.slice(at)
    const inc = reparse({ text, index, tree }, next)
    const line = index.lineOf(at)
    expect(inc.lines[0]).toBe(tree.lines[0])
    expect(inc.lines[line - 2]).toBe(tree.lines[line - 2])
    expect(inc.lines[line].kind).toBe('note')
    // The old `cell` line is now one line further down, 19 characters later.
    expect(inc.lines[line + 1].kind).toBe('cell')
    expect(inc.lines[line + 1].span.start).toBe(tree.lines[line].span.start + 'note inserted line\n'.length)
    expect(inc).toEqual(parse(next))
  })

  it('an edit that opens or closes a cell block re-reads the lines whose meaning changes', () => {
    // `cell` typed above indented parts makes them parts of the cell (inCell flips for the lines after).
    const text = 'celx\n  compartment a 1 L\n  compartment b 1 L\nnote end\n'
    const index = new LineIndex(text)
    const tree = parse(text, index)
    expect(tree.lines[1]).toMatchObject({ kind: 'compartment', inCell: false })
    const next = 'cell' + text.slice(4)
    const inc = reparse({ text, index, tree }, next)
    expect(inc.lines[1]).toMatchObject({ kind: 'compartment', inCell: true })
    expect(inc.lines[2]).toMatchObject({ kind: 'compartment', inCell: true })
    expect(inc).toEqual(parse(next))
  })
})

describe('the language server document store and the analysis, edit by edit', () => {
  /** An edit as the editor sends it: a range in UTF-16 line/character positions and the new text. */
  function asRangeChange(doc: TextDocument, e: Edit) {
    const text = doc.getText()
    const at = e.at % (text.length + 1)
    const end = Math.min(text.length, at + e.del)
    return { range: { start: doc.positionAt(at), end: doc.positionAt(end) }, text: e.text }
  }

  it('incremental document updates give the same text as the edits, and analysing with the previous analysis gives the same result as from scratch', () => {
    fc.assert(
      fc.property(sequence, ({ start, edits }) => {
        let doc = TextDocument.create('file:///t.cellrun', 'cellrun', 1, start)
        let text = start
        let prev = analyze(text)
        for (const e of edits) {
          doc = TextDocument.update(doc, [asRangeChange(doc, e)], doc.version + 1)
          const before = text
          text = applyEdit(text, e)
          // TextDocument clamps positions inside a "\r\n" pair the same way as a string slice does
          // not: when they differ the edit split a line break, and the document's text is the truth.
          if (doc.getText() !== text) {
            expect(before.slice(0, e.at % (before.length + 1)).endsWith('\r') || before.slice(0, (e.at % (before.length + 1)) + e.del).endsWith('\r')).toBe(true)
            text = doc.getText()
          }
          const inc = analyze(text, {}, prev)
          const fresh = analyze(text)
          expect(JSON.stringify(inc.diagnostics)).toBe(JSON.stringify(fresh.diagnostics))
          expect(JSON.stringify(inc.computed)).toBe(JSON.stringify(fresh.computed))
          expect(JSON.stringify(inc.tree)).toBe(JSON.stringify(fresh.tree))
          prev = inc
        }
      }),
      { numRuns: 300, seed: 7 },
    )
  }, 120_000)
})
