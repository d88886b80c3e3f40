// Faraday's law through the whole analysis: constants, handbook electrochemical equivalents, and the
// arithmetic of charges, steps and feed limits.
//
// BINDING: every expected number comes from outside the project, with its source beside it, or is
// hand arithmetic from such numbers (shown). Nothing is pasted from a run of the code under test.
//
// Sources used below:
//   [SI]     BIPM, The International System of Units (SI Brochure), 9th ed. (2019): the defining
//            constants e = 1.602 176 634e-19 C, N_A = 6.022 140 76e23 /mol, k = 1.380 649e-23 J/K
//            (all exact); 1 h = 3600 s.
//   [CODATA] CODATA 2018 recommended values (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)):
//            F = 96 485.332 12... C/mol and R = 8.314 462 618... J/(mol·K), both exact since 2019
//            (listed truncated); molar volume of an ideal gas at 273.15 K, 101.325 kPa:
//            22.413 969 54... L/mol, usually quoted as 22.414 L/mol.
//   [IUPAC]  IUPAC CIAAW standard atomic weights 2021 (conventional values where an interval is
//            given): H 1.008, C 12.011, N 14.007, O 15.999, Na 22.989 769 28, S 32.06, Cl 35.45,
//            K 39.0983, Ni 58.6934, Cu 63.546, Zn 65.38, Ag 107.8682. Transcribed from memory.
//   [CRC-EE] CRC Handbook of Chemistry and Physics, table "Electrochemical Equivalents" (g per A·h):
//            Cu(2+) 1.1855, Ni(2+) 1.0948, Zn(2+) 1.2195, Ag(+) 4.0245. These figures are recalled
//            from memory (as quoted in the task brief), not looked up; each is also re-derived below
//            by hand as M/(z·F/3600) from [IUPAC] and [SI]. Cross-check for Ag: the Wikipedia table
//            "Electrochemical equivalent" lists 1.118e-6 kg/C, i.e. 1.118e-3 g/C × 3600 = 4.0248 g/(A·h).
//   [CA]     Chlor-alkali handbook figures, per kA·h: 1.3228 kg Cl2 and 1.4925 kg NaOH (e.g. as given
//            in the Euro Chlor / Ullmann's "Chlorine" tables; recalled from memory, not looked up).
//   [CRC-W]  CRC Handbook, "Properties of water in the range 0-100 °C": density of water at 20 °C
//            0.998 21 g/mL (from memory). Water charged by volume is taken as measured at 20 °C.
//   [mathjs] mathjs's own physical constants (`faraday`, `gasConstant`, `avogadro`,
//            `elementaryCharge`, `boltzmann`), an independent library implementation.
//
// Tolerance for handbook figures: 1e-3 relative. Justification: the handbook values are printed to
// 5 significant figures (±5e-5 relative rounding) and older editions use older atomic weights (e.g.
// Ni 58.69-58.71, Zn 65.37-65.39), which moves them by up to ~3e-4; 1e-3 covers that while a wrong
// electron count (×1/2 or ×2), a wrong molar mass of a different species, a wrong F (e.g. 96500 would
// still pass at 1e-3, so F itself is checked separately at 1e-9) or a wrong hour (60 vs 3600 s) all
// fail by orders of magnitude more.
import { readFileSync } from 'node:fs'
import { faraday, gasConstant, avogadro, elementaryCharge, boltzmann } from 'mathjs'
import { describe, expect, it } from 'vitest'
import { analyze, type Analysis } from '../server/src/core/analyze'
import { AVOGADRO, BOLTZMANN, ELEMENTARY_CHARGE, FARADAY, GAS_CONSTANT } from '../server/src/core/constants'
import { jsonReport } from '../server/src/core/report'

// ---- outside numbers ---------------------------------------------------------------------------
const E_SI = 1.602176634e-19 // [SI] elementary charge, C, exact
const NA_SI = 6.02214076e23 // [SI] Avogadro constant, 1/mol, exact
const K_SI = 1.380649e-23 // [SI] Boltzmann constant, J/K, exact
const F_CODATA = 96485.33212 // [CODATA] 2018, C/mol (exact value, truncated in the listing)
const R_CODATA = 8.314462618 // [CODATA] 2018, J/(mol·K) (exact value, truncated in the listing)
const F_HAND = E_SI * NA_SI // [SI] F = e·N_A
const AH = 3600 // [SI] 1 A·h = 1 A × 3600 s = 3600 C

const W = {
  H: 1.008, // [IUPAC]
  C: 12.011, // [IUPAC]
  N: 14.007, // [IUPAC]
  O: 15.999, // [IUPAC]
  Na: 22.98976928, // [IUPAC]
  S: 32.06, // [IUPAC]
  Cl: 35.45, // [IUPAC]
  K: 39.0983, // [IUPAC]
  Ni: 58.6934, // [IUPAC]
  Cu: 63.546, // [IUPAC]
  Zn: 65.38, // [IUPAC]
  Ag: 107.8682, // [IUPAC]
}
const M_K2CO3 = 2 * W.K + W.C + 3 * W.O // 78.1966 + 12.011 + 47.997 = 138.2046 g/mol
const M_KOH = W.K + W.O + W.H // 39.0983 + 15.999 + 1.008 = 56.1053 g/mol
const M_NaOH = W.Na + W.O + W.H // 22.98976928 + 15.999 + 1.008 = 39.99676928 g/mol
const M_H2 = 2 * W.H // 2.016 g/mol

// ---- helpers -----------------------------------------------------------------------------------
function rel(actual: number, expected: number): number {
  return Math.abs(actual - expected) / Math.abs(expected)
}

function expectRel(actual: number | undefined, expected: number, tol: number): void {
  expect(actual, 'value is missing').toBeTypeOf('number')
  expect(rel(actual!, expected), `${actual} vs ${expected} (tolerance ${tol})`).toBeLessThan(tol)
}

/** Analyse and insist the protocol has no errors (warnings are allowed). */
function run(text: string): Analysis {
  const a = analyze(text)
  const errors = a.diagnostics.filter((d) => d.severity === 'error')
  expect(errors.map((d) => `${d.code}: ${d.message}`)).toEqual([])
  return a
}

/** The `expect.max` values (grams) in document order. */
function maxGrams(a: Analysis): number[] {
  return a.computed.filter((c) => c.key === 'expect.max').map((c) => c.value!)
}

/** A one-compartment plating cell with an inert anode and the given salt charge. */
function platingCell(salt: string, metal: string, steps = 'step 1: current 1 A for 1 h'): string {
  return [
    'run "plating"',
    'cell',
    '  compartment bath 2 L',
    '  anode platinum in bath, area 10 cm^2',
    '  cathode steel in bath, area 10 cm^2',
    `charge bath: ${salt}, water 1 L`,
    steps,
    `expect ${metal} 0.1 g in bath`,
    '',
  ].join('\n')
}

// ---- constants ---------------------------------------------------------------------------------
describe('constants', () => {
  it('the SI 2019 defining constants are the exact values', () => {
    expect(ELEMENTARY_CHARGE).toBe(E_SI)
    expect(AVOGADRO).toBe(NA_SI)
    expect(BOLTZMANN).toBe(K_SI)
  })

  it('FARADAY = e·N_A and matches CODATA 2018 96485.33212 C/mol to 1e-9', () => {
    expect(rel(FARADAY, F_HAND)).toBeLessThan(1e-15)
    expect(rel(FARADAY, F_CODATA)).toBeLessThan(1e-9)
  })

  it('GAS_CONSTANT = k·N_A and matches CODATA 2018 8.314462618 J/(mol·K) to 1e-9', () => {
    expect(rel(GAS_CONSTANT, K_SI * NA_SI)).toBeLessThan(1e-15)
    expect(rel(GAS_CONSTANT, R_CODATA)).toBeLessThan(1e-9)
  })

  it("agrees with mathjs's own physical constants", () => {
    expect(rel(FARADAY, faraday.toNumber('C/mol'))).toBeLessThan(1e-12)
    expect(rel(GAS_CONSTANT, gasConstant.toNumber('J/(mol K)'))).toBeLessThan(1e-12)
    expect(rel(AVOGADRO, avogadro.toNumber('mol^-1'))).toBeLessThan(1e-12)
    expect(rel(ELEMENTARY_CHARGE, elementaryCharge.toNumber('C'))).toBeLessThan(1e-12)
    expect(rel(BOLTZMANN, boltzmann.toNumber('J/K'))).toBeLessThan(1e-12)
  })

  it('the JSON report states the Faraday constant it used', () => {
    const r = jsonReport(analyze('run "x"\n'), 'x.cellrun')
    expect(rel(r.constants.faraday, F_CODATA)).toBeLessThan(1e-9)
  })
})

// ---- handbook electrochemical equivalents, through analyze() ------------------------------------
describe('electrochemical equivalents: 1 A for 1 h', () => {
  const cases: { metal: string; salt: string; handbook: number; z: number; M: number; note: string }[] = [
    // hand: 63.546 / (2 × 96485.33212 / 3600) = 63.546 / 53.60296 = 1.18550 g/(A·h)
    { metal: 'Cu', salt: 'CuSO4 200 g', handbook: 1.1855, z: 2, M: W.Cu, note: '[CRC-EE] Cu²⁺' },
    // hand: 58.6934 / 53.60296 = 1.09497 g/(A·h)
    { metal: 'Ni', salt: 'NiSO4 200 g', handbook: 1.0948, z: 2, M: W.Ni, note: '[CRC-EE] Ni²⁺' },
    // hand: 65.38 / 53.60296 = 1.21971 g/(A·h)
    { metal: 'Zn', salt: 'ZnSO4 200 g', handbook: 1.2195, z: 2, M: W.Zn, note: '[CRC-EE] Zn²⁺' },
    // hand: 107.8682 / 26.80148 = 4.02471 g/(A·h)
    { metal: 'Ag', salt: 'AgNO3 100 g', handbook: 4.0245, z: 1, M: W.Ag, note: '[CRC-EE] Ag⁺ from silver nitrate' },
  ]
  it.each(cases)('$metal: handbook $handbook g/(A·h) ($note)', ({ metal, salt, handbook, z, M }) => {
    const a = run(platingCell(salt, metal))
    const [g] = maxGrams(a)
    expectRel(g, handbook, 1e-3)
    // and the same by hand from [IUPAC] and [SI]: m = M · Q / (z · F)
    const hand = (M * AH) / (z * F_HAND)
    expectRel(g, hand, 1e-6) // 1e-6: the product's own atomic-weight table may differ in the last digit
    // the handbook figure and the hand figure agree with each other too (sanity of the sources)
    expectRel(hand, handbook, 1e-3)
  })

  it('efficiency 80 % gives exactly 0.8 of the maximum', () => {
    const full = maxGrams(run(platingCell('CuSO4 200 g', 'Cu')))[0]
    const eff = maxGrams(run(platingCell('CuSO4 200 g', 'Cu', 'step 1: current 1 A for 1 h, efficiency 80 %')))[0]
    expectRel(eff / full, 0.8, 1e-12)
  })

  it('steps add up, each at its own efficiency', () => {
    // 1 A × 1 h + 2 A × 0.5 h + 0.5 A × 1.5 h = 1 + 1 + 0.75 = 2.75 A·h
    const steps = ['step a: current 1 A for 1 h', 'step b: current 2 A for 30 min', 'step c: current 0.5 A for 90 min'].join('\n')
    const a = run(platingCell('CuSO4 200 g', 'Cu', steps))
    expectRel(jsonReport(a, 'x').totals.chargeAh, 2.75, 1e-12)
    expectRel(a.model.totals.chargeC, 2.75 * AH, 1e-12)
    expectRel(maxGrams(a)[0], 2.75 * 1.1855, 1e-3) // [CRC-EE] Cu 1.1855 g/(A·h)
    // 1 A·h at 100 % + 1 A·h at 50 % = 1.5 A·h that make copper
    const mixed = ['step a: current 1 A for 1 h', 'step b: current 1 A for 1 h, efficiency 50 %'].join('\n')
    const b = run(platingCell('CuSO4 200 g', 'Cu', mixed))
    expectRel(maxGrams(b)[0], 1.5 * 1.1855, 1e-3)
    expectRel(b.model.totals.effectiveElectronMol, (1.5 * AH) / F_HAND, 1e-12)
    expectRel(b.model.totals.electronMol, (2 * AH) / F_HAND, 1e-12)
  })
})

describe('chlor-alkali: 1 kA·h', () => {
  const brine = [
    'run "chlor-alkali"',
    'cell',
    '  compartment anolyte 20 L',
    '  compartment catholyte 20 L',
    '  separator cation-exchange between anolyte and catholyte, area 1 m^2',
    '  anode mmo-titanium in anolyte, area 1 m^2',
    '  cathode nickel in catholyte, area 1 m^2',
    'charge anolyte: NaCl 4 kg, water 12 L', // 4000 g / 58.44 g/mol = 68.4 mol Na⁺ > 37.3 mol e⁻: no feed limit
    'charge catholyte: water 15 L',
    'step 1: current 1 kA for 1 h',
    'expect Cl2 1 kg in anolyte',
    'expect NaOH 1 kg in catholyte',
    '',
  ].join('\n')

  it('gives 1.3228 kg Cl2 and 1.4925 kg NaOH ([CA], from memory)', () => {
    const a = run(brine)
    const [cl2, naoh] = maxGrams(a)
    expectRel(cl2, 1322.8, 1e-3) // [CA] 1.3228 kg/(kA·h)
    expectRel(naoh, 1492.5, 1e-3) // [CA] 1.4925 kg/(kA·h)
    // by hand: n(e⁻) = 3.6e6 C / 96485.33212 C/mol = 37.3115 mol
    //   Cl2: 37.3115 / 2 × (2 × 35.45) = 1322.69 g;  NaOH: 37.3115 × 39.99677 = 1492.34 g
    expectRel(cl2, ((1000 * AH) / F_HAND / 2) * 2 * W.Cl, 1e-6)
    expectRel(naoh, ((1000 * AH) / F_HAND) * M_NaOH, 1e-6)
  })
})

describe('hydrogen at 0 °C and 101.325 kPa', () => {
  it('1 A·h gives 0.418 L (by hand from F and 22.414 L/mol)', () => {
    const text = [
      'run "hydrogen"',
      'conditions 0 degC, 101.325 kPa',
      'cell',
      '  compartment catholyte 1 L',
      '  anode nickel in catholyte, area 10 cm^2',
      '  cathode nickel in catholyte, area 10 cm^2',
      'charge catholyte: KOH 50 g, water 900 mL',
      'step 1: current 1 A for 1 h',
      'expect H2 0.4 L in catholyte',
      '',
    ].join('\n')
    const a = run(text)
    const y = a.model.yields.find((x) => x.formula.tok.text === 'H2')!
    // by hand: n(e⁻) = 3600 C / 96485.33212 C/mol = 0.0373115 mol; n(H2) = 0.0186557 mol;
    //          V = 0.0186557 mol × 22.414 L/mol [CODATA molar volume] = 0.41815 L
    const litres = y.maxMolEff! * y.litresPerMol!
    expectRel(litres, (AH / F_CODATA / 2) * 22.414, 1e-4) // 22.414 is rounded to 5 figures
    expectRel(litres, 0.418, 1e-3)
    // the computed value is in grams: 0.0186557 mol × 2.016 g/mol = 0.037610 g
    expectRel(maxGrams(a)[0], (AH / F_CODATA / 2) * M_H2, 1e-6)
    // the hint speaks in litres, as the line does
    expect(a.computed.find((c) => c.key === 'expect.max')!.label).toContain('0.418 L')
  })

  it('planning more gas than the charge makes is an error', () => {
    const text = [
      'conditions 0 degC, 101.325 kPa',
      'cell',
      '  compartment catholyte 1 L',
      '  anode nickel in catholyte',
      '  cathode nickel in catholyte',
      'step 1: current 1 A for 1 h',
      'expect H2 0.5 L in catholyte', // 0.5 L > 0.418 L (see above)
      '',
    ].join('\n')
    expect(analyze(text).diagnostics.map((d) => d.code)).toContain('beyond-faraday')
    expect(analyze(text.replace('0.5 L', '0.41 L')).diagnostics.map((d) => d.code)).not.toContain('beyond-faraday')
  })
})

// ---- step arithmetic ---------------------------------------------------------------------------
describe('steps', () => {
  it('a current density is multiplied by the cathode area: 40 mA/cm^2 on 36 cm^2 for 5 h = 7.2 A·h', () => {
    const text = [
      'let area = 36 cm^2',
      'cell',
      '  compartment bath 1 L',
      '  anode platinum in bath, area 50 cm^2',
      '  cathode nickel in bath, area area',
      'step 1: current 40 mA/cm^2 for 5 h',
      '',
    ].join('\n')
    const a = run(text)
    // by hand: 0.040 A/cm^2 × 36 cm^2 = 1.44 A; 1.44 A × 5 h = 7.2 A·h = 7.2 × 3600 C = 25920 C
    expectRel(a.model.steps[0].currentA, 1.44, 1e-12)
    expectRel(a.model.totals.chargeC, 25920, 1e-12)
    expectRel(jsonReport(a, 'x').totals.chargeAh, 7.2, 1e-12)
    const c = a.computed.find((x) => x.key === 'step.charge')!
    expectRel(c.value, 25920, 1e-12)
    expect(c.unit).toBe('C')
  })

  it('`on anode` refers a current density to the anode area instead', () => {
    const text = [
      'cell',
      '  compartment bath 1 L',
      '  anode platinum in bath, area 36 cm^2',
      '  cathode nickel in bath, area 50 cm^2',
      'step 1: current 40 mA/cm^2 on anode for 5 h',
      '',
    ].join('\n')
    const a = run(text)
    // by hand: 0.040 A/cm^2 × 36 cm^2 = 1.44 A
    expectRel(a.model.steps[0].currentA, 1.44, 1e-12)
    expect(a.diagnostics.filter((d) => d.severity === 'error')).toEqual([])
  })

  it('a constant-voltage step with its current gives the energy V·I·t', () => {
    const text = [
      'cell',
      '  compartment bath 1 L',
      '  anode platinum in bath',
      '  cathode nickel in bath',
      'step 1: voltage 3.6 V, current 1.2 A for 2 h',
      '',
    ].join('\n')
    const a = run(text)
    // by hand: 3.6 V × 1.2 A × 2 h = 8.64 W·h = 8.64 × 3600 J = 31104 J
    expectRel(a.model.totals.energyJ, 31104, 1e-12)
    expectRel(jsonReport(a, 'x').totals.energyWh, 8.64, 1e-12)
    // and the charge: 1.2 A × 2 h = 2.4 A·h
    expectRel(jsonReport(a, 'x').totals.chargeAh, 2.4, 1e-12)
  })
})

// ---- charges -----------------------------------------------------------------------------------
describe('charges', () => {
  const feed = (items: string, conditions = 'conditions 22 degC') =>
    [conditions, 'cell', '  compartment feed 1 L', '  anode platinum in feed', '  cathode nickel in feed', `charge feed: ${items}`, ''].join('\n')

  it('K2CO3 260 g is 1.8813 mol (by hand from IUPAC weights)', () => {
    const a = run(feed('K2CO3 260 g'))
    // M(K2CO3) = 2 × 39.0983 + 12.011 + 3 × 15.999 = 138.2046 g/mol; 260 / 138.2046 = 1.881269 mol
    const item = a.computed.find((c) => c.key === 'charge.item')!
    expect(item.unit).toBe('mol')
    expectRel(item.value, 260 / M_K2CO3, 1e-6)
    expectRel(item.value, 1.881269, 1e-6)
  })

  it('water 600 mL, measured at 20 °C, weighs 600 × 0.99821 g ([CRC-W], from memory), whatever the run temperature', () => {
    const a = run(feed('water 600 mL'))
    // 600 mL × 0.99821 g/mL = 598.93 g; tolerance 1e-4 (the table value is from memory)
    expectRel(a.model.compartments.get('feed')!.waterG, 600 * 0.99821, 1e-4)
    const item = a.computed.find((c) => c.key === 'charge.item')!
    // n = 598.93 g / (2 × 1.008 + 15.999) g/mol = 598.93 / 18.015 = 33.246 mol
    expectRel(item.value, (600 * 0.99821) / (2 * W.H + W.O), 1e-4)
    const hot = run(feed('water 600 mL').replace(/conditions [^\n]*/, 'conditions 80 degC'))
    expectRel(hot.model.compartments.get('feed')!.waterG, 600 * 0.99821, 1e-4)
  })

  it('a solution by mass at a wt% gives its solute and water by mass', () => {
    const a = run(feed('NaOH solution 400 g at 25 wt%'))
    const comp = a.model.compartments.get('feed')!
    const s = comp.solutes.get('NaOH')!
    // 400 g × 25 % = 100 g NaOH; 100 g / 39.99677 g/mol = 2.50020 mol; water 400 - 100 = 300 g
    expectRel(s.g, 100, 1e-12)
    expectRel(s.mol, 100 / M_NaOH, 1e-6)
    expect(s.approximate).toBe(false)
    expectRel(comp.waterG, 300, 1e-12)
    // the compartment summary states the mass fraction back: 100 g / 400 g = 25 wt%
    expect(a.computed.find((c) => c.key === 'compartment.contents')!.label).toContain('25 wt%')
  })

  it('a solution by volume at a molarity: 1 L at 0.5 mol/L is 0.5 mol', () => {
    const a = run(feed('NaOH solution 200 mL at 0.5 M'))
    // 0.2 L × 0.5 mol/L = 0.1 mol
    expectRel(a.model.compartments.get('feed')!.solutes.get('NaOH')!.mol, 0.1, 1e-12)
  })

  it('a hydrate counts its water of crystallisation', () => {
    const a = run(feed('CuSO4·5H2O 249.69 g'))
    // M(CuSO4·5H2O) = 63.546 + 32.06 + 9 × 15.999 + 10 × 1.008 = 249.677 g/mol
    const M = W.Cu + W.S + 9 * W.O + 10 * W.H
    const mol = 249.69 / M
    const comp = a.model.compartments.get('feed')!
    expectRel(comp.solutes.get('CuSO4')!.mol, mol, 1e-6)
    // water of crystallisation: 5 × n × 18.015 g/mol
    expectRel(comp.waterG, 5 * mol * (2 * W.H + W.O), 1e-6)
  })
})

// ---- feed limits -------------------------------------------------------------------------------
describe('feed limits', () => {
  it('hydroxide through a cation-exchange membrane is limited by the cation in the feed', () => {
    const text = [
      'cell',
      '  compartment feed 500 mL',
      '  compartment product 250 mL',
      '  separator cation-exchange between feed and product, area 50 cm^2',
      '  anode platinum in feed, area 50 cm^2',
      '  cathode nickel in product, area 50 cm^2',
      'charge feed: K2CO3 10 g, water 400 mL',
      'charge product: water 200 mL',
      'step 1: current 10 A for 10 h', // 100 A·h = 3.73 mol e⁻, far more than the K⁺ fed
      'expect KOH 5 g in product',
      '',
    ].join('\n')
    const a = run(text)
    // by hand: n(K2CO3) = 10 / 138.2046 = 0.0723566 mol; n(K⁺) = 2 × that = 0.1447133 mol;
    //          max KOH = 0.1447133 mol × 56.1053 g/mol = 8.11918 g
    const hand = 2 * (10 / M_K2CO3) * M_KOH
    expectRel(maxGrams(a)[0], hand, 1e-6)
    expect(a.computed.find((c) => c.key === 'expect.max')!.label).toContain('feed-limited')
    // planning more than the feed holds is an error
    const over = analyze(text.replace('expect KOH 5 g', 'expect KOH 9 g'))
    expect(over.diagnostics.filter((d) => d.code === 'beyond-faraday')).toHaveLength(1)
  })

  it('the KOH example: 180 g K2CO3 is 1.30 mol, and the max KOH follows Faraday', () => {
    const text = readFileSync(new URL('../examples/koh-from-carbonate.cellrun', import.meta.url), 'utf8')
    const a = run(text)
    const items = a.computed.filter((c) => c.key === 'charge.item')
    // 180 / 138.2046 = 1.30242 mol
    expectRel(items[0].value, 180 / M_K2CO3, 1e-6)
    // steps: 100 mA/cm^2 × 50 cm^2 = 5 A for 6 h at 90 % + 3 A for 1 h at 80 %:
    //   effective charge = 30 A·h × 0.9 + 3 A·h × 0.8 = 27 + 2.4 = 29.4 A·h
    //   max KOH = 29.4 × 3600 / 96485.33212 × 56.1053 = 61.545 g (K⁺ fed: 2.60 mol, not limiting)
    // The expect line states what is in the product side after the run, which includes the 5 g of
    // KOH charged before it: max = 5 g + 61.545 g.
    expectRel(maxGrams(a)[0], 5 + ((29.4 * AH) / F_HAND) * M_KOH, 1e-6)
    // observe KOH 52.8 g: formed = 52.8 − 5 = 47.8 g; at 100 %: 33 A·h × 3600 / F × 56.1053 g/mol
    //   current efficiency = 47.8 / 69.078 = 0.6920 (by hand)
    const ce = a.computed.find((c) => c.key === 'observe.efficiency')!
    expectRel(ce.value, 47.8 / (((33 * AH) / F_HAND) * M_KOH), 1e-6)
  })
})
