import { describe, it, expect } from 'vitest'
import * as fc from 'fast-check'
import { MF } from 'mf-parser'
import { parseFormula, formulaMass, prettyFormula, type FormulaIssue } from '../server/src/core/formula'
import { ATOMIC_WEIGHTS, ELEMENT_NAMES, isElementSymbol } from '../server/src/core/elements'

// Standard atomic weights written here as literals (deliberately NOT imported from elements.ts).
// Source: IUPAC CIAAW "Standard atomic weights of the elements 2021" (Pure Appl. Chem. 94 (2022)
// 573); for elements whose standard weight is an interval the CIAAW conventional value is used
// (H, C, N, O, S, Cl). Transcribed from memory of that table.
const W = {
  H: 1.008, // IUPAC CIAAW 2021, conventional value (interval [1.00784, 1.00811]); from memory
  C: 12.011, // IUPAC CIAAW 2021, conventional value (interval [12.0096, 12.0116]); from memory
  N: 14.007, // IUPAC CIAAW 2021, conventional value (interval [14.00643, 14.00728]); from memory
  O: 15.999, // IUPAC CIAAW 2021, conventional value (interval [15.99903, 15.99977]); from memory
  Na: 22.98976928, // IUPAC CIAAW 2021, 22.989 769 28(2); from memory
  S: 32.06, // IUPAC CIAAW 2021, conventional value (interval [32.059, 32.076]); from memory
  Cl: 35.45, // IUPAC CIAAW 2021, conventional value (interval [35.446, 35.457]); from memory
  K: 39.0983, // IUPAC CIAAW 2021, 39.0983(1); from memory
  Ca: 40.078, // IUPAC CIAAW 2021, 40.078(4); from memory
  Fe: 55.845, // IUPAC CIAAW 2021, 55.845(2); from memory
  Ni: 58.6934, // IUPAC CIAAW 2021, 58.6934(4); from memory
  Cu: 63.546, // IUPAC CIAAW 2021, 63.546(3); from memory
} as const

type Sym = keyof typeof W
/** Hand calculation: sum of count × atomic weight over the composition written out by hand. */
function hand(composition: Partial<Record<Sym, number>>): number {
  let m = 0
  for (const [el, n] of Object.entries(composition)) m += W[el as Sym] * (n ?? 0)
  return m
}

// Each row: our notation; the same species in mf-parser notation (mf-parser reads '.'/'·' as a
// non-multiplied addition and '[...]' as an isotope label, so hydrates are written as (H2O)n and
// the ferrocyanide without brackets); the composition counted by hand from the formula.
const SPECIES: [ours: string, mfNotation: string, composition: Partial<Record<Sym, number>>][] = [
  ['H2O', 'H2O', { H: 2, O: 1 }],
  ['NaCl', 'NaCl', { Na: 1, Cl: 1 }],
  ['KCl', 'KCl', { K: 1, Cl: 1 }],
  ['NaOH', 'NaOH', { Na: 1, O: 1, H: 1 }],
  ['KOH', 'KOH', { K: 1, O: 1, H: 1 }],
  ['K2CO3', 'K2CO3', { K: 2, C: 1, O: 3 }],
  ['Na2CO3', 'Na2CO3', { Na: 2, C: 1, O: 3 }],
  ['NaHCO3', 'NaHCO3', { Na: 1, H: 1, C: 1, O: 3 }],
  ['CuSO4', 'CuSO4', { Cu: 1, S: 1, O: 4 }],
  ['CuSO4·5H2O', 'CuSO4(H2O)5', { Cu: 1, S: 1, O: 9, H: 10 }],
  ['NiSO4·6H2O', 'NiSO4(H2O)6', { Ni: 1, S: 1, O: 10, H: 12 }],
  ['Na2SO4·10H2O', 'Na2SO4(H2O)10', { Na: 2, S: 1, O: 14, H: 20 }],
  ['Ca(OH)2', 'Ca(OH)2', { Ca: 1, O: 2, H: 2 }],
  ['K4[Fe(CN)6]', 'K4Fe(CN)6', { K: 4, Fe: 1, C: 6, N: 6 }],
  ['(NH4)2SO4', '(NH4)2SO4', { N: 2, H: 8, S: 1, O: 4 }],
  ['NaClO3', 'NaClO3', { Na: 1, Cl: 1, O: 3 }],
  ['H2SO4', 'H2SO4', { H: 2, S: 1, O: 4 }],
  ['Cl2', 'Cl2', { Cl: 2 }],
  ['O2', 'O2', { O: 2 }],
  ['H2', 'H2', { H: 2 }],
]

// Tolerance against mf-parser: it does not use the CIAAW conventional values but derives each
// element's mass from isotope masses and representative isotopic abundances, e.g. (its values)
// H 1.007941, O 15.999405, S 32.064787, Cl 35.452938. Per element the relative difference from
// the conventional value is at most about 1.5e-4 (S: 0.0048/32.06), then Cl 8.3e-5, H 5.9e-5,
// O 2.5e-5. A compound's relative difference is a mass-weighted mean of its elements' relative
// differences, so it cannot exceed 1.5e-4; 2e-4 leaves a margin and is still more than 10 times
// smaller than the error of one missing H in the heaviest species here (1.008/368 = 2.7e-3).
const MF_PARSER_REL_TOL = 2e-4

describe('molar masses', () => {
  for (const [ours, mfNotation, composition] of SPECIES) {
    it(`${ours}: matches a hand calculation from IUPAC 2021 weights`, () => {
      const f = parseFormula(ours)
      expect(f.issues).toEqual([])
      expect(f.ok).toBe(true)
      expect(f.molarMass).toBeCloseTo(hand(composition), 6)
      expect(formulaMass(ours)).toBeCloseTo(hand(composition), 6)
    })
    it(`${ours}: agrees with mf-parser (${mfNotation}) within ${MF_PARSER_REL_TOL}`, () => {
      const reference = new MF(mfNotation).getInfo().mass // npm library mf-parser 3.9.3
      const ours_ = formulaMass(ours)
      expect(Math.abs(ours_ - reference) / reference).toBeLessThan(MF_PARSER_REL_TOL)
    })
    it(`${ours}: element counts are the hand-counted composition`, () => {
      const counts = Object.fromEntries(parseFormula(ours).counts)
      expect(counts).toEqual(composition) // counted by hand from the formula text
    })
  }
})

describe('charges', () => {
  // Expected charges are read off the notation (caret charge / trailing signs), by hand.
  const cases: [string, number][] = [
    ['SO4^2-', -2],
    ['OH-', -1],
    ['Cu^2+', 2],
    ['Fe(CN)6^4-', -4],
    ['SO4--', -2],
    ['Na+', 1],
    ['NH4+', 1],
    ['NO3-', -1],
    ['Fe^3+', 3],
    ['H2O', 0],
  ]
  for (const [text, charge] of cases) {
    it(`${text} has charge ${charge}`, () => {
      const f = parseFormula(text)
      expect(f.ok).toBe(true)
      expect(f.charge).toBe(charge)
      expect(f.issues).toEqual([])
    })
  }
  it('the charge does not change the element counts or the molar mass (electron mass ignored)', () => {
    const f = parseFormula('Fe(CN)6^4-')
    expect(Object.fromEntries(f.counts)).toEqual({ Fe: 1, C: 6, N: 6 }) // counted by hand
    expect(f.molarMass).toBeCloseTo(hand({ Fe: 1, C: 6, N: 6 }), 6)
    expect(parseFormula('SO4^2-').molarMass).toBeCloseTo(hand({ S: 1, O: 4 }), 6)
  })
})

describe('hydrates and groups', () => {
  it('all hydrate separators give the same result', () => {
    const forms = ['CuSO4·5H2O', 'CuSO4•5H2O', 'CuSO4*5H2O', 'CuSO4.5H2O']
    const parsed = forms.map(parseFormula)
    for (const f of parsed) {
      expect(f.ok).toBe(true)
      expect(f.hydrateWater).toBe(5) // the coefficient written in the text
      expect(Object.fromEntries(f.counts)).toEqual({ Cu: 1, S: 1, O: 9, H: 10 }) // counted by hand
      expect(f.molarMass).toBe(parsed[0]!.molarMass)
    }
  })
  it('hydrate coefficient of two digits', () => {
    const f = parseFormula('Na2CO3.10H2O')
    expect(f.hydrateWater).toBe(10) // written in the text
    expect(f.molarMass).toBeCloseTo(hand({ Na: 2, C: 1, O: 13, H: 20 }), 6)
  })
  it('anhydrous salts have hydrateWater 0', () => {
    expect(parseFormula('CuSO4').hydrateWater).toBe(0)
  })
  it('nested groups multiply through', () => {
    // compositions counted by hand
    expect(Object.fromEntries(parseFormula('K4[Fe(CN)6]').counts)).toEqual({ K: 4, Fe: 1, C: 6, N: 6 })
    expect(Object.fromEntries(parseFormula('Ca3(Fe(CN)6)2').counts)).toEqual({ Ca: 3, Fe: 2, C: 12, N: 12 })
    expect(Object.fromEntries(parseFormula('[Cu(NH3)4]SO4').counts)).toEqual({ Cu: 1, N: 4, H: 12, S: 1, O: 4 })
    expect(Object.fromEntries(parseFormula('((OH)2)3').counts)).toEqual({ O: 6, H: 6 })
  })
})

describe('prettyFormula', () => {
  // Expected strings: the display convention given in the project brief (subscript counts,
  // superscript charges, hydrate coefficient on the line).
  it.each([
    ['CuSO4·5H2O', 'CuSO₄·5H₂O'],
    ['CuSO4.5H2O', 'CuSO₄·5H₂O'],
    ['SO4^2-', 'SO₄²⁻'],
    ['OH-', 'OH⁻'],
    ['SO4--', 'SO₄²⁻'],
    ['Cu2+', 'Cu²⁺'],
    ['K4[Fe(CN)6]', 'K₄[Fe(CN)₆]'],
  ])('%s -> %s', (input, shown) => {
    expect(prettyFormula(input)).toBe(shown)
  })
})

describe('issues', () => {
  function only(text: string): FormulaIssue {
    const { issues } = parseFormula(text)
    expect(issues).toHaveLength(1)
    return issues[0]!
  }
  // Offsets below are positions counted by hand in the input text (UTF-16 code units).

  it('H20: zero for O in a count is a warning with H2O', () => {
    const f = parseFormula('H20')
    expect(f.ok).toBe(true)
    expect(f.issues).toEqual([
      expect.objectContaining({ code: 'zero-for-oxygen', severity: 'warning', start: 2, end: 3, replacement: 'H2O' }),
    ])
  })
  it('K0H and H202 are caught too', () => {
    expect(only('K0H')).toMatchObject({ code: 'zero-for-oxygen', start: 1, end: 2, replacement: 'KOH' })
    expect(only('H202')).toMatchObject({ code: 'zero-for-oxygen', severity: 'warning', replacement: 'H2O2' })
  })
  it('C02: leading zero is an error with CO2', () => {
    const f = parseFormula('C02')
    expect(f.ok).toBe(false)
    expect(Number.isNaN(f.molarMass)).toBe(true)
    expect(only('C02')).toMatchObject({ code: 'zero-for-oxygen', severity: 'error', start: 1, end: 2, replacement: 'CO2' })
  })
  it('Na0H: error with NaOH', () => {
    expect(only('Na0H')).toMatchObject({ code: 'zero-for-oxygen', severity: 'error', start: 2, end: 3, replacement: 'NaOH' })
  })
  it('Xq: unknown element, no obvious replacement', () => {
    const issue = only('Xq')
    expect(issue).toMatchObject({ code: 'unknown-element', severity: 'error', start: 0, end: 2 })
    expect(issue.replacement).toBeUndefined()
    expect(Number.isNaN(formulaMass('Xq'))).toBe(true)
  })
  it('NaCL: unknown element with the case fixed', () => {
    expect(only('NaCL')).toMatchObject({ code: 'unknown-element', severity: 'error', start: 2, end: 4, replacement: 'NaCl' })
    expect(only('NACL')).toMatchObject({ code: 'unknown-element', replacement: 'NaCl' })
    expect(only('CL2')).toMatchObject({ code: 'unknown-element', start: 0, end: 2, replacement: 'Cl2' })
  })
  it('Cu2+: ambiguous charge, read as +2, warning with Cu^2+', () => {
    const f = parseFormula('Cu2+')
    expect(f.ok).toBe(true)
    expect(f.charge).toBe(2)
    expect(Object.fromEntries(f.counts)).toEqual({ Cu: 1 })
    expect(only('Cu2+')).toMatchObject({
      code: 'ambiguous-charge',
      severity: 'warning',
      start: 2,
      end: 4,
      replacement: 'Cu^2+',
    })
  })
  it('SO42-: the last digit is read as the charge', () => {
    const f = parseFormula('SO42-')
    expect(f.charge).toBe(-2)
    expect(Object.fromEntries(f.counts)).toEqual({ S: 1, O: 4 })
    expect(only('SO42-')).toMatchObject({ code: 'ambiguous-charge', start: 3, end: 5, replacement: 'SO4^2-' })
  })
  it('NaCl): unmatched bracket', () => {
    expect(only('NaCl)')).toMatchObject({ code: 'formula-syntax', severity: 'error', start: 4, end: 5, replacement: 'NaCl' })
  })
  it('(: unclosed bracket', () => {
    expect(only('(')).toMatchObject({ code: 'formula-syntax', severity: 'error', start: 0, end: 1 })
  })
  it('empty text', () => {
    const f = parseFormula('')
    expect(f.ok).toBe(false)
    expect(Number.isNaN(f.molarMass)).toBe(true)
    expect(only('')).toMatchObject({ code: 'formula-syntax', severity: 'error', start: 0, end: 0 })
  })
  it('5: a bare number', () => {
    expect(only('5')).toMatchObject({ code: 'formula-syntax', severity: 'error', start: 0, end: 1 })
  })
  it('Na2SO4·: dangling hydrate separator', () => {
    expect(only('Na2SO4·')).toMatchObject({ code: 'formula-syntax', severity: 'error', start: 6, end: 7 })
  })
  it('stray characters and spaces', () => {
    expect(only('Na$Cl')).toMatchObject({ code: 'formula-syntax', start: 2, end: 3 })
    expect(only('Na Cl')).toMatchObject({ code: 'formula-syntax', start: 2, end: 3, replacement: 'NaCl' })
    expect(only('Na😀')).toMatchObject({ code: 'formula-syntax', start: 2, end: 4 }) // surrogate pair
  })
  it('every issue message is non-empty', () => {
    for (const t of ['H20', 'C02', 'Na0H', 'Xq', 'NaCL', 'Cu2+', 'NaCl)', '(', '', '5', 'Na2SO4·']) {
      for (const i of parseFormula(t).issues) expect(i.message.length).toBeGreaterThan(10)
    }
  })
})

describe('elements table', () => {
  it('spot values', () => {
    // IUPAC CIAAW 2021 conventional / standard values (from memory); Zr is the 2021 value, before the 2024 revision
    expect(ATOMIC_WEIGHTS['H']).toBe(1.008)
    expect(ATOMIC_WEIGHTS['Cl']).toBe(35.45)
    expect(ATOMIC_WEIGHTS['Br']).toBe(79.904)
    expect(ATOMIC_WEIGHTS['Pb']).toBe(207.2)
    expect(ATOMIC_WEIGHTS['Hf']).toBe(178.486)
    expect(ATOMIC_WEIGHTS['Yb']).toBe(173.045)
    expect(ATOMIC_WEIGHTS['Zr']).toBe(91.224)
  })
  it('covers elements 1-83 (except Tc and Pm, which have no standard atomic weight) plus Th, Pa, U', () => {
    const symbols = Object.keys(ELEMENT_NAMES)
    expect(symbols).toHaveLength(118) // number of named elements, IUPAC
    const weighted = symbols.slice(0, 83).filter((s) => s !== 'Tc' && s !== 'Pm')
    for (const s of [...weighted, 'Th', 'Pa', 'U']) expect(ATOMIC_WEIGHTS[s]).toBeGreaterThan(0)
    expect(ATOMIC_WEIGHTS['Tc']).toBeUndefined()
    expect(isElementSymbol('Tc')).toBe(true)
    expect(isElementSymbol('CL')).toBe(false)
    expect(isElementSymbol('constructor')).toBe(false)
    expect(ELEMENT_NAMES['Bi']).toBe('bismuth')
  })
})

describe('never throws (property)', () => {
  function checkInvariants(text: string): void {
    const f = parseFormula(text)
    expect(f.text).toBe(text)
    for (const i of f.issues) {
      expect(i.start).toBeGreaterThanOrEqual(0)
      expect(i.end).toBeLessThanOrEqual(text.length)
      expect(i.start).toBeLessThanOrEqual(i.end)
    }
    expect(f.ok).toBe(!f.issues.some((i) => i.severity === 'error'))
    if (!f.ok) expect(Number.isNaN(f.molarMass)).toBe(true)
    prettyFormula(text)
    formulaMass(text)
  }
  it('fc.string', () => {
    fc.assert(fc.property(fc.string({ maxLength: 40 }), checkInvariants), { numRuns: 2000 })
  })
  it('full Unicode strings (fast-check 4 replaced fc.fullUnicodeString by unit "binary")', () => {
    fc.assert(fc.property(fc.string({ unit: 'binary', maxLength: 40 }), checkInvariants), { numRuns: 2000 })
  })
  it('strings from the formula alphabet', () => {
    const unit = fc.constantFrom(...'CuSONaHClKFe0123456789()[]·•*.^+- xqL'.split(''), 'Xq', 'CL', '😀')
    fc.assert(fc.property(fc.string({ unit, maxLength: 40 }), checkInvariants), { numRuns: 3000 })
  })
})
