// The editor features as pure core functions: completion, code lens, folding, semantic tokens,
// formatting, definition / references / rename, and the formula hover's data notes. Expected
// places are marked in the test documents (⟦range⟧, ‸cursor); expected numbers are worked out
// here from outside sources (SI 2019 constants, IUPAC atomic weights), never copied from output.
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import * as fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { analyze, type Analysis } from '../server/src/core/analyze'
import { completionsAt, ELECTRODE_MATERIALS, type CompletionItem } from '../server/src/core/complete'
import type { Edit } from '../server/src/core/diagnostics'
import { foldingRanges } from '../server/src/core/folding'
import { formatDocument } from '../server/src/core/format'
import { hoverWithData } from '../server/src/core/hover'
import { codeLenses, SHOW_PREVIEW_COMMAND } from '../server/src/core/lens'
import { definitionAt, prepareRename, referencesAt, renameAt } from '../server/src/core/references'
import { HANDLING_KINDS, SEPARATOR_KINDS, STATEMENT_KEYWORDS, STEP_CLAUSES } from '../server/src/core/syntax'
import { semanticTokens } from '../server/src/core/tokens'
import { covered, marked } from './support/markers'

/** Multiply the property-test runs for a deeper local session: CELLRUN_FUZZ_SCALE=20 npx vitest run test/lsp-features.test.ts */
const SCALE = Math.max(1, Number(process.env.CELLRUN_FUZZ_SCALE) || 1)

const ROOT = fileURLToPath(new URL('..', import.meta.url))
const EXAMPLES = readdirSync(join(ROOT, 'examples'))
  .filter((f) => f.endsWith('.cellrun'))
  .sort()
  .map((f) => ({ name: f, text: readFileSync(join(ROOT, 'examples', f), 'utf8') }))
const KOH = EXAMPLES.find((e) => e.name === 'koh-from-carbonate.cellrun')!.text

const CELL = `cell
  compartment feed 500 mL
  compartment product 250 mL
  separator cation-exchange between feed and product, area 50 cm^2
  anode mmo-titanium in feed, area 50 cm^2
  cathode nickel in product, area 50 cm^2
`

/** Apply edits (non-overlapping, any order) to a text, independently of the server. */
function applyEdits(text: string, edits: Edit[]): string {
  let out = text
  for (const e of [...edits].sort((x, y) => y.span.start - x.span.start)) out = out.slice(0, e.span.start) + e.newText + out.slice(e.span.end)
  return out
}

/** Completion at the cursor of a marked document. */
function complete(src: string): { items: CompletionItem[]; text: string; cursor: number; ranges: { start: number; end: number }[] } {
  const m = marked(src)
  return { items: completionsAt(analyze(m.text), m.cursor!), text: m.text, cursor: m.cursor!, ranges: m.ranges }
}
const labels = (items: CompletionItem[]) => items.map((i) => i.label)

// ------------------------------------------------------------------------------------------------

describe('completion', () => {
  it('offers every statement keyword at the start of a line, each with one line of documentation and plain insert text', () => {
    const { items, cursor } = complete(`${CELL}‸\n`)
    expect(labels(items).sort()).toEqual([...STATEMENT_KEYWORDS].sort())
    for (const i of items) {
      expect(i.kind).toBe('keyword')
      expect(i.documentation, i.label).toBeTruthy()
      expect(i.documentation).not.toContain('\n')
      // Snippet-free: no tab stops or placeholders.
      expect(i.insertText ?? i.label).not.toMatch(/\$\{?\d/)
      expect((i.insertText ?? i.label).startsWith(i.label)).toBe(true)
      expect(i.replace).toEqual({ start: cursor, end: cursor })
    }
  })

  it('replaces the part of the keyword already typed', () => {
    const { items, ranges } = complete(`${CELL}⟦ste⟧‸\n`)
    expect(labels(items)).toContain('step')
    expect(items.every((i) => i.replace.start === ranges[0].start && i.replace.end === ranges[0].end)).toBe(true)
  })

  it('offers the clause words after `step N:` and after a comma', () => {
    expect(labels(complete(`${CELL}step 1: ‸\n`).items).sort()).toEqual([...STEP_CLAUSES].sort())
    const after = complete(`${CELL}step 1: current 2 A, ⟦eff⟧‸\n`)
    expect(labels(after.items).sort()).toEqual([...STEP_CLAUSES].sort())
    expect(after.items[0].replace).toEqual(after.ranges[0])
  })

  it('offers separator kinds, electrode materials and handling kinds', () => {
    expect(labels(complete(`${CELL}  separator ‸\n`).items).sort()).toEqual([...SEPARATOR_KINDS].sort())
    expect(labels(complete(`${CELL}handling ‸\n`).items).sort()).toEqual([...HANDLING_KINDS].sort())
    const materials = labels(complete(`${CELL}  anode ‸\n`).items)
    for (const m of ['mmo-titanium', 'platinum', 'platinized-titanium', 'graphite', 'nickel', 'lead', 'copper', 'steel', 'titanium', 'boron-doped-diamond']) {
      expect(materials).toContain(m)
    }
    expect(labels(complete(`${CELL}  cathode ‸\n`).items)).toEqual(ELECTRODE_MATERIALS.map((x) => x.name))
  })

  it('offers the compartments after `charge`, `between`, `and`, ` in `', () => {
    for (const src of [
      `${CELL}charge ‸\n`,
      `${CELL}  separator diaphragm between ‸\n`,
      `${CELL}  separator diaphragm between feed and ‸\n`,
      `${CELL}  anode graphite in ‸\n`,
      `${CELL}expect KOH 5 g in ‸\n`,
      `${CELL}observe KOH 5 g in pro‸\n`,
    ]) {
      const { items } = complete(src)
      expect(labels(items), src).toEqual(['feed', 'product'])
      expect(items.every((i) => i.kind === 'compartment')).toBe(true)
    }
  })

  it('offers `let` names and units inside expressions, without the value being defined', () => {
    const { items, ranges } = complete(`let area = 50 cm^2\nlet j = 100 mA/cm^2\nlet x = 2 * ⟦ar⟧‸\n${CELL}`)
    const names = labels(items)
    expect(names).toContain('area')
    expect(names).toContain('j')
    expect(names).not.toContain('x')
    for (const u of ['g', 'kg', 'mg', 'mol', 'mmol', 'L', 'mL', 'cm^2', 'dm^2', 'm^2', 'A', 'mA', 'V', 's', 'min', 'h', 'C', 'Ah', 'mAh', 'Wh', 'degC', 'K', 'kPa', 'bar', 'atm', 'mol/L', 'M', 'mM', 'g/L', 'wt%', '%']) {
      expect(names).toContain(u)
    }
    expect(items.find((i) => i.label === 'area')!.replace).toEqual(ranges[0])
    // A step expression may go on with the next clause word.
    const step = labels(complete(`let area = 50 cm^2\n${CELL}step 1: current 2 ‸\n`).items)
    expect(step).toContain('area')
    expect(step).toContain('A')
    expect(step).toContain('for')
  })

  it('offers formulas with their molar mass after `charge X:`, `expect` and `observe`', () => {
    const { items, ranges } = complete(`${CELL}charge feed: water 400 mL, ⟦K2⟧‸\n`)
    const k2co3 = items.find((i) => i.label === 'K2CO3')
    expect(k2co3, labels(items).join(' ')).toBeDefined()
    expect(k2co3!.kind).toBe('formula')
    expect(k2co3!.replace).toEqual(ranges[0])
    // M(K2CO3) = 2 × 39.0983 + 12.011 + 3 × 15.999 = 138.2046 g/mol (IUPAC 2021 standard atomic weights)
    const mass = /M = ([\d.]+) g\/mol/.exec(k2co3!.documentation ?? '')
    expect(Number(mass?.[1])).toBeCloseTo(138.2046, 2)
    expect(k2co3!.documentation).toContain('IUPAC 2021 standard atomic weights')
    for (const f of ['NaCl', 'KOH', 'NaOH', 'CuSO4', 'water']) expect(labels(items)).toContain(f)

    const products = labels(complete(`${CELL}expect ‸\n`).items)
    for (const f of ['KOH', 'H2', 'O2', 'Cl2', 'Cu']) expect(products).toContain(f)
    expect(labels(complete(`${CELL}observe N‸\n`).items)).toContain('NaOH')
  })

  it('offers nothing inside a comment or a quoted title', () => {
    expect(complete(`${CELL}# step ‸\n`).items).toEqual([])
    expect(complete(`run "KOH ‸\n`).items).toEqual([])
    expect(complete(`note some ‸\n`).items).toEqual([])
  })
})

// ------------------------------------------------------------------------------------------------

describe('definition, references and rename', () => {
  const VALUES = `let ⟦area⟧ = 50 cm^2
let area2 = 2 * ⟦area⟧
let j = 100 mA/cm^2
cell
  compartment feed 500 mL
  compartment product 250 mL
  separator cation-exchange between feed and product, area ⟦area⟧
  anode mmo-titanium in feed, area sqrt(⟦area⟧ * ⟦area⟧)
  cathode nickel in product, area area2
step 1: current j*⟦ar‸ea⟧ for 1 h
step 2: current 2 A for 1 h
`

  it('finds every use of a `let` name by whole word, skipping units and longer names', () => {
    const m = marked(VALUES)
    const a = analyze(m.text)
    expect(referencesAt(a, m.cursor!, true)).toEqual(m.ranges)
    expect(referencesAt(a, m.cursor!, false)).toEqual(m.ranges.slice(1))
    expect(definitionAt(a, m.cursor!)).toEqual(m.ranges[0])
  })

  it('reads `x²` as a use of `x`, as the expression reader does', () => {
    const m = marked(`let ⟦side⟧ = 5 cm\nlet ⟦ar‸ea⟧ = ⟦side⟧² + ⟦side⟧^2\nlet other = 2 * ⟦area⟧ + areas\n`)
    const a = analyze(m.text)
    const cursor = m.cursor!
    expect(referencesAt(a, cursor, true)).toEqual([m.ranges[1], m.ranges[4]])
    expect(referencesAt(a, m.ranges[2].start, true)).toEqual([m.ranges[0], m.ranges[2], m.ranges[3]])
  })

  it('finds a compartment from its declaration and every mention', () => {
    const m = marked(`cell
  compartment ⟦fe‸ed⟧ 500 mL
  compartment product 250 mL
  separator cation-exchange between ⟦feed⟧ and product
  anode mmo-titanium in ⟦feed⟧, area 50 cm^2
  cathode nickel in product, area 50 cm^2
charge ⟦feed⟧: K2CO3 100 g, water 400 mL
step 1: current 1 A for 1 h
expect KOH 5 g in product
observe O2 1 L in ⟦feed⟧
`)
    const a = analyze(m.text)
    expect(referencesAt(a, m.cursor!, true)).toEqual(m.ranges)
    // From a mention, the definition is the compartment line's name.
    expect(definitionAt(a, m.ranges[2].start + 1)).toEqual(m.ranges[0])
  })

  it('renames a value everywhere; the renamed protocol computes the same', () => {
    const m = marked(VALUES)
    const a = analyze(m.text)
    const r = renameAt(a, m.cursor!, 'electrodeArea')
    expect('edits' in r).toBe(true)
    if (!('edits' in r)) return
    expect(r.edits.map((e) => e.span)).toEqual(m.ranges)
    expect(r.edits.every((e) => e.newText === 'electrodeArea')).toBe(true)
    const renamed = analyze(applyEdits(m.text, r.edits))
    expect(renamed.diagnostics.map((d) => d.code)).toEqual(a.diagnostics.map((d) => d.code))
    expect(renamed.computed.map((c) => c.label)).toEqual(a.computed.map((c) => c.label))
  })

  it('renames a compartment in its declaration and every mention', () => {
    const m = marked(`cell\n  compartment ⟦feed⟧ 500 mL\n  anode graphite in ⟦feed⟧\n  cathode nickel in ⟦fe‸ed⟧\ncharge ⟦feed⟧: NaCl 10 g, water 400 mL\n`)
    const r = renameAt(analyze(m.text), m.cursor!, 'anolyte')
    expect('edits' in r && r.edits.map((e) => covered(m.text, e.span))).toEqual(['feed', 'feed', 'feed', 'feed'])
    expect('edits' in r && r.edits.map((e) => e.span)).toEqual(m.ranges)
  })

  it('refuses a new name that is no identifier, a unit, a word of the format or a name already defined', () => {
    const m = marked(VALUES)
    const a = analyze(m.text)
    for (const bad of ['2area', 'my area', 'my-area', '', 'min', 'mA', 'h', 'j', 'area2', 'feed', 'for', 'between']) {
      const r = renameAt(a, m.cursor!, bad)
      expect('error' in r, `rename to "${bad}"`).toBe(true)
    }
    // A compartment name may have a hyphen, but not be a unit or an existing name.
    const feed = m.text.indexOf('feed') + 1
    expect('edits' in renameAt(a, feed, 'feed-side')).toBe(true)
    expect('error' in renameAt(a, feed, 'product')).toBe(true)
    expect('error' in renameAt(a, feed, 'L')).toBe(true)
  })

  it('prepares a rename only on a name', () => {
    const m = marked(VALUES)
    const a = analyze(m.text)
    expect(prepareRename(a, m.cursor!)).toEqual({ span: m.ranges[5], placeholder: 'area' })
    expect('error' in prepareRename(a, m.text.indexOf('mmo-titanium') + 2)).toBe(true)
    // `h` is a unit, not a name.
    expect('error' in prepareRename(a, m.text.indexOf('1 h') + 2)).toBe(true)
  })
})

// ------------------------------------------------------------------------------------------------

describe('folding ranges', () => {
  it('folds the cell block, comment runs, regions and runs of charge, step and handling lines', () => {
    const text = [
      '# first comment', // 0
      '# second comment', // 1
      'run "x"', // 2
      'cell', // 3
      '  compartment a 1 L', // 4
      '', // 5
      '  anode graphite in a', // 6
      '  cathode nickel in a', // 7
      '', // 8
      '# region charges', // 9
      'charge a: NaCl 10 g, water 900 mL', // 10
      'charge a: NaCl 5 g', // 11
      '# endregion', // 12
      'step 1: current 1 A for 1 h', // 13
      'step 2: current 2 A for 1 h', // 14
      'step 3: current 3 A for 1 h', // 15
      'handling vent: outside', // 16
      'handling hood: yes', // 17
      'note one', // 18
      '',
    ].join('\n')
    const ranges = foldingRanges(analyze(text))
    expect(ranges).toContainEqual({ startLine: 3, endLine: 7 })
    expect(ranges).toContainEqual({ startLine: 0, endLine: 1, kind: 'comment' })
    expect(ranges).toContainEqual({ startLine: 9, endLine: 12, kind: 'region' })
    expect(ranges).toContainEqual({ startLine: 10, endLine: 11 })
    expect(ranges).toContainEqual({ startLine: 13, endLine: 15 })
    expect(ranges).toContainEqual({ startLine: 16, endLine: 17 })
    expect(ranges).toHaveLength(6)
  })
})

// ------------------------------------------------------------------------------------------------

describe('semantic tokens', () => {
  /** The tokens of one line, as `text:type[.modifier...]`. */
  function lineTokens(a: Analysis, lineText: string): string[] {
    const start = a.text.indexOf(lineText)
    const end = start + lineText.length
    return semanticTokens(a)
      .filter((t) => t.span.start >= start && t.span.end <= end)
      .map((t) => [`${a.text.slice(t.span.start, t.span.end)}:${t.type}`, ...t.modifiers].join('.'))
  }

  it('marks keywords, names, kinds, units, numbers and formulas with standard token types', () => {
    const a = analyze(KOH)
    expect(lineTokens(a, '  separator cation-exchange between feed and product, area area')).toEqual([
      'separator:keyword',
      'cation-exchange:type',
      'between:keyword',
      'feed:variable',
      'and:keyword',
      'product:variable',
      'area:keyword',
      'area:variable.readonly',
    ])
    expect(lineTokens(a, 'let j = 100 mA/cm^2')).toEqual([
      'let:keyword',
      'j:variable.declaration.readonly',
      '=:operator',
      '100:number',
      'mA:type.defaultLibrary',
      '/:operator',
      'cm:type.defaultLibrary',
      '^:operator',
      '2:number',
    ])
    expect(lineTokens(a, 'step 1: current j * area for 6 h, efficiency 90 %')).toEqual([
      'step:keyword',
      '1:label',
      'current:keyword',
      'j:variable.readonly',
      '*:operator',
      'area:variable.readonly',
      'for:keyword',
      '6:number',
      'h:type.defaultLibrary',
      'efficiency:keyword',
      '90:number',
      '%:type.defaultLibrary',
    ])
    expect(lineTokens(a, 'charge feed: K2CO3 180 g, water 420 mL')).toEqual([
      'charge:keyword',
      'feed:variable',
      'K2CO3:struct',
      '180:number',
      'g:type.defaultLibrary',
      'water:struct',
      '420:number',
      'mL:type.defaultLibrary',
    ])
    expect(lineTokens(a, 'run "KOH from carbonate, batch 3"')).toEqual(['run:keyword', '"KOH from carbonate, batch 3":string'])
  })

  it('reads units as typed: °C, µA, wt%, cm²', () => {
    const text = 'conditions 25 °C\nlet i = 500 µA\nlet w = 10 wt%\nlet s = 3 cm²\n'
    const a = analyze(text)
    expect(lineTokens(a, 'conditions 25 °C')).toEqual(['conditions:keyword', '25:number', '°C:type.defaultLibrary'])
    expect(lineTokens(a, 'let i = 500 µA').slice(3)).toEqual(['500:number', 'µA:type.defaultLibrary'])
    expect(lineTokens(a, 'let w = 10 wt%').slice(3)).toEqual(['10:number', 'wt%:type.defaultLibrary'])
    expect(lineTokens(a, 'let s = 3 cm²').slice(3)).toEqual(['3:number', 'cm:type.defaultLibrary', '²:operator'])
  })

  it('gives sorted, non-overlapping tokens, each within one line, for every example', () => {
    for (const e of EXAMPLES) {
      const a = analyze(e.text)
      const tokens = semanticTokens(a)
      expect(tokens.length).toBeGreaterThan(20)
      for (let i = 0; i < tokens.length; i++) {
        const t = tokens[i]
        expect(t.span.end).toBeGreaterThan(t.span.start)
        expect(a.text.slice(t.span.start, t.span.end)).not.toMatch(/[\r\n]/)
        if (i > 0) expect(t.span.start).toBeGreaterThanOrEqual(tokens[i - 1].span.end)
      }
      const comments = tokens.filter((t) => t.type === 'comment').map((t) => a.text.slice(t.span.start, t.span.end))
      expect(comments.every((c) => c.startsWith('#'))).toBe(true)
    }
  })
})

// ------------------------------------------------------------------------------------------------

describe('code lens', () => {
  // SI 2019 exact constants: F = e·N_A, R = k·N_A.
  const F = 1.602176634e-19 * 6.02214076e23
  const R = 1.380649e-23 * 6.02214076e23

  it('sums up the run on the `run` line: products, gases, duration, and opens the preview', () => {
    const a = analyze(KOH)
    const lenses = codeLenses(a)
    expect(lenses).toHaveLength(1)
    const runLine = 'run "KOH from carbonate, batch 3"'
    expect(covered(KOH, lenses[0].span)).toBe(runLine)
    expect(lenses[0].command).toBe(SHOW_PREVIEW_COMMAND)
    const title = lenses[0].title
    // KOH at the stated efficiencies: 90 % of 5 A × 6 h plus 80 % of 3 A × 1 h = 29.4 A·h;
    // n = 29.4 × 3600 / F = 1.09696 mol; M(KOH) = 39.0983 + 15.999 + 1.008 = 56.1053 g/mol -> 61.5 g.
    const kohG = ((29.4 * 3600) / F) * (39.0983 + 15.999 + 1.008)
    expect(kohG).toBeCloseTo(61.546, 2)
    expect(title).toContain(`KOH 61.5 g`)
    // H2 from all the charge (33 A·h, 2 e⁻ per H2) at 30 °C and 101.325 kPa: V = nRT/p.
    const h2L = ((33 * 3600) / F / 2) * R * 303.15 / 101325 * 1000
    expect(h2L).toBeCloseTo(15.31, 1)
    expect(title).toMatch(/H₂ 15\.3 L/)
    expect(title).toContain('7 h')
    expect(title).not.toContain('W·h') // no voltage stated: no energy
  })

  it('adds the energy when the voltage is stated', () => {
    const text = `run "plating"\n${CELL}charge feed: NaCl 50 g, water 400 mL\ncharge product: NaOH 5 g, water 200 mL\nstep 1: current 2 A, voltage 3 V for 1 h\n`
    const title = codeLenses(analyze(text))[0].title
    // E = U·I·t = 3 V × 2 A × 1 h = 6 W·h
    expect(title).toContain('6 W·h')
    expect(title).toContain('1 h')
  })

  it('says so when no charge is passed, and has no lens without a `run` line', () => {
    expect(codeLenses(analyze(`run "empty"\n${CELL}`))[0].title).toMatch(/no charge/)
    expect(codeLenses(analyze(CELL))).toEqual([])
  })
})

// ------------------------------------------------------------------------------------------------

describe('formula hover with data', () => {
  it('adds the solubility at the run temperature and the density table to the molar mass', () => {
    const a = analyze(KOH) // conditions 30 degC
    const h = hoverWithData(a, KOH.indexOf('K2CO3') + 2)
    const md = h?.markdown ?? ''
    expect(md).toMatch(/M = 138\.20\d* g\/mol/)
    // K2CO3: about 114 g per 100 g water at 30 °C (Perry's / CRC solubility tables, from memory).
    const s = /Solubility at 30 °C: ([\d.]+) g/.exec(md)
    expect(s, md).not.toBeNull()
    expect(Number(s![1])).toBeGreaterThan(110)
    expect(Number(s![1])).toBeLessThan(118)
    expect(md).toContain('Density table at 20 °C')
    // The data comes before the working of the charge item.
    expect(md.indexOf('Solubility')).toBeLessThan(md.indexOf('charged'))
  })

  it('adds nothing for a substance the tables do not cover', () => {
    const a = analyze(EXAMPLES.find((e) => e.name === 'acid-copper-plating.cellrun')!.text)
    const at = a.text.indexOf('expect Cu') + 'expect '.length
    const md = hoverWithData(a, at)?.markdown ?? ''
    expect(md).toContain('g/mol')
    expect(md).not.toContain('Solubility')
    expect(md).not.toContain('Density table')
  })
})

// ------------------------------------------------------------------------------------------------

/** What formatting must keep: diagnostics (code and message) and the computed labels. */
function meaning(text: string): { diagnostics: string[]; labels: string[] } {
  const a = analyze(text)
  return {
    diagnostics: a.diagnostics.map((d) => `${d.code}: ${d.message}`).sort(),
    labels: a.computed.map((c) => `${c.key}: ${c.label}`).sort(),
  }
}

describe('formatting', () => {
  it('normalises spacing, indentation, commas, comments and blank lines', () => {
    const messy = [
      '#  a comment   ',
      'run   "KOH  batch"  ',
      'note   free   text,kept',
      'conditions 30 degC ,101.325   kPa',
      '',
      '',
      '',
      '',
      'let   area=50 cm^2   # the area',
      'cell',
      '\tcompartment feed    500 mL',
      '    compartment product 250 mL',
      '      separator cation-exchange   between feed and  product ,area area',
      ' anode mmo-titanium in feed,  area area',
      '  cathode nickel in product, area area',
      'charge feed : K2CO3 180 g,water 420 mL',
      'charge product:KOH 5 g, water 240 mL',
      'step 1 :current 5 A   for 6 h ,efficiency 90 %',
      'handling   vent :   H2  piped   away',
      'expect KOH 60 g  in product',
      '',
    ].join('\n')
    const formatted = [
      '#  a comment',
      'run "KOH  batch"',
      'note free   text,kept',
      'conditions 30 degC, 101.325 kPa',
      '',
      '',
      'let area = 50 cm^2 # the area',
      'cell',
      '  compartment feed 500 mL',
      '  compartment product 250 mL',
      '  separator cation-exchange between feed and product, area area',
      '  anode mmo-titanium in feed, area area',
      '  cathode nickel in product, area area',
      'charge feed: K2CO3 180 g, water 420 mL',
      'charge product: KOH 5 g, water 240 mL',
      'step 1: current 5 A for 6 h, efficiency 90 %',
      'handling vent: H2  piped   away',
      'expect KOH 60 g in product',
      '',
    ].join('\n')
    const r = formatDocument(messy)
    expect(r.text).toBe(formatted)
    expect(applyEdits(messy, r.edits)).toBe(formatted)
    expect(meaning(formatted)).toEqual(meaning(messy))
    // Idempotent, and no edits for a formatted document.
    expect(formatDocument(formatted)).toEqual({ text: formatted, edits: [] })
  })

  it('returns minimal edits that touch only what changes', () => {
    const text = 'run "x"\nlet a  = 2 A\nlet b = 3 A\n'
    const r = formatDocument(text)
    expect(r.edits).toEqual([{ span: { start: text.indexOf('  =') + 1, end: text.indexOf('  =') + 2 }, newText: '' }])
    expect(applyEdits(text, r.edits)).toBe('run "x"\nlet a = 2 A\nlet b = 3 A\n')
  })

  it('keeps each line break as it is', () => {
    const text = 'run "x"\r\nlet a=2 A\rlet b = 3 A   \n'
    expect(formatDocument(text).text).toBe('run "x"\r\nlet a = 2 A\rlet b = 3 A\n')
  })

  it('leaves a line the parser cannot read as written, apart from indentation and trailing space', () => {
    const text = 'stepp  3 :  current 1 A   \n    foo   bar  \n'
    expect(formatDocument(text).text).toBe('stepp  3 :  current 1 A\n  foo   bar\n')
  })

  it('keeps spacing that a diagnostic quotes, so that its message stays the same', () => {
    // wrong-unit quotes the expression as written: `5   V`.
    const text = `${CELL}step 1:  current 5   V for 1 h\nstep 2:   current 2   A for 1 h\n`
    const r = formatDocument(text)
    expect(meaning(r.text)).toEqual(meaning(text))
    expect(meaning(text).diagnostics.some((d) => d.startsWith('wrong-unit') && d.includes('5   V'))).toBe(true)
    expect(r.text).toContain('step 1:  current 5   V for 1 h')
    expect(r.text).toContain('step 2: current 2 A for 1 h')
    expect(formatDocument(r.text).text).toBe(r.text)
  })

  it('keeps blank lines that a message counts (a line number in it)', () => {
    const text = 'run "x"\ncell\n  compartment bath 1 L\n  anode graphite in bath\n  cathode nickel in bath\ncharge bath: NaOCl 10 g, HCl 5 g,  water 900 mL\n\n\n\n\nhandling   hood: yes\n'
    // acidified-feed names the line of the declared hood: line 11.
    expect(meaning(text).diagnostics.some((d) => d.startsWith('acidified-feed') && d.includes('(line 11)'))).toBe(true)
    const r = formatDocument(text)
    expect(meaning(r.text)).toEqual(meaning(text))
    expect(r.text).toBe(text.replace(',  water', ', water').replace('handling   hood', 'handling hood'))
  })

  it('leaves the examples as they are', () => {
    for (const e of EXAMPLES) expect(formatDocument(e.text).edits, e.name).toEqual([])
  })

  interface Mutation {
    example: number
    spaces: [number, string][]
    trailing: [number, string][]
    blanks: [number, number, string][]
    indents: [number, string][]
  }

  // A document with findings whose messages quote expressions, names and line numbers.
  const BROKEN = `${KOH.trimEnd()}
let min = 3
step 9: current 5 V for 1 h
stepp 3: current 1 A for 1 h
charge feed: C02 3 g, NaOCl 10 g, HCl 5 g
expect KOH 900 g in product
observe Cu 2 g in nowhere
step 4: current 2 A * nothing for 1 h, efficiency 120
`
  const DOCS = [...EXAMPLES.map((e) => e.text), BROKEN]

  // Property: random white-space changes to the documents; formatting keeps the meaning and is idempotent.
  const mutation: fc.Arbitrary<Mutation> = fc.record({
    example: fc.integer({ min: 0, max: DOCS.length - 1 }),
    spaces: fc.array(fc.tuple(fc.nat(), fc.constantFrom(' ', '  ', '\t', ' \t ', '   ')), { maxLength: 12 }),
    trailing: fc.array(fc.tuple(fc.nat(), fc.constantFrom(' ', '\t', '   ', ' \t')), { maxLength: 6 }),
    blanks: fc.array(fc.tuple(fc.nat(), fc.integer({ min: 1, max: 4 }), fc.constantFrom('', ' ', '\t')), { maxLength: 4 }),
    indents: fc.array(fc.tuple(fc.nat(), fc.constantFrom(' ', '    ', '\t', ' \t')), { maxLength: 4 }),
  })

  function mutate(m: Mutation): string {
    const lines = DOCS[m.example].split('\n')
    // Extra white space where there is a space between two tokens.
    for (const [n, ws] of m.spaces) {
      const i = n % lines.length
      const gaps = [...lines[i].matchAll(/(?<=\S) (?=\S)/g)].map((x) => x.index!)
      if (gaps.length === 0) continue
      const at = gaps[Math.floor(n / lines.length) % gaps.length]
      lines[i] = lines[i].slice(0, at) + ws + lines[i].slice(at + 1)
    }
    for (const [n, ws] of m.trailing) lines[n % lines.length] += ws
    for (const [n, ws] of m.indents) {
      const i = n % lines.length
      if (/^\s+\S/.test(lines[i])) lines[i] = lines[i].replace(/^\s+/, ws)
    }
    for (const [n, count, ws] of m.blanks) lines.splice(n % (lines.length + 1), 0, ...Array.from({ length: count }, () => ws))
    return lines.join('\n')
  }

  it('keeps the diagnostics and computed labels of mutated examples, and is idempotent', () => {
    fc.assert(
      fc.property(mutation, (m) => {
        const text = mutate(m)
        const once = formatDocument(text)
        expect(applyEdits(text, once.edits)).toBe(once.text)
        expect(meaning(once.text)).toEqual(meaning(text))
        expect(formatDocument(once.text).text).toBe(once.text)
        // No trailing white space is left, nor (in the clean examples) a run of three blank lines.
        expect(once.text).not.toMatch(/[ \t]+$/m)
        if (m.example < EXAMPLES.length) expect(once.text).not.toMatch(/\n[ \t]*\n[ \t]*\n[ \t]*\n/)
      }),
      { numRuns: 80 * SCALE },
    )
  }, 120_000 * SCALE)

  it('restores an example whose statements only had their spacing changed', () => {
    fc.assert(
      fc.property(mutation, (m) => {
        if (m.example >= EXAMPLES.length) return
        // Free text (comments, the title, note and handling text) is kept as written: change the rest only.
        const free = /^\s*(#|run|note|handling)/
        const original = EXAMPLES[m.example].text
        const lines = original.split('\n')
        const changed = mutate({ ...m, blanks: [] }).split('\n')
        const text = lines.map((l, i) => (free.test(l) ? l : changed[i])).join('\n')
        expect(formatDocument(text).text).toBe(original)
      }),
      { numRuns: 80 * SCALE },
    )
  }, 120_000 * SCALE)
})
