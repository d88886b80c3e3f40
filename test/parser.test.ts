// The line parser: every statement's parts with exact spans, and broken input becoming error
// nodes without stopping the parse.
import { spanOf } from '../server/src/core/positions'
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { commentStart, IDENT_AT, identEnd, LETTERS_AT, lettersEnd, parse, trailingIn, WORD_AT, wordAt, wordEnd } from '../server/src/core/parser'
import { isWhiteSpace } from '../server/src/core/text'
import { keywordOf, type LineNode } from '../server/src/core/syntax'
import { covered, marked } from './support/markers'

function only<K extends LineNode['kind']>(src: string, kind: K): Extract<LineNode, { kind: K }> {
  const tree = parse(src)
  const n = tree.lines.find((l) => l.kind !== 'blank')!
  expect(n.kind, n.kind === 'error' ? n.message : '').toBe(kind)
  return n as Extract<LineNode, { kind: K }>
}

describe('statements', () => {
  it('reads a run title, a note and conditions', () => {
    const src = 'run "KOH batch 7"  # first\nnote Feed is technical grade. # not part of the note\nconditions 22 degC, 101.325 kPa'
    const t = parse(src)
    expect(t.lines.map((l) => l.kind)).toEqual(['run', 'note', 'conditions'])
    const run = t.lines[0] as Extract<LineNode, { kind: 'run' }>
    expect(run.title.text).toBe('KOH batch 7')
    expect(covered(src, run.comment!)).toBe('# first')
    const note = t.lines[1] as Extract<LineNode, { kind: 'note' }>
    expect(note.text.text).toBe('Feed is technical grade.')
    const cond = t.lines[2] as Extract<LineNode, { kind: 'conditions' }>
    expect(cond.items.map((i) => covered(src, spanOf(i)))).toEqual(['22 degC', '101.325 kPa'])
  })

  it('keeps a # inside a quoted title', () => {
    const n = only('run "Cell #4 test" # comment', 'run')
    expect(n.title.text).toBe('Cell #4 test')
  })

  it('reads a named value with its expression span', () => {
    const m = marked('let ⟦area⟧ = ⟦36 cm^2⟧')
    const n = only(m.text, 'let')
    expect(spanOf(n.name)).toEqual(m.ranges[0])
    expect(spanOf(n.expr)).toEqual(m.ranges[1])
  })

  it('reads the cell block with indented parts', () => {
    const src = [
      'cell',
      '  vessel polypropylene',
      '  compartment feed 700 mL',
      '  compartment product 180 mL',
      '  separator cation-exchange between feed and product, area 36 cm^2',
      '  anode mmo-titanium in feed, area area',
      '  cathode nickel in product',
      'charge feed: K2CO3 260 g',
    ].join('\n')
    const t = parse(src)
    expect(t.lines.map((l) => l.kind)).toEqual(['cell', 'vessel', 'compartment', 'compartment', 'separator', 'electrode', 'electrode', 'charge'])
    const sep = t.lines[4] as Extract<LineNode, { kind: 'separator' }>
    expect(sep.type.text).toBe('cation-exchange')
    expect(sep.between.map((b) => b.text)).toEqual(['feed', 'product'])
    expect(sep.area?.text).toBe('36 cm^2')
    expect(sep.inCell).toBe(true)
    const anode = t.lines[5] as Extract<LineNode, { kind: 'electrode' }>
    expect([anode.role, anode.material.text, anode.compartment.text, anode.area?.text]).toEqual(['anode', 'mmo-titanium', 'feed', 'area'])
    const cathode = t.lines[6] as Extract<LineNode, { kind: 'electrode' }>
    expect(cathode.area).toBeUndefined()
  })

  it('marks cell parts that are not under a cell line', () => {
    const n = only('compartment feed 1 L', 'compartment')
    expect(n.inCell).toBe(false)
  })

  it('reads charge items: solids, water and solutions', () => {
    const m = marked('charge feed: ⟦K2CO3⟧ ⟦260 g⟧, ⟦water⟧ ⟦600 mL⟧, ⟦NaOH⟧ solution ⟦400 g⟧ at ⟦25 wt%⟧')
    const n = only(m.text, 'charge')
    expect(n.compartment.text).toBe('feed')
    expect(n.items).toHaveLength(3)
    const [a, b, c] = n.items
    expect([spanOf(a.formula), spanOf(a.quantity), spanOf(b.formula), spanOf(b.quantity), spanOf(c.formula), spanOf(c.quantity), c.concentration && spanOf(c.concentration)]).toEqual(m.ranges)
  })

  it('splits charge items only at top-level commas', () => {
    const n = only('charge feed: NaCl (2 + 1) * 100 g, water 1 L', 'charge')
    expect(n.items.map((i) => i.quantity.text)).toEqual(['(2 + 1) * 100 g', '1 L'])
  })

  it('reads step clauses, with `for` after a clause or after a comma', () => {
    const m = marked('step 1: ⟦current⟧ ⟦40 mA/cm^2 * area⟧ ⟦for⟧ ⟦5 h⟧, ⟦efficiency⟧ ⟦85 %⟧')
    const n = only(m.text, 'step')
    expect(n.label.text).toBe('1')
    expect(n.clauses.flatMap((c) => [spanOf(c.keyword), spanOf(c.expr)])).toEqual(m.ranges)
    const n2 = only('step warm: voltage 3.2 V, current 1.5 A, for 2 h', 'step')
    expect(n2.clauses.map((c) => c.keyword.text)).toEqual(['voltage', 'current', 'for'])
  })

  it('does not split at a `for` inside a word', () => {
    const n = only('step 1: current formed for 2 h', 'step')
    expect(n.clauses.map((c) => [c.keyword.text, c.expr.text])).toEqual([
      ['current', 'formed'],
      ['for', '2 h'],
    ])
  })

  it('reads expect and observe lines with and without a compartment', () => {
    const m = marked('expect ⟦KOH⟧ ⟦25 g⟧ in ⟦product⟧')
    const n = only(m.text, 'expect')
    expect([spanOf(n.formula), spanOf(n.quantity), n.compartment && spanOf(n.compartment)]).toEqual(m.ranges)
    const o = only('observe H2 3.1 L', 'observe')
    expect(o.quantity.text).toBe('3.1 L')
    expect(o.compartment).toBeUndefined()
  })

  it('reads handling lines', () => {
    const n = only('handling vent: H2 piped outdoors # see SOP 4', 'handling')
    expect(n.type.text).toBe('vent')
    expect(n.text.text).toBe('H2 piped outdoors')
  })
})

describe('broken input', () => {
  it('turns a bad line into an error node and goes on with the next line', () => {
    const src = 'run "A"\nstepp 1: current 1 A for 1 h\nstep 2: current 1 A for 1 h\n'
    const t = parse(src)
    expect(t.lines.map((l) => l.kind)).toEqual(['run', 'error', 'step', 'blank'])
    const e = t.lines[1] as Extract<LineNode, { kind: 'error' }>
    expect(e.message).toContain('stepp')
    expect(covered(src, e.errorSpan)).toBe('stepp')
    expect(e.fix?.newText).toBe('step')
  })

  it.each([
    ['run "unclosed', 'closing `"`'],
    ['let = 5', 'expected a name'],
    ['let x 5', '`=`'],
    ['compartment feed', 'expected a volume'],
    ['separator cation-exchange feed and product', '`between`'],
    ['anode platinum feed', '`in`'],
    ['anode platinum in feed, 36 cm^2', '`area`'],
    ['charge feed K2CO3 1 g', '`:`'],
    ['charge feed: K2CO3', 'a substance and its amount'],
    ['charge feed: NaCl solution 1 L', 'concentration'],
    ['charge feed: NaCl 1 g,, water 1 L', 'empty item'],
    ['step 1 current 1 A', '`:`'],
    ['step 1: amps 2 A for 1 h', 'unknown step clause'],
    ['step 1: current for 1 h', '`current` needs a value'],
    ['step 1:', 'what the step does'],
    ['cell feed', 'stands alone'],
    ['handling vent H2 outside', '`:`'],
    ['42 g', 'must start with a keyword'],
  ])('%s → error mentioning %s', (src, words) => {
    const t = parse(src)
    const e = t.lines[0]
    expect(e.kind).toBe('error')
    if (e.kind === 'error') {
      expect(e.message).toContain(words)
      expect(e.errorSpan.start).toBeGreaterThanOrEqual(0)
      expect(e.errorSpan.end).toBeLessThanOrEqual(src.length)
      expect(e.errorSpan.start).toBeLessThanOrEqual(e.errorSpan.end)
    }
  })

  it('gives one node per line for every line-break style', () => {
    const t = parse('run "a"\r\nnote b\rnote c\n\nlet x = 1')
    expect(t.lines.map((l) => l.kind)).toEqual(['run', 'note', 'note', 'blank', 'let'])
    expect(t.lines.map((l) => l.line)).toEqual([0, 1, 2, 3, 4])
  })

  it('treats comment-only and blank lines as blank nodes and keeps their comment', () => {
    const src = '   # just a comment\n\t\n'
    const t = parse(src)
    expect(t.lines.map((l) => l.kind)).toEqual(['blank', 'blank', 'blank'])
    expect(covered(src, t.lines[0].comment!)).toBe('# just a comment')
  })

  it('suggests the closest keyword for a misspelt clause', () => {
    const t = parse('step 1: curent 2 A for 1 h')
    const e = t.lines[0]
    expect(e.kind === 'error' && e.fix?.newText).toBe('current')
  })
})

describe('where a comment starts', () => {
  // The rule as the README states it: a comment starts at the first `#` outside a quoted title. Read here
  // one character at a time, the plain way, as the oracle for the parser's faster search.
  const byCharacter = (s: string): number => {
    let quoted = false
    for (let i = 0; i < s.length; i++) {
      if (s[i] === '"') quoted = !quoted
      else if (s[i] === '#' && !quoted) return i
    }
    return -1
  }
  it('is the first `#` outside double quotes, for any text', () => {
    const text = fc.array(fc.constantFrom('#', '"', 'a', ' ', 'note', '1 g'), { maxLength: 12 }).map((p) => p.join(''))
    fc.assert(
      fc.property(text, (s) => {
        expect(commentStart(s), JSON.stringify(s)).toBe(byCharacter(s))
      }),
      { numRuns: 3000, seed: 29 },
    )
  })
})

describe('white space', () => {
  it('is what `\\s` matches and what String.prototype.trim removes, for every UTF-16 code unit', () => {
    // The oracles are the JavaScript engine's own pattern and trim().
    const differ: number[] = []
    for (let c = 0; c < 0x10000; c++) {
      const ch = String.fromCharCode(c)
      const trimmed = ch !== 'x' && `${ch}x${ch}`.trim() === 'x'
      const pattern = /\s/.test(ch)
      if (trimmed !== isWhiteSpace(c) || pattern !== isWhiteSpace(c)) differ.push(c)
    }
    expect(differ).toEqual([])
  })
})

describe('clause words found in place', () => {
  it('where `(?:current|voltage|for|efficiency)(?![\\w-])` matches, at any place of any text', () => {
    // The oracle is the pattern the parser ran before (sticky, at the place).
    const words = ['current', 'voltage', 'for', 'efficiency'] as const
    const pattern = new RegExp(`(?:${words.join('|')})(?![\\w-])`, 'y')
    const text = fc.array(fc.constantFrom('for', 'form', 'current', 'currents', 'efficiency', 'volt', 'voltage', '-', '_', ' ', '2', 'x', 'é', 'fo'), { maxLength: 6 }).map((p) => p.join(''))
    fc.assert(
      fc.property(text, fc.nat({ max: 20 }), (t, at) => {
        const i = Math.min(at, t.length)
        pattern.lastIndex = i
        expect(wordAt(t, i, words), `${JSON.stringify(t)} at ${i}`).toBe(pattern.test(t))
      }),
      { numRuns: 4000, seed: 53 },
    )
  })
})

describe('tokens read in place', () => {
  // The oracles are the patterns the parser ran before (sticky, at the place).
  const pieces = fc.constantFrom('a', 'Z', '_', '-', '9', ' ', '\t', '\u00a0', ',', ':', '#', 'é', '.', 'in', 'x-y', '\u2028')
  const text = fc.array(pieces, { maxLength: 8 }).map((p) => p.join(''))
  const endByPattern = (re: RegExp, t: string, i: number) => {
    re.lastIndex = i
    const m = re.exec(t)
    return m ? i + m[0].length : i
  }
  it('a name, a word and letters end where IDENT_AT, WORD_AT and LETTERS_AT end, at any place of any text', () => {
    fc.assert(
      fc.property(text, fc.nat({ max: 12 }), (t, at) => {
        const i = Math.min(at, t.length)
        const where = `${JSON.stringify(t)} at ${i}`
        expect(identEnd(t, i), where).toBe(endByPattern(IDENT_AT, t, i))
        expect(wordEnd(t, i), where).toBe(endByPattern(WORD_AT, t, i))
        expect(lettersEnd(t, i), where).toBe(endByPattern(LETTERS_AT, t, i))
      }),
      { numRuns: 4000, seed: 61 },
    )
  })
  it('a trailing `in NAME` is found where `\\s+in\\s+([A-Za-z_][\\w-]*)\\s*$` finds it', () => {
    const pattern = /\s+in\s+([A-Za-z_][\w-]*)\s*$/
    // Near matches built part by part (amount, space, `in`, space, name, space), each part sometimes wrong.
    const tail = fc
      .tuple(
        fc.constantFrom('25 g', '', 'in', '(1 mol)', '2 in', 'x'),
        fc.constantFrom(' ', '  ', '\t', '\u00a0', ''),
        fc.constantFrom('in', 'i', 'inn', 'n', 'In', ''),
        fc.constantFrom(' ', '\t ', '\u00a0', ''),
        fc.constantFrom('product', '_x', '9a', '-a', 'a-b', 'a.b', 'é', 'in', ''),
        fc.constantFrom('', ' ', ' \t', 'x', '.'),
      )
      .map((p) => p.join(''))
    fc.assert(
      fc.property(tail, (t) => {
        const m = pattern.exec(t)
        const expected = m ? { from: m.index, nameStart: t.length - m[0].length + m[0].lastIndexOf(m[1]), nameEnd: t.length - m[0].length + m[0].lastIndexOf(m[1]) + m[1].length } : undefined
        expect(trailingIn(t), JSON.stringify(t)).toEqual(expected)
      }),
      { numRuns: 6000, seed: 67 },
    )
  })
})

describe('the keyword of a line', () => {
  it('is the first word of the statement, where it stands, for every kind of line', () => {
    // The oracle is the line's text: the word (letters and hyphens) the statement starts with.
    const lines = [
      'run "KOH batch"',
      'note sample taken',
      'conditions 25 degC',
      'let area = 36 cm^2',
      'cell',
      '  vessel polypropylene',
      '  compartment feed 1 L',
      '  separator cation-exchange between feed and product',
      '  anode mmo-titanium in feed',
      '  cathode nickel in product, area 36 cm^2',
      'charge feed: KCl 300 g, water 1 L',
      'step 1: current 2 A for 1 h',
      'expect KOH 25 g in product',
      'observe H2 3 L',
      'reaction anode: 2 Cl- -> Cl2 + 2 e-',
      'material house-mmo: Ti mesh',
      'include "defs.cellrun"',
      'handling vent: H2 outdoors',
      '   stpe 1: current 2 A  # a misspelt keyword',
      '',
      '# only a comment',
    ]
    const text = lines.join('\n')
    const tree = parse(text)
    const seen = new Set<string>()
    for (const n of tree.lines) {
      const kw = keywordOf(n)
      const line = lines[n.line]
      const first = /^\s*([A-Za-z][A-Za-z-]*)/.exec(line.replace(/#.*$/, ''))
      if (!first) {
        expect(kw, line).toBeUndefined()
        continue
      }
      expect(kw, line).toBeDefined()
      expect(text.slice(kw!.start, kw!.end), line).toBe(first[1])
      expect(kw!.text, line).toBe(first[1])
      seen.add(n.kind)
    }
    expect(seen.size).toBeGreaterThanOrEqual(17)
  })
})
