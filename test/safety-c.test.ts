// Hazard rules, group c: current-density-limit, heat-rise, soluble-anode, ventilation-capacity.
// For each: it fires on a minimal protocol (code, severity and the ⟦marked⟧ span), it stays silent
// when the hazard is handled and on the shipped examples, its quick fix clears it, and its caution
// defers to local codes.
//
// Figures checked here are hand arithmetic from outside constants: F = 96485.33212 C/mol (CODATA
// 2018), R = 8.314462618 J/(mol·K) (CODATA 2018), atomic weights IUPAC 2021 (from memory); the rule
// thresholds are the rules' own stated figures, with their sources named beside them.
import { readdirSync, readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import type { Analysis } from '../server/src/core/analyze'
import type { Diagnostic, Severity } from '../server/src/core/diagnostics'
import { RULES } from '../server/src/rules'
import { GROUP_C } from '../server/src/rules/safety/group-c'
import { ceil2, flowIn } from '../server/src/rules/safety/ventilation-capacity'
import { ruleTester } from './support/rule-tester'

// ---- helpers -----------------------------------------------------------------------------------

const analyses: Analysis[] = []

const tester = ruleTester({ onAnalysis: (a) => analyses.push(a) })
const { silent } = tester
/** The diagnostics of `code` are exactly at the ⟦marked⟧ ranges, with the given severity. */
const at = (src: string, code: string, severity: Severity) => tester.at(src, code, severity)
/** Apply the first fix; the text must become `expected`, and re-analysed it has no finding of the code at all. */
const fixClears = (text: string, d: Diagnostic, expected: string) => tester.fixClears(text, d, expected, { scope: 'document' })

const examplesDir = fileURLToPath(new URL('../examples/', import.meta.url))
const EXAMPLES = readdirSync(examplesDir)
  .filter((f) => f.endsWith('.cellrun'))
  .sort()
const example = (name: string) => readFileSync(examplesDir + name, 'utf8')

const rule = (code: string) => {
  const r = RULES.find((x) => x.code === code)
  expect(r, code).toBeDefined()
  return r!
}

/** The caution is present on the rule and travels with its findings. */
function cautionChecks(code: string, d: Diagnostic) {
  const r = rule(code)
  expect(r.category).toBe('safety')
  expect(r.caution).toMatch(/local codes/)
  expect(r.source?.length).toBeGreaterThan(10)
  expect(r.details?.length).toBeGreaterThan(10)
  expect(d.caution).toBe(r.caution)
  expect(d.caution).toMatch(/local codes/)
}

// ---- group listing -----------------------------------------------------------------------------
describe('group c', () => {
  it('lists its four rules in order, all registered as hazard rules', () => {
    expect(GROUP_C.map((r) => r.code)).toEqual(['current-density-limit', 'heat-rise', 'soluble-anode', 'ventilation-capacity'])
    for (const r of GROUP_C) {
      expect(RULES).toContain(r)
      expect(r.category).toBe('safety')
      expect(r.severity).toBe('warning')
    }
  })

  it('the shipped examples are the three expected', () => {
    expect(EXAMPLES).toEqual(['acid-copper-plating.cellrun', 'brine-chlorine.cellrun', 'koh-from-carbonate.cellrun'])
  })
})

// ---- current-density-limit ---------------------------------------------------------------------
// A sulfate cell with a 10 cm² anode and a 50 cm² membrane.
const CD = [
  'run "current density"',
  'cell',
  '  compartment anolyte 500 mL',
  '  compartment catholyte 500 mL',
  '  separator anion-exchange between anolyte and catholyte, area 50 cm^2',
  '  anode graphite in anolyte, area 10 cm^2',
  '  cathode nickel in catholyte, area 10 cm^2',
  'charge anolyte: Na2SO4 20 g, water 450 mL',
  'charge catholyte: Na2SO4 20 g, water 450 mL',
  'step 1: current 1.5 A for 1 h',
  'handling vent: hydrogen to the hood',
  '',
].join('\n')

describe('current-density-limit', () => {
  it('fires on a graphite anode run above 100 mA/cm², at the current, with the figures', () => {
    // 1.5 A ÷ 10 cm² = 0.15 A/cm² = 150 mA/cm² (hand arithmetic) > 100 mA/cm² for graphite
    // (the rule's table: common practice, no source). The membrane: 1.5 A ÷ 50 cm² = 30 mA/cm² < 500.
    const { ds } = at(CD.replace('current 1.5 A', 'current ⟦1.5 A⟧'), 'current-density-limit', 'warning')
    expect(ds[0].message).toContain('150 mA/cm² on the graphite anode')
    expect(ds[0].message).toContain('above the 100 mA/cm²')
    expect(ds[0].message).not.toContain('anion-exchange separator')
    cautionChecks('current-density-limit', ds[0])
  })

  it('fixes a plain current by lowering it to the limit × area, which clears it', () => {
    // 100 mA/cm² × 10 cm² = 1000 mA = 1 A (hand arithmetic)
    const { text, ds } = at(CD.replace('current 1.5 A', 'current ⟦1.5 A⟧'), 'current-density-limit', 'warning')
    expect(ds[0].fixes[0].title).toBe('Lower the current to 1 A')
    fixClears(text, ds[0], CD.replace('current 1.5 A', 'current 1 A'))
  })

  it('fires on a separator too, and offers no fix for a current density', () => {
    // 300 mA/cm² on the 10 cm² cathode = 3 A; 3 A ÷ 5 cm² of membrane = 600 mA/cm² > 500 for an
    // anion-exchange membrane, and 3 A ÷ 10 cm² = 300 mA/cm² > 100 on the graphite anode (hand arithmetic).
    const src = CD.replace('area 50 cm^2', 'area 5 cm^2').replace('current 1.5 A', 'current ⟦300 mA/cm^2⟧')
    const { ds } = at(src, 'current-density-limit', 'warning')
    expect(ds[0].message).toContain('300 mA/cm² on the graphite anode')
    expect(ds[0].message).toContain('600 mA/cm² on the anion-exchange separator between anolyte and catholyte')
    expect(ds[0].fixes).toEqual([])
  })

  it('takes the lowest of the limits when several parts are over them', () => {
    // 2 A: graphite 2 A ÷ 10 cm² = 200 mA/cm², its limit 100 mA/cm² × 10 cm² = 1 A; membrane
    // 2 A ÷ 1.5 cm² = 1333 mA/cm², its limit 500 mA/cm² × 1.5 cm² = 0.75 A, the lower one (hand arithmetic).
    const src = CD.replace('area 50 cm^2', 'area 1.5 cm^2').replace('current 1.5 A', 'current ⟦2 A⟧')
    const { text, ds } = at(src, 'current-density-limit', 'warning')
    fixClears(text, ds[0], src.replace('current ⟦2 A⟧', 'current 0.75 A'))
  })

  it('is silent for an anode material that takes the current density (MMO-titanium, 600 mA/cm²)', () => {
    // 150 mA/cm² < 600 mA/cm² (membrane chlor-alkali anodes at 3-6 kA/m², EU BREF 2014, from memory)
    silent(CD.replace('anode graphite', 'anode mmo-titanium'), 'current-density-limit')
  })

  it('is silent within the limit, and for a cathode (the table holds anode and separator limits)', () => {
    silent(CD.replace('current 1.5 A', 'current 1 A'), 'current-density-limit')
    // A graphite cathode at 150 mA/cm² with a platinum anode (limit 500): nothing to report.
    silent(CD.replace('anode graphite', 'anode platinum').replace('cathode nickel', 'cathode graphite'), 'current-density-limit')
  })

  it('checks a nickel anode only in alkali, where it evolves oxygen', () => {
    // Nickel in alkali: 6 A ÷ 10 cm² = 600 mA/cm² > 500 (alkaline electrolysers, common practice, no source).
    const alk = CD.replace('anode graphite', 'anode nickel').replace('anolyte: Na2SO4 20 g', 'anolyte: KOH 20 g').replace('current 1.5 A', 'current ⟦6 A⟧')
    at(alk, 'current-density-limit', 'warning')
    // Not flagged at 150 mA/cm² in alkali.
    silent(CD.replace('anode graphite', 'anode nickel').replace('anolyte: Na2SO4 20 g', 'anolyte: KOH 20 g'), 'current-density-limit')
  })

  it.each(EXAMPLES)('is silent on the example %s (all parts within their limits)', (f) => {
    // koh: 100 mA/cm² on MMO and membrane; brine: 3 kA/m² = 300 mA/cm² on MMO and membrane;
    // plating: 4 A ÷ 250 cm² = 16 mA/cm² on the copper anode (< 30).
    silent(example(f), 'current-density-limit')
  })
})

// ---- heat-rise ---------------------------------------------------------------------------------
// An undivided KOH cell: 4 A at 3 V for 2 h into about 190 g of solution.
const HEAT = [
  'run "hot"',
  'cell',
  '  compartment bath 200 mL',
  '  anode platinum in bath, area 20 cm^2',
  '  cathode nickel in bath, area 20 cm^2',
  'charge bath: KOH 10 g, water 180 mL',
  'step 1: current 4 A, voltage 3 V for 2 h',
  'handling vent: hydrogen and oxygen to the hood exhaust',
  '',
].join('\n')

describe('heat-rise', () => {
  it('fires at the step that warms the cell past a 20 K rise, with start, peak and ΔT', () => {
    const { ds } = at(HEAT.replace('step 1: current 4 A, voltage 3 V for 2 h', '⟦step 1: current 4 A, voltage 3 V for 2 h⟧'), 'heat-rise', 'warning')
    // Heat (U − E_tn)·I·t = (3 − 1.481 V) × 4 A × 7200 s = 43 747 J; E_tn of water = ΔfH°(H2O, l)
    // 285.83 kJ/mol ÷ 2F = 1.481 V (CRC Handbook, from memory). Contents: 10 g KOH + 180 mL × 0.998 g/mL
    // = 189.7 g at 3.9 J/(g·K) (the simulation's stated heat capacity, common practice): ΔT ≈ 59 K,
    // a little more as water is electrolysed away (0.149 mol × 18 g/mol = 2.7 g).
    const m = /warms from 25 °C to ([\d.]+) °C \(ΔT ([\d.]+) K\), passing a 20 K rise in step 1/.exec(ds[0].message)
    expect(m, ds[0].message).not.toBeNull()
    expect(Number(m![2])).toBeGreaterThan(58)
    expect(Number(m![2])).toBeLessThan(61)
    expect(Number(m![1])).toBeCloseTo(25 + Number(m![2]), 0)
    cautionChecks('heat-rise', ds[0])
  })

  it('fires when the cell warms past 60 °C with a smaller rise', () => {
    // From 50 °C: (2.2 − 1.481 V) × 4 A × 3600 s = 10 354 J ÷ (189.7 g × 3.9 J/(g·K)) ≈ 14 K → about 64 °C.
    const src = HEAT.replace('run "hot"', 'run "hot"\nconditions 50 degC').replace('step 1: current 4 A, voltage 3 V for 2 h', '⟦step 1: current 4 A, voltage 2.2 V for 1 h⟧')
    const { ds } = at(src, 'heat-rise', 'warning')
    expect(ds[0].message).toMatch(/warms from 50 °C to 6\d(\.\d)? °C \(ΔT 1\d(\.\d)? K\), passing 60 °C in step 1/)
  })

  it('the fix declares cooling at the run temperature, which clears it', () => {
    const src = HEAT.replace('step 1: current 4 A, voltage 3 V for 2 h', '⟦step 1: current 4 A, voltage 3 V for 2 h⟧')
    const { text, ds } = at(src, 'heat-rise', 'warning')
    fixClears(text, ds[0], HEAT + 'handling cooling: jacket or coil, hold at 25 °C\n')
  })

  it('is silent when cooling is declared, and for a small rise', () => {
    silent(HEAT + 'handling cooling: water bath at 25 °C\n', 'heat-rise')
    // (3 − 1.481 V) × 4 A × 600 s = 3646 J ÷ 740 J/K ≈ 5 K.
    silent(HEAT.replace('for 2 h', 'for 10 min'), 'heat-rise')
    // Without a voltage the simulation has no heat to add.
    silent(HEAT.replace(', voltage 3 V', ''), 'heat-rise')
  })

  it.each(EXAMPLES)('is silent on the example %s (no cell voltage stated, so no simulated heating)', (f) => {
    silent(example(f), 'heat-rise')
  })
})

// ---- soluble-anode -----------------------------------------------------------------------------
// A copper anode in a sulfate anolyte; the cathode makes hydrogen in caustic.
const SOL = [
  'run "soluble"',
  'cell',
  '  compartment anolyte 500 mL',
  '  compartment catholyte 500 mL',
  '  separator cation-exchange between anolyte and catholyte, area 50 cm^2',
  '  anode copper in anolyte, area 50 cm^2',
  '  cathode nickel in catholyte, area 50 cm^2',
  'charge anolyte: Na2SO4 20 g, water 450 mL',
  'charge catholyte: NaOH 4 g, water 450 mL',
  'step 1: current 1 A for 1 h',
  'handling vent: hydrogen to the hood',
  '',
].join('\n')

describe('soluble-anode', () => {
  it('fires on a copper anode whose copper is not deposited, at the material, with the amount', () => {
    const { ds } = at(SOL.replace('anode copper', 'anode ⟦copper⟧'), 'soluble-anode', 'warning')
    // 1 A × 3600 s ÷ 96485.33212 C/mol = 0.037311 mol e⁻ ÷ 2 = 0.018656 mol Cu × 63.546 g/mol = 1.186 g.
    expect(ds[0].message).toContain('about 1.19 g of copper (0.0187 mol Cu²⁺)')
    cautionChecks('soluble-anode', ds[0])
  })

  it('the fix puts in an inert anode suited to the anolyte, which clears it', () => {
    const { text, ds } = at(SOL.replace('anode copper', 'anode ⟦copper⟧'), 'soluble-anode', 'warning')
    expect(ds[0].fixes[0].title).toBe('Use an inert platinized-titanium anode (for a neutral anolyte)')
    fixClears(text, ds[0], SOL.replace('anode copper', 'anode platinized-titanium'))
  })

  it('suggests MMO-titanium for a chloride anolyte', () => {
    const src = SOL.replace('anode copper', 'anode ⟦copper⟧').replace('anolyte: Na2SO4 20 g', 'anolyte: NaCl 20 g')
    const { text, ds } = at(src, 'soluble-anode', 'warning')
    expect(ds[0].fixes[0].title).toBe('Use an inert mmo-titanium anode (for a chloride anolyte)')
    fixClears(text, ds[0], SOL.replace('anode copper', 'anode mmo-titanium').replace('anolyte: Na2SO4 20 g', 'anolyte: NaCl 20 g'))
  })

  it('leaves a stainless anode in chloride to chromium-anode (its chromate is reported there as an error)', () => {
    const a = silent(SOL.replace('anode copper', 'anode stainless').replace('anolyte: Na2SO4 20 g', 'anolyte: NaCl 20 g'), 'soluble-anode')
    expect(a.model.engine?.anode?.kind).toBe('dissolution')
    expect(a.diagnostics.map((d) => d.code)).toContain('chromium-anode')
  })

  it('suggests nickel for an alkaline anolyte', () => {
    const src = SOL.replace('anode copper', 'anode ⟦zinc⟧').replace('anolyte: Na2SO4 20 g', 'anolyte: Na2SO4 20 g, NaOH 2 g')
    const { text, ds } = at(src, 'soluble-anode', 'warning')
    fixClears(text, ds[0], src.replace('⟦zinc⟧', 'nickel'))
  })

  it('is silent for an inert anode, and for nickel in alkali (passive: it evolves oxygen)', () => {
    silent(SOL.replace('anode copper', 'anode platinum'), 'soluble-anode')
    silent(SOL.replace('anode copper', 'anode nickel').replace('anolyte: Na2SO4 20 g', 'anolyte: KOH 20 g'), 'soluble-anode')
  })

  it('is silent when the cathode deposits the same metal (plating or refining with a soluble anode)', () => {
    // The acid-copper-plating example: a copper anode, and the cathode plates copper.
    silent(example('acid-copper-plating.cellrun'), 'soluble-anode')
    silent(
      ['run "refining"', 'cell', '  compartment bath 1 L', '  anode copper in bath, area 50 cm^2', '  cathode stainless in bath, area 50 cm^2', 'charge bath: CuSO4 50 g, water 900 mL', 'step 1: current 1 A for 1 h', ''].join('\n'),
      'soluble-anode',
    )
  })

  it.each(EXAMPLES)('is silent on the example %s', (f) => {
    // plating: copper anode with copper deposited; brine and koh: MMO-titanium anodes.
    silent(example(f), 'soluble-anode')
  })

  it('a `# noted soluble-anode: reason` comment on the line makes it information and keeps the caution', () => {
    const src = SOL.replace('anode copper in anolyte, area 50 cm^2', 'anode ⟦copper⟧ in anolyte, area 50 cm^2  # noted soluble-anode: copper is meant to dissolve (feed for the next run)')
    const { ds } = at(src, 'soluble-anode', 'information')
    expect(ds[0].noted).toBe('copper is meant to dissolve (feed for the next run)')
    expect(ds[0].message).toMatch(/^noted \(copper is meant to dissolve/)
    expect(ds[0].caution).toBe(rule('soluble-anode').caution)
    expect(ds[0].caution).toMatch(/local codes/)
  })
})

// ---- ventilation-capacity ----------------------------------------------------------------------
// 1.5 A for 1 h in a sulfate cell with a 100 cm² anode (hydrogen at the cathode).
const VENT = [
  'run "vent"',
  'cell',
  '  compartment anolyte 500 mL',
  '  compartment catholyte 500 mL',
  '  separator cation-exchange between anolyte and catholyte, area 100 cm^2',
  '  anode platinum in anolyte, area 100 cm^2',
  '  cathode nickel in catholyte, area 100 cm^2',
  'charge anolyte: Na2SO4 20 g, water 450 mL',
  'charge catholyte: NaOH 4 g, water 450 mL',
  'step 1: current 0.5 A for 2 h',
  'step 2: current 1.5 A for 1 h',
  'handling vent: hydrogen to the hood exhaust at 20 L/h',
  'handling hood: anolyte oxygen released in the fume hood',
  '',
].join('\n')
// Peak hydrogen (step 2): 1.5 A × 3600 s ÷ 96485.33212 C/mol = 0.055968 mol e⁻ ÷ 2 = 0.027984 mol/h;
// at 25 °C, 101.325 kPa: RT/p = 8.314462618 × 298.15 ÷ 101325 = 24.465 L/mol → 0.6846 L/h.
// Extract needed: 100 × 0.6846 = 68.46 L/h (hydrogen LFL 4 vol %, NFPA 497, from memory; kept below
// 25 % of it, NFPA 69, from memory: 1 / (0.04 × 0.25) = 100) → 69 L/h rounded up.

describe('ventilation-capacity', () => {
  it('reads flows in the usual units, as L/h', () => {
    // 1 m³ = 1000 L; 1 h = 60 min (hand arithmetic)
    expect(flowIn('exhaust 200 L/h')?.lph).toBeCloseTo(200, 9)
    expect(flowIn('duct at 50 m^3/h to the roof')?.lph).toBeCloseTo(50_000, 6)
    expect(flowIn('duct 0.5 m³/min')?.lph).toBeCloseTo(30_000, 6)
    expect(flowIn('hood face 30 L/min')?.lph).toBeCloseTo(1800, 9)
    expect(flowIn('bag 500 mL/min')?.lph).toBeCloseTo(30, 9)
    expect(flowIn('2 m3/h')?.lph).toBeCloseTo(2000, 6)
    expect(flowIn('to the hood exhaust')).toBeUndefined()
    expect(flowIn('a 20 L bottle')).toBeUndefined()
    expect(ceil2(68.46)).toBe(69)
    expect(ceil2(1200)).toBe(1200)
    expect(ceil2(0.06846)).toBe(0.069)
  })

  it('fires on a vent stated below 100 × the peak hydrogen flow, at the flow, with the figures', () => {
    const { ds } = at(VENT.replace('at 20 L/h', 'at ⟦20 L/h⟧'), 'ventilation-capacity', 'warning')
    expect(ds[0].message).toContain('the vent extract of 20 L/h is below the 68.5 L/h needed for the peak hydrogen flow of 0.685 L/h (step 2)')
    cautionChecks('ventilation-capacity', ds[0])
  })

  it('the fix raises the flow to the requirement rounded up, in the unit written, which clears it', () => {
    const { text, ds } = at(VENT.replace('at 20 L/h', 'at ⟦20 L/h⟧'), 'ventilation-capacity', 'warning')
    fixClears(text, ds[0], VENT.replace('at 20 L/h', 'at 69 L/h'))
    // In m³/h: 68.46 L/h = 0.06846 m³/h → 0.069 m³/h.
    const m3 = VENT.replace('at 20 L/h', 'at 0.05 m^3/h')
    const { text: t2, ds: d2 } = at(m3.replace('0.05 m^3/h', '⟦0.05 m^3/h⟧'), 'ventilation-capacity', 'warning')
    fixClears(t2, d2[0], VENT.replace('at 20 L/h', 'at 0.069 m^3/h'))
  })

  it('judges the line that names hydrogen when several state a flow', () => {
    // The hood's 10 L/h is for the oxygen side; the vent names hydrogen and is big enough.
    silent(VENT.replace('at 20 L/h', 'at 30 L/min').replace('released in the fume hood', 'released in the fume hood, 10 L/h'), 'ventilation-capacity')
    // With no line naming hydrogen, each stated flow is judged.
    const src = VENT.replace('hydrogen to the hood exhaust at 20 L/h', 'cathode gas to the exhaust at ⟦20 L/h⟧')
    at(src, 'ventilation-capacity', 'warning')
  })

  it('is silent with enough flow, or with no flow stated', () => {
    silent(VENT.replace('at 20 L/h', 'at 30 L/min'), 'ventilation-capacity') // 1800 L/h ≥ 68.5
    silent(VENT.replace(' at 20 L/h', ''), 'ventilation-capacity')
  })

  // Chlorine: a brine cell whose only handling is a vent.
  const BRINE = [
    'run "brine"',
    'cell',
    '  compartment anolyte 500 mL',
    '  compartment catholyte 500 mL',
    '  separator cation-exchange between anolyte and catholyte, area 50 cm^2',
    '  anode mmo-titanium in anolyte, area 50 cm^2',
    '  cathode nickel in catholyte, area 50 cm^2',
    'charge anolyte: NaCl 100 g, water 450 mL',
    'charge catholyte: NaOH 4 g, water 450 mL',
    'step 1: current 5 A for 1 h',
    'handling vent: all off-gas to the exhaust at 50 L/min',
    '',
  ].join('\n')

  it('fires when chlorine is made and a vent is its only handling, at the vent line', () => {
    const { ds } = at(BRINE.replace('handling vent: all off-gas to the exhaust at 50 L/min', 'handling vent: ⟦all off-gas to the exhaust at 50 L/min⟧'), 'ventilation-capacity', 'warning')
    // 5 A × 3600 s ÷ 96485.33212 C/mol ÷ 2 = 0.09328 mol Cl₂ × 24.465 L/mol = 2.282 L.
    expect(ds[0].message).toContain('about 2.28 L of chlorine (0.0933 mol)')
    expect(ds[0].message).toContain('no scrubber')
  })

  it('the chlorine fix declares a scrubber with 2 mol NaOH per mol Cl₂, which clears it', () => {
    const src = BRINE.replace('handling vent: all off-gas to the exhaust at 50 L/min', 'handling vent: ⟦all off-gas to the exhaust at 50 L/min⟧')
    const { text, ds } = at(src, 'ventilation-capacity', 'warning')
    // 2 × 0.09328 = 0.1866 mol NaOH → 0.19 rounded up (Cl₂ + 2 NaOH → NaCl + NaOCl + H₂O).
    fixClears(text, ds[0], BRINE + 'handling scrubber: chlorine off-gas through NaOH solution holding at least 0.19 mol NaOH, then to the vent\n')
  })

  it('is silent on chlorine with a scrubber declared', () => {
    silent(BRINE + 'handling scrubber: anolyte gas through 1 L of 2 M NaOH\n', 'ventilation-capacity')
  })

  it.each(EXAMPLES)('is silent on the example %s (no extract flow stated; the brine run has a scrubber)', (f) => {
    silent(example(f), 'ventilation-capacity')
  })
})

// ---- every analysis above ----------------------------------------------------------------------
describe('group c, over every analysis above', () => {
  it('no rule crashed', () => {
    expect(analyses.length).toBeGreaterThan(30)
    for (const a of analyses) for (const d of a.diagnostics) expect(d.message).not.toMatch(/internal (error|parser error)/)
  })
})
