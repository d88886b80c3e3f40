// The analysis entry points that the editor uses: hovers, hints (computed values) and the outline.
import { describe, expect, it } from 'vitest'
import { analyze, hoverAt, outline } from '../server/src/core/analyze'
import { marked } from './support/markers'

const CELL = `cell
  compartment feed 700 mL
  compartment product 180 mL
  separator cation-exchange between feed and product, area 36 cm^2
  anode mmo-titanium in feed, area 36 cm^2
  cathode nickel in product, area 36 cm^2
`

describe('hover', () => {
  it('shows the working of a step: Q = I·t', () => {
    const m = marked(`${CELL}step 1: current 1.44 A for 5‸ h\n`)
    const h = hoverAt(analyze(m.text), m.cursor!)
    // 1.44 A × 5 h = 7.2 A·h (arithmetic)
    expect(h?.markdown).toContain('Q = I·t = 1.44 A × 5 h = 7.2 A·h')
  })

  it('shows the current from a density and the cathode area', () => {
    const m = marked(`${CELL}let area = 36 cm^2\nstep 1: current 40 mA/c‸m^2 for 5 h\n`)
    const h = hoverAt(analyze(m.text), m.cursor!)
    // 40 mA/cm² × 36 cm² = 1440 mA = 1.44 A (arithmetic)
    expect(h?.markdown).toContain('I = j·A = 40 mA/cm² × 36 cm² (cathode nickel) = 1.44 A')
  })

  it('shows a formula with its molar mass', () => {
    const m = marked(`${CELL}charge feed: K2C‸O3 260 g\n`)
    const h = hoverAt(analyze(m.text), m.cursor!)
    // K2CO3: 2 × 39.0983 + 12.011 + 3 × 15.999 = 138.2046 g/mol (IUPAC 2021 atomic weights)
    expect(h?.markdown).toMatch(/K₂CO₃\*\*: M = 138\.20\d* g\/mol/)
  })

  it('is empty on a line with nothing computed', () => {
    const m = marked('note just ‸text\n')
    expect(hoverAt(analyze(m.text), m.cursor!)).toBeUndefined()
  })
})

describe('computed values', () => {
  it('puts the step hint at the end of the step statement, before any comment', () => {
    const src = `${CELL}step 1: current 2 A for 1 h   # first step\n`
    const a = analyze(src)
    const c = a.computed.find((x) => x.key === 'step.charge')!
    expect(src.slice(0, c.anchor).endsWith('for 1 h')).toBe(true)
    // 2 A × 1 h = 2 A·h = 7200 C (arithmetic)
    expect(c.value).toBe(7200)
    expect(c.label).toContain('2 A·h')
  })

  it('puts a hint after each charge item and the compartment summary after the last charge line', () => {
    const src = `${CELL}charge feed: K2CO3 260 g, water 600 mL\ncharge product: KOH 4 g\n`
    const a = analyze(src)
    const items = a.computed.filter((x) => x.key === 'charge.item')
    expect(items.map((i) => src.slice(i.span.start, i.span.end))).toEqual(['K2CO3 260 g', 'water 600 mL', 'KOH 4 g'])
    const summary = a.computed.filter((x) => x.key === 'compartment.contents')
    expect(summary.map((s) => s.label)).toEqual([expect.stringContaining('in feed'), expect.stringContaining('in product')])
  })

  it('adds a running total to the last of several steps', () => {
    const a = analyze(`${CELL}step 1: current 1 A for 1 h\nstep 2: current 2 A for 1 h\n`)
    const steps = a.computed.filter((x) => x.key === 'step.charge')
    expect(steps[0].label).not.toContain('Σ')
    expect(steps[1].label).toContain('Σ 3 A·h') // 1 A·h + 2 A·h
  })
})

describe('run totals', () => {
  it('shows the whole run on the run line, with the energy when every step states a voltage', () => {
    const src = `run "t"\n${CELL}step 1: current 1 A, voltage 3 V for 1 h\nstep 2: current 2 A, voltage 3.5 V for 30 min\n`
    const a = analyze(src)
    const c = a.computed.find((x) => x.key === 'run.totals')!
    expect(c.line).toBe(0)
    // 1 A × 1 h + 2 A × 0.5 h = 2 A·h = 7200 C over 1.5 h; 3 V × 1 A·h + 3.5 V × 1 A·h = 6.5 W·h (arithmetic)
    expect(c.value).toBeCloseTo(7200, 9)
    // n(e⁻) = 7200 C ÷ 96485.33212 C/mol (CODATA 2018 F) = 0.0746 mol
    expect(c.label).toBe('1.5 h · 2 A·h · 0.0746 mol e⁻ · 6.5 W·h')
  })
})

describe('outline', () => {
  it('nests the cell parts under the cell', () => {
    const src = `run "t"\nlet x = 2 A\n${CELL}charge feed: NaCl 1 g\nstep 1: current x for 1 h\nexpect H2 1 g\n`
    const o = outline(analyze(src))
    expect(o.map((i) => i.kind)).toEqual(['run', 'value', 'cell', 'charge', 'step', 'expect'])
    const cell = o.find((i) => i.kind === 'cell')!
    expect(cell.children.map((c) => c.name)).toEqual(['feed', 'product', 'cation-exchange', 'anode', 'cathode'])
    expect(src.slice(cell.span.start, cell.span.end)).toBe(CELL.trimEnd())
  })
})

describe('regressions found by the fuzz run', () => {
  it('a concentration planned for a gas (not a target) is reported, not a crash of the simulated yields', () => {
    // Found by `npm run fuzz` (shrunk by hand): hydrogen is the simulated main product here, and
    // `0.5 mol/L` is a concentration, which a gas cannot be planned as; the analysis threw.
    const text = [
      'cell',
      '  compartment bath 1 L',
      '  anode nickel in bath',
      '  cathode nickel in bath',
      'charge bath: KOH 56 g, water 1 L',
      'step 1: current 1 A for 1 h',
      'expect H2 0.5 mol/L in bath',
      'handling vent: hydrogen piped outdoors',
      '',
    ].join('\n')
    const a = analyze(text)
    expect(a.model.simulation?.mainProduct?.formula).toBe('H2')
    const wrong = a.diagnostics.filter((d) => d.code === 'wrong-unit')
    expect(wrong.map((d) => a.index.lineOf(d.span.start))).toEqual([6])
    expect(a.computed.some((c) => c.key === 'expect.target')).toBe(false)
  })
})
