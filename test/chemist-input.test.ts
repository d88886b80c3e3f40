// What a working chemist plausibly types, and the chemistry behind the less common cases: each case
// came up in a review of v1. Expected values are worked by hand from outside constants:
// F = 96485.33212 C/mol (CODATA 2018; e·N_A exact since SI 2019), atomic weights IUPAC 2021.
import { describe, expect, it } from 'vitest'
import { analyze, type Analysis } from '../server/src/core/analyze'
import { evaluateExpression, inKindUnit, kindOf } from '../server/src/core/units'
import * as math from 'mathjs'
import { marked } from './support/markers'

const F = 96485.33212 // C/mol, CODATA 2018
const AH = 3600 // C per A·h

const errors = (a: Analysis) => a.diagnostics.filter((d) => d.severity === 'error').map((d) => `${d.code}: ${d.message}`)
const maxGrams = (a: Analysis) => a.computed.filter((c) => c.key === 'expect.max').map((c) => c.value!)
const value = (text: string) => {
  const r = evaluateExpression(text, new Map())
  if (!r.ok) throw new Error(r.failure.message)
  return r.value
}

function bath(lines: string[]): string {
  return ['cell', '  compartment bath 1 L', '  anode platinum in bath, area 1 dm^2', '  cathode steel in bath, area 1 dm^2', ...lines, ''].join('\n')
}

describe('metal ion charges from less simple salts', () => {
  it('hard chrome from chromic acid deposits Cr(VI) with 6 electrons', () => {
    const a = analyze(bath(['charge bath: CrO3 250 g, water 900 mL', 'step 1: current 1 A for 1 h', 'expect Cr 0.1 g in bath']))
    // Cr 51.9961 g/mol (IUPAC 2021): 1 A·h × 51.9961 / (6 × F) = 0.32334 g
    expect(maxGrams(a)[0]).toBeCloseTo((AH * 51.9961) / (6 * F), 6)
  })

  it('gold from tetrachloroauric acid is Au(III); platinum from hexachloroplatinic acid is Pt(IV)', () => {
    const au = analyze(bath(['charge bath: HAuCl4 10 g, water 900 mL', 'step 1: current 1 A for 1 h', 'expect Au 0.1 g in bath']))
    // Au 196.966570 g/mol (IUPAC 2021): 3600 × 196.966570 / (3 × F) = 2.4497 g
    expect(maxGrams(au)[0]).toBeCloseTo((AH * 196.96657) / (3 * F), 5)
    const pt = analyze(bath(['charge bath: H2PtCl6 10 g, water 900 mL', 'step 1: current 1 A for 1 h', 'expect Pt 0.1 g in bath']))
    // Pt 195.084 g/mol (IUPAC 2021), 4 electrons
    expect(maxGrams(pt)[0]).toBeCloseTo((AH * 195.084) / (4 * F), 5)
  })
})

function divided(lines: string[]): string {
  return [
    'cell',
    '  compartment anolyte 1 L',
    '  compartment catholyte 1 L',
    '  separator cation-exchange between anolyte and catholyte',
    '  anode mmo-titanium in anolyte',
    '  cathode nickel in catholyte',
    ...lines,
    '',
  ].join('\n')
}

describe('feed limits', () => {
  it('chlorine is limited by the chloride charged (divided cell)', () => {
    const a = analyze(divided(['charge anolyte: NaCl 58.5 g, water 900 mL', 'charge catholyte: water 900 mL', 'step 1: current 40 A for 1 h', 'expect Cl2 1 g in anolyte']))
    // NaCl 58.43977 g/mol (22.98976928 + 35.45): 58.5 g = 1.001031 mol Cl⁻ → 0.500515 mol Cl2 × 70.90 g/mol = 35.487 g
    // (40 A·h = 1.4924 mol e⁻ would make 0.746 mol)
    const mNaCl = 22.98976928 + 35.45
    expect(maxGrams(a)[0]).toBeCloseTo((58.5 / mNaCl / 2) * 70.9, 3)
  })

  it('an undivided chloride cell makes hypochlorite, one per chloride, and no free chlorine', () => {
    const a = analyze(bath(['charge bath: NaCl 58.5 g, water 900 mL', 'step 1: current 60 A for 1 h', 'expect NaClO 1 g in bath', 'expect Cl2 1 g in bath']))
    // Cl₂ + 2 OH⁻ → ClO⁻ + Cl⁻ + H₂O (standard textbook stoichiometry): net NaCl + H₂O → NaClO + H₂ (2 e⁻).
    // 60 A·h = 2.2386 mol e⁻ would make 1.119 mol, but the chloride allows 1.001031 mol NaClO
    // × 74.43877 g/mol (22.98976928 + 35.45 + 15.999) = 74.515 g
    const mNaClO = 22.98976928 + 35.45 + 15.999
    expect(maxGrams(a)[0]).toBeCloseTo((58.5 / (22.98976928 + 35.45)) * mNaClO, 3)
    expect(a.diagnostics.find((d) => d.code === 'product-reaction')?.message).toContain('forms hypochlorite (NaClO)')
  })
})

describe('current density and areas', () => {
  it('adds up the areas of several electrodes of the reference kind', () => {
    const src = ['cell', '  compartment bath 1 L', '  anode copper in bath, area 1 dm^2', '  anode copper in bath, area 1 dm^2', '  cathode steel in bath, area 1 dm^2', 'step 1: current 2 A/dm^2 on anode for 1 h', ''].join('\n')
    // 2 A/dm² × (1 + 1) dm² = 4 A
    expect(analyze(src).model.steps[0].currentA).toBeCloseTo(4, 12)
  })

  it('does not fall back to the anode area when the cathode has none', () => {
    const m = marked(['cell', '  compartment bath 1 L', '  anode copper in bath, area 1 dm^2', '  cathode steel in bath', 'step 1: current ⟦2 A/dm^2⟧ for 1 h', ''].join('\n'))
    const a = analyze(m.text)
    const d = a.diagnostics.filter((x) => x.code === 'step-incomplete')
    expect(d.map((x) => x.span)).toEqual(m.ranges)
    expect(a.model.totals.chargeC).toBe(0)
  })

  it('`on separator` takes the membrane area', () => {
    const src = ['cell', '  compartment a 1 L', '  compartment c 1 L', '  separator cation-exchange between a and c, area 40 cm^2', '  anode platinum in a', '  cathode nickel in c', 'step 1: current 3 kA/m^2 on separator for 1 h', ''].join('\n')
    // 3000 A/m² × 40e-4 m² = 12 A
    expect(analyze(src).model.steps[0].currentA).toBeCloseTo(12, 12)
  })
})

describe('hydrogen and oxygen take the full charge', () => {
  it('a step efficiency lowers the hydroxide bound but not the hydrogen bound', () => {
    const a = analyze(divided(['charge anolyte: NaCl 50 g, water 900 mL', 'charge catholyte: water 900 mL', 'step 1: current 1 A for 1 h, efficiency 50 %', 'expect H2 0.01 g in catholyte', 'expect NaOH 0.1 g in catholyte']))
    const [h2, naoh] = maxGrams(a)
    // H2: 3600 / (2F) × 2.016 g/mol = 0.037610 g at 100 %; NaOH: 3600 / F × 39.997 g/mol × 0.5 = 0.74617 g
    expect(h2).toBeCloseTo((AH / (2 * F)) * 2.016, 6)
    expect(naoh).toBeCloseTo((AH / F) * (22.98976928 + 15.999 + 1.008) * 0.5, 5)
  })
})

describe('units as typed', () => {
  it.each([
    ['10wt%', 'mass-fraction', 10],
    ['10 wt %', 'mass-fraction', 10],
    ['10 wt%', 'mass-fraction', 10],
    ['10 ℃', 'temperature', 283.15], // 0 °C = 273.15 K (definition)
    ['10\u00a0°C', 'temperature', 283.15],
    ['25\u202fmL', 'volume', 0.025],
    ['1 h 30 min', 'time', 5400], // 3600 s + 1800 s
    ['2 min 30 s', 'time', 150],
  ] as const)('%s', (text, kind, expected) => {
    const v = value(text)
    expect(kindOf(v)).toBe(kind)
    expect(inKindUnit(v, kind)).toBeCloseTo(expected, 9)
  })
})

describe('messages for units typed the wrong way', () => {
  it('says how to write a negative power of a unit', () => {
    const r = evaluateExpression('40 mA cm-2', new Map())
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.failure.message).toContain('cm^-2')
  })
})

describe('statements as typed', () => {
  it('takes a material of several words', () => {
    const a = analyze(['cell', '  vessel borosilicate glass', '  compartment bath 1 L', '  anode platinum mesh in bath', '  cathode nickel in bath', ''].join('\n'))
    expect(errors(a)).toEqual([])
    expect(a.model.electrodes.map((e) => e.material.text)).toEqual(['platinum mesh', 'nickel'])
    expect(a.model.vessel?.material.text).toBe('borosilicate glass')
  })

  it('reads `cation exchange` as a separator kind and offers the hyphenated word', () => {
    const m = marked(['cell', '  compartment a 1 L', '  compartment c 1 L', '  separator ⟦cation exchange⟧ between a and c', ''].join('\n'))
    const d = analyze(m.text).diagnostics.filter((x) => x.code === 'unknown-kind')
    expect(d.map((x) => x.span)).toEqual(m.ranges)
    expect(d[0].fixes[0].edits[0].newText).toBe('cation-exchange')
  })

  it('offers a keyword fix only for a near miss, and the fixed line parses', () => {
    const far = analyze(['cell', '  compartment bath 1 L', '  anode platinum mesh bath', ''].join('\n'))
    const farSyntax = far.diagnostics.filter((x) => x.code === 'syntax')
    expect(farSyntax).toHaveLength(1)
    expect(farSyntax[0].fixes).toEqual([])
    const src = ['cell', '  compartment bath 1 L', '  anode platinum on bath', ''].join('\n')
    const near = analyze(src).diagnostics.filter((x) => x.code === 'syntax')
    const edit = near[0].fixes[0].edits[0]
    const fixed = src.slice(0, edit.span.start) + edit.newText + src.slice(edit.span.end)
    expect(fixed).toContain('anode platinum in bath')
    expect(analyze(fixed).diagnostics.filter((x) => x.code === 'syntax')).toEqual([])
  })

  it('accepts state symbols on formulas', () => {
    const a = analyze(bath(['charge bath: NaCl(aq) 10 g, water 900 mL', 'step 1: current 1 A for 1 h', 'expect H2(g) 0.4 L in bath']))
    expect(errors(a)).toEqual([])
    expect(a.computed.filter((c) => c.key === 'charge.item')[0].value).toBeCloseTo(10 / (22.98976928 + 35.45), 9)
  })

  it('reads a clause word without a comma before it', () => {
    const a = analyze(bath(['step 1: current 2 A for 3 h efficiency 90 %']))
    expect(errors(a)).toEqual([])
    expect(a.model.steps[0].efficiency).toBeCloseTo(0.9, 12)
  })

  it('lets a gas with no known reaction be stated by volume', () => {
    const a = analyze(bath(['step 1: current 1 A for 1 h', 'expect CO2 5 L in bath']))
    expect(a.diagnostics.filter((d) => d.code === 'wrong-unit')).toEqual([])
  })

  it('keeps an unknown name with a non-ASCII letter inside its line', () => {
    const m = marked(bath(['let ax = 0.5', 'step 1: current 1 A for 1 h, efficiency ⟦αx⟧', 'note next line']))
    const d = analyze(m.text).diagnostics.filter((x) => x.code === 'unknown-name')
    expect(d.map((x) => x.span)).toEqual(m.ranges)
  })
})

describe('stated reactions', () => {
  it('a stated, balanced half-reaction replaces the chosen one and sets what forms', () => {
    const a = analyze(
      divided([
        'reaction anode: 2 H2O -> O2 + 4 H+ + 4 e-',
        'reaction cathode: Ni^2+ + 2 e- -> Ni',
        'charge anolyte: Na2SO4 50 g, water 900 mL',
        'charge catholyte: NiSO4 50 g, water 900 mL',
        'step 1: current 1 A for 1 h',
        'expect Ni 1 g in catholyte',
      ]),
    )
    expect(a.model.engine?.cathode?.kind).toBe('stated')
    // Ni 58.6934 g/mol (IUPAC 2021): 3600 / (2 × F) × 58.6934 = 1.09497 g
    expect(maxGrams(a)[0]).toBeCloseTo((AH / (2 * F)) * 58.6934, 5)
  })
})

describe('cell voltages and gas volumes through the analysis', () => {
  const voltages = (a: Analysis) => a.model.voltages!
  it('water electrolysis in alkali: 1.229 V reversible, 1.481 V thermoneutral', () => {
    // standard textbook values: E_rev = 237.1 kJ/mol ÷ 2F, E_tn = 285.8 kJ/mol ÷ 2F
    const a = analyze(bath(['charge bath: KOH solution 1 L at 6 M', 'step 1: current 1 A for 1 h']))
    expect(voltages(a).reversible).toBeCloseTo(1.229, 3)
    expect(voltages(a).thermoneutral).toBeCloseTo(1.481, 3)
  })

  it('chlor-alkali in a membrane cell: about 2.19 V reversible', () => {
    // the chlor-alkali decomposition voltage, about 2.19 V (textbook figure, from memory)
    const a = analyze(divided(['charge anolyte: NaCl solution 1 L at 300 g/L', 'charge catholyte: NaOH solution 1 L at 2 M', 'step 1: current 1 A for 1 h']))
    expect(a.model.engine?.anode?.kind).toBe('chlorine')
    expect(Math.abs(voltages(a).reversible - 2.19)).toBeLessThan(0.02)
  })

  it('copper electrowinning with an oxygen anode: 1.229 − 0.342 = 0.89 V', () => {
    // E°(O2/H2O) = 1.229 V, E°(Cu2+/Cu) = 0.342 V (CRC electrochemical series, from memory)
    const a = analyze(bath(['charge bath: CuSO4 100 g, H2SO4 solution 100 g at 20 wt%, water 800 mL', 'step 1: current 1 A for 1 h']))
    expect(a.model.engine?.cathode?.kind).toBe('deposition')
    expect(Math.abs(voltages(a).reversible - (1.229 - 0.342))).toBeLessThan(0.005)
  })

  it('the most noble ion deposits first: silver before copper', () => {
    const a = analyze(bath(['charge bath: CuSO4 10 g, AgNO3 10 g, water 900 mL', 'step 1: current 0.1 A for 1 h']))
    expect(a.model.engine?.cathode?.metal?.element).toBe('Ag')
  })

  it('hydrogen at 0 °C and 101.325 kPa takes the molar volume of an ideal gas (mathjs molarVolume)', () => {
    const a = analyze(['conditions 0 degC, 101.325 kPa', ...bath(['charge bath: KOH solution 1 L at 1 M', 'step 1: current 1 A for 1 h', 'expect H2 0.1 L in bath']).split('\n')].join('\n'))
    const mv = math.evaluate('molarVolume').toNumber('L/mol') // 22.414 L/mol (mathjs physical constant)
    const y = a.model.yields[0]
    expect(y.maxMolEff! * y.litresPerMol!).toBeCloseTo((AH / (2 * F)) * mv, 5)
  })

  it('at 25 °C and 100 kPa the molar volume is RT/p with R exact: 24.789 L/mol', () => {
    const a = analyze(['conditions 25 degC, 100 kPa', ...bath(['charge bath: KOH solution 1 L at 1 M', 'step 1: current 1 A for 1 h', 'expect H2 0.1 L in bath']).split('\n')].join('\n'))
    // R = 1.380649e-23 × 6.02214076e23 J/(mol·K) (SI 2019 exact); 298.15 K; 100000 Pa
    const R = 1.380649e-23 * 6.02214076e23
    expect(a.model.yields[0].litresPerMol!).toBeCloseTo(((R * 298.15) / 100000) * 1000, 9)
    // 24.789 L/mol: molar volume of an ideal gas at 25 °C and 100 kPa (IUPAC Gold Book, from memory)
    expect(Math.abs(a.model.yields[0].litresPerMol! - 24.789)).toBeLessThan(0.001)
  })
})

describe('engine review cases', () => {
  const products = (a: Analysis) => a.model.engine!.totals
  const amount = (a: Analysis, formula: string) => products(a).filter((p) => p.formula === formula).reduce((t, p) => t + p.mol, 0)

  it('boric acid is a weak acid, not a base: a nickel anode in a Watts bath dissolves', () => {
    const a = analyze(bath(['charge bath: NiSO4·6H2O 300 g, NiCl2·6H2O 45 g, H3BO3 40 g, water 800 mL', 'step 1: current 2 A for 1 h']).replace('anode platinum', 'anode nickel'))
    expect(a.model.engine?.anode?.kind).toBe('dissolution')
  })

  it('a diaphragm with hydroxide on both sides transfers nothing: no hydroxide formed', () => {
    const src = divided(['charge anolyte: KOH solution 1 L at 6 M', 'charge catholyte: KOH solution 1 L at 6 M', 'step 1: current 10 A for 1 h']).replace('cation-exchange', 'diaphragm')
    const a = analyze(src)
    expect(amount(a, 'KOH')).toBe(0)
    // 10 A·h / (2F) = 0.18655 mol H2 (by hand)
    expect(amount(a, 'H2')).toBeCloseTo((10 * AH) / (2 * F), 9)
  })

  it('current efficiency is against Faraday for the whole charge, even after the feed ran out', () => {
    const a = analyze(bath(['charge bath: CuSO4 10 g, H2SO4 solution 100 g at 20 wt%, water 800 mL', 'step 1: current 1 A for 10 h', 'observe Cu 2 g in bath']))
    // Faraday: 10 A·h = 0.37311 mol e⁻ → 0.18655 mol Cu; 2 g / 63.546 = 0.031473 mol → 16.87 %
    const ce = a.computed.find((c) => c.key === 'observe.efficiency')!.value!
    expect(ce).toBeCloseTo(2 / 63.546 / ((10 * AH) / (2 * F)), 6)
  })

  it('electrowinning with an oxygen anode regenerates the acid: CuSO4 + H2O → Cu + H2SO4 + ½ O2', () => {
    const a = analyze(bath(['charge bath: CuSO4 100 g, H2SO4 solution 100 g at 20 wt%, water 800 mL', 'step 1: current 1 A for 1 h']))
    // one H2SO4 per Cu (standard textbook stoichiometry): 1 A·h / (2F) = 0.018655 mol each
    expect(amount(a, 'H2SO4')).toBeCloseTo(amount(a, 'Cu'), 12)
    expect(amount(a, 'Cu')).toBeCloseTo(AH / (2 * F), 9)
  })

  it('a stated reaction draws down the ions it uses', () => {
    const a = analyze(divided(['reaction anode: 2 Cl- -> Cl2 + 2 e-', 'charge anolyte: NaCl 5.85 g, water 900 mL', 'charge catholyte: water 900 mL', 'step 1: current 10 A for 1 h']))
    // 5.85 g NaCl = 0.100103 mol Cl⁻ (22.98976928 + 35.45 g/mol) → at most 0.050051 mol Cl2
    expect(amount(a, 'Cl2')).toBeCloseTo(5.85 / (22.98976928 + 35.45) / 2, 9)
  })

  it('an undivided cell splitting water has the standard 1.229 V, not the acid-base gradient', () => {
    const a = analyze(bath(['charge bath: Na2SO4 71 g, water 1 L', 'step 1: current 1 A for 1 h']))
    expect(a.model.voltages!.reversible).toBeCloseTo(1.229, 3) // standard textbook value
  })

  it('a stainless anode in sulfate evolves oxygen (and says chromate); in chloride it pits and dissolves', () => {
    const sulfate = analyze(bath(['charge bath: Na2SO4 71 g, water 1 L']).replace('anode platinum', 'anode stainless-steel'))
    expect(sulfate.model.engine?.anode?.kind).toBe('oxygen')
    expect(sulfate.model.engine?.anode?.reason).toContain('Cr(VI)')
    const chloride = analyze(bath(['charge bath: NaCl 58 g, water 1 L']).replace('anode platinum', 'anode stainless-steel'))
    expect(chloride.model.engine?.anode?.kind).toBe('dissolution')
  })

  it('does not warn from a solubility table that ends below the run temperature', () => {
    // ZnSO4 is tabulated only to 20 °C in data/solubility.ts
    const a = analyze(['conditions 80 degC', ...bath(['charge bath: ZnSO4 500 g, water 500 mL']).split('\n')].join('\n'))
    expect(a.diagnostics.filter((d) => d.code === 'beyond-solubility')).toEqual([])
  })

  it('a step held below the reversible voltage forms nothing', () => {
    const a = analyze(bath(['charge bath: KOH solution 1 L at 1 M', 'step 1: voltage 1.0 V, current 1 A for 1 h', 'step 2: voltage 2.0 V, current 1 A for 1 h']))
    // only step 2 counts: 1 A·h / (2F) mol H2
    expect(amount(a, 'H2')).toBeCloseTo(AH / (2 * F), 9)
    expect(a.computed.find((c) => c.key === 'step.products' && c.line === a.model.steps[0].line)?.label).toContain('nothing forms')
  })
})
