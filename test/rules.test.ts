// One block per rule module in server/src/rules: where the diagnostic must be (⟦marked⟧ ranges, see
// test/support/markers.ts), its code and severity, a protocol where the rule stays silent, and, where
// the rule offers a quick fix, the fix applied and re-analysed. Then registry-wide checks: every code
// emitted belongs to a rule in RULES, codes are unique, every rule module is covered here, and the
// shipped examples have no errors.
//
// Numbers in these tests are only used to cross a threshold (a plan above or below a Faraday maximum,
// a volume above or below a compartment); the arithmetic that places them is written beside them from
// outside constants: F = 96485.33212 C/mol (CODATA 2018), atomic weights IUPAC 2021 (from memory).
import { readdirSync, readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { mayBeNoted } from '../server/src/rules/noted'
import { analyze, type Analysis } from '../server/src/core/analyze'
import { RULES } from '../server/src/rules'
import { toNumber } from '../server/src/core/units'
import { marked } from './support/markers'
import { ruleTester } from './support/rule-tester'

// ---- helpers -----------------------------------------------------------------------------------

/** Every analysis made in this file, for the registry-wide checks at the end. */
const analyses: Analysis[] = []
/** Codes whose diagnostics a test has pinned down with markers. */
const pinned = new Set<string>()

const { an, at, silent, fixClears } = ruleTester({ onAnalysis: (a) => analyses.push(a), onPinned: (code) => pinned.add(code) })

/** A clean two-compartment cell; each test changes one thing in it. */
const BASE = [
  'run "base"', // 1
  'conditions 25 degC, 101.325 kPa', // 2
  'let area = 50 cm^2', // 3
  'cell', // 4
  '  vessel polypropylene', // 5
  '  compartment feed 500 mL', // 6
  '  compartment product 250 mL', // 7
  '  separator cation-exchange between feed and product, area area', // 8
  '  anode platinum in feed, area area', // 9
  '  cathode nickel in product, area area', // 10
  'charge feed: K2CO3 100 g, water 400 mL', // 11
  'charge product: water 200 mL', // 12
  'step 1: current 2 A for 1 h', // 13
  'expect KOH 3 g in product', // 14
  'observe KOH 2.5 g in product', // 15
  'handling vent: hydrogen to the hood', // 16
  '',
].join('\n')
// KOH at 2 A·h: 7200 C / 96485.33212 C/mol = 0.074622 mol e⁻ → 0.074622 mol × 56.105 g/mol = 4.187 g
// (K⁺ fed: 2 × 100 g / 138.20 g/mol = 1.447 mol, not limiting), so 3 g and 2.5 g are both below it.

describe('the base protocol', () => {
  it('is clean: no diagnostics at all', () => {
    expect(an(BASE).diagnostics.map((d) => `${d.code}: ${d.message}`)).toEqual([])
  })
})

// ---- syntax ------------------------------------------------------------------------------------
describe('syntax', () => {
  it('a misspelt statement keyword, with a fix', () => {
    const src = BASE.replace('run "base"', '⟦rn⟧ "base"')
    const { text, ds } = at(src, 'syntax', 'error')
    fixClears(text, ds[0], BASE)
  })

  it('a misspelt step clause, with a fix', () => {
    const src = BASE.replace('step 1: current 2 A', 'step 1: ⟦curent⟧ 2 A')
    const { text, ds } = at(src, 'syntax', 'error')
    fixClears(text, ds[0], BASE)
  })

  it('a misspelt `between`, with a fix', () => {
    const src = BASE.replace('cation-exchange between', 'cation-exchange ⟦betwen⟧')
    const { text, ds } = at(src, 'syntax', 'error')
    fixClears(text, ds[0], BASE)
  })

  it('an unclosed title and a `let` without a name, no fix', () => {
    const src = BASE.replace('run "base"', 'run ⟦"base⟧').replace('let area = 50 cm^2', 'let area = 50 cm^2\nlet ⟦=⟧ 3')
    const { ds } = at(src, 'syntax', 'error')
    expect(ds.every((d) => d.fixes.length === 0)).toBe(true)
  })

  it('is silent on the base protocol and on comments and blank lines', () => {
    silent(BASE, 'syntax')
    silent('# a comment\n\nrun "x" # trailing comment with "quotes"\n', 'syntax')
  })
})

// ---- bad-expression ----------------------------------------------------------------------------
describe('bad-expression', () => {
  it('a refused function points at its name', () => {
    const src = BASE.replace('let area = 50 cm^2', 'let area = 50 cm^2\nlet x = ⟦sin⟧(2)')
    const { ds } = at(src, 'bad-expression', 'error')
    expect(ds[0].fixes).toEqual([])
    expect(ds[0].message).toContain('sin')
  })

  it('adding a current to a voltage covers the whole expression', () => {
    const src = BASE.replace('step 1: current 2 A for 1 h', 'step 1: current ⟦2 A + 1 V⟧ for 1 h')
    at(src, 'bad-expression', 'error')
  })

  it('is silent on good expressions and leaves unknown names to unknown-name', () => {
    silent(BASE, 'bad-expression')
    silent(BASE.replace('area area\n  cathode', 'area sqrt(area) * sqrt(area)\n  cathode'), 'bad-expression')
    silent(BASE.replace('current 2 A', 'current 2 A * nope'), 'bad-expression')
  })
})

// ---- unknown-name ------------------------------------------------------------------------------
describe('unknown-name', () => {
  it('a misspelt value, with a fix to the closest `let`', () => {
    const src = BASE.replace('anode platinum in feed, area area', 'anode platinum in feed, area ⟦aera⟧')
    const { text, ds } = at(src, 'unknown-name', 'error')
    expect(ds[0].message).toContain('aera')
    fixClears(text, ds[0], BASE)
  })

  it('a misspelt compartment, with a fix', () => {
    const src = BASE.replace('charge product:', 'charge ⟦prodcut⟧:')
    const { text, ds } = at(src, 'unknown-name', 'error')
    fixClears(text, ds[0], BASE)
  })

  it('a value used above its `let` says so', () => {
    const src = BASE.replace('let area = 50 cm^2', 'let twice = ⟦side⟧ * 2\nlet side = 5 cm\nlet area = 50 cm^2')
    const { ds } = at(src, 'unknown-name', 'error')
    expect(ds[0].message).toContain('defined later, on line 4')
  })

  it('is silent when every name is defined', () => {
    silent(BASE, 'unknown-name')
  })
})

// ---- wrong-unit --------------------------------------------------------------------------------
describe('wrong-unit', () => {
  it('a voltage after `current`, with a fix that changes the clause word', () => {
    const src = BASE.replace('step 1: current 2 A for 1 h', 'step 1: current ⟦3 V⟧ for 1 h')
    const { text, ds } = at(src, 'wrong-unit', 'error')
    fixClears(text, ds[0], BASE.replace('step 1: current 2 A for 1 h', 'step 1: voltage 3 V for 1 h'))
  })

  it('a plain number for a volume, with a fix that adds the unit', () => {
    const src = BASE.replace('compartment feed 500 mL', 'compartment feed ⟦500⟧')
    const { text, ds } = at(src, 'wrong-unit', 'error')
    fixClears(text, ds[0], BASE)
  })

  it('a mass where a duration belongs', () => {
    const src = BASE.replace('for 1 h', 'for ⟦1 g⟧')
    at(src, 'wrong-unit', 'error')
  })

  it('is silent when every unit fits', () => {
    silent(BASE, 'wrong-unit')
    silent(BASE.replace('current 2 A', 'current 40 mA/cm^2'), 'wrong-unit')
  })
})

// ---- out-of-range ------------------------------------------------------------------------------
describe('out-of-range', () => {
  it('an efficiency written without %, with a fix that adds it', () => {
    const src = BASE.replace('for 1 h', 'for 1 h, efficiency ⟦85⟧')
    const { text, ds } = at(src, 'out-of-range', 'error')
    fixClears(text, ds[0], BASE.replace('for 1 h', 'for 1 h, efficiency 85 %'))
  })

  it('a negative duration and an efficiency above 100 %, no fix', () => {
    const src = BASE.replace('for 1 h', 'for ⟦-1 h⟧, efficiency ⟦120 %⟧')
    const { ds } = at(src, 'out-of-range', 'error')
    expect(ds.every((d) => d.fixes.length === 0)).toBe(true)
  })

  it('a temperature where water is not liquid is a warning', () => {
    const src = BASE.replace('conditions 25 degC', 'conditions ⟦120 degC⟧')
    at(src, 'out-of-range', 'warning')
  })

  it('is silent in range', () => {
    silent(BASE, 'out-of-range')
    silent(BASE.replace('for 1 h', 'for 1 h, efficiency 85 %'), 'out-of-range')
    silent(BASE.replace('for 1 h', 'for 1 h, efficiency 0.85'), 'out-of-range')
    silent(BASE.replace('conditions 25 degC', 'conditions 95 degC'), 'out-of-range')
  })
})

// ---- unknown-element ---------------------------------------------------------------------------
describe('unknown-element', () => {
  it('a symbol that is no element', () => {
    const src = BASE.replace('K2CO3 100 g', 'K2CO3 100 g, ⟦Xq⟧ 3 g')
    const { ds } = at(src, 'unknown-element', 'error')
    expect(ds[0].fixes).toEqual([])
  })

  it('a wrong letter case, with a fix', () => {
    const src = BASE.replace('K2CO3 100 g', 'K2CO3 100 g, Na⟦CL⟧ 10 g')
    const { text, ds } = at(src, 'unknown-element', 'error')
    fixClears(text, ds[0], BASE.replace('K2CO3 100 g', 'K2CO3 100 g, NaCl 10 g'))
  })

  it('is silent on real elements', () => {
    silent(BASE, 'unknown-element')
  })
})

// ---- zero-for-o --------------------------------------------------------------------------------
describe('zero-for-o', () => {
  it('a zero for O in a formula, with a fix', () => {
    const src = BASE.replace('expect KOH 3 g', 'expect K⟦0⟧H 3 g')
    const { text, ds } = at(src, 'zero-for-o', 'error')
    fixClears(text, ds[0], BASE)
  })

  it('is silent on a formula with real counts', () => {
    silent(BASE, 'zero-for-o')
    silent(BASE.replace('K2CO3 100 g', 'K2CO3 100 g, Na2SO4·10H2O 5 g'), 'zero-for-o')
  })
})

// ---- bad-formula -------------------------------------------------------------------------------
describe('bad-formula', () => {
  it('an unclosed parenthesis, no fix', () => {
    const src = BASE.replace('K2CO3 100 g, water 400 mL', 'water 400 mL, Ca⟦(⟧OH 2 g')
    const { ds } = at(src, 'bad-formula', 'error')
    expect(ds[0].fixes).toEqual([])
  })

  it('an ambiguous ion charge is a warning, with a fix', () => {
    const src = BASE.replace('K2CO3 100 g', 'K2CO3 100 g, SO4⟦2-⟧ 1 g')
    const { text, ds } = at(src, 'bad-formula', 'warning')
    fixClears(text, ds[0], BASE.replace('K2CO3 100 g', 'K2CO3 100 g, SO4^2- 1 g'))
  })

  it('is silent on well-formed formulas, hydrates and charges', () => {
    silent(BASE.replace('K2CO3 100 g', 'K2CO3 100 g, CuSO4·5H2O 5 g, SO4^2- 1 g, Ca(OH)2 1 g'), 'bad-formula')
  })
})

// ---- duplicate-name ----------------------------------------------------------------------------
describe('duplicate-name', () => {
  it('a value and a compartment defined twice; the second is flagged', () => {
    const src = BASE.replace('let area = 50 cm^2', 'let area = 50 cm^2\nlet ⟦area⟧ = 10 cm^2').replace(
      '  compartment product 250 mL',
      '  compartment product 250 mL\n  compartment ⟦feed⟧ 100 mL',
    )
    const { ds } = at(src, 'duplicate-name', 'error')
    expect(ds[0].message).toContain('line 3')
    expect(ds[1].message).toContain('line 7')
  })

  it('is silent when a value and a compartment share a name (different namespaces)', () => {
    silent(BASE.replace('let area = 50 cm^2', 'let area = 50 cm^2\nlet feed = 3'), 'duplicate-name')
  })
})

// ---- unknown-kind ------------------------------------------------------------------------------
describe('unknown-kind', () => {
  it('a misspelt separator kind is an error, with a fix', () => {
    const src = BASE.replace('separator cation-exchange', 'separator ⟦cation-exchang⟧')
    const { text, ds } = at(src, 'unknown-kind', 'error')
    fixClears(text, ds[0], BASE)
  })

  it('a misspelt handling kind is a warning, with a fix', () => {
    const src = BASE.replace('handling vent:', 'handling ⟦vnt⟧:')
    const { text, ds } = at(src, 'unknown-kind', 'warning')
    fixClears(text, ds[0], BASE)
  })

  it('is silent on known kinds', () => {
    silent(BASE, 'unknown-kind')
    silent(BASE.replace('cation-exchange', 'diaphragm').replace('handling vent', 'handling scrubber'), 'unknown-kind')
  })
})

// ---- outside-cell ------------------------------------------------------------------------------
describe('outside-cell', () => {
  it('a cell part not indented right after the cell is a warning, with a fix that indents it', () => {
    const src = BASE.replace('  cathode nickel', '⟦cathode⟧ nickel')
    const { text, ds } = at(src, 'outside-cell', 'warning')
    fixClears(text, ds[0], BASE)
  })

  it('with no `cell` line at all, no fix', () => {
    const src = '⟦compartment⟧ a 1 L\n  ⟦anode⟧ platinum in a\n'
    const { ds } = at(src, 'outside-cell', 'warning')
    expect(ds.every((d) => d.fixes.length === 0)).toBe(true)
  })

  it('a cell part after other statements gets no indent fix (indenting would not put it in the cell)', () => {
    const src = BASE.replace('handling vent: hydrogen to the hood', 'handling vent: hydrogen to the hood\n⟦compartment⟧ spare 100 mL')
    const { ds } = at(src, 'outside-cell', 'warning')
    expect(ds[0].fixes).toEqual([])
    expect(ds[0].message).toContain('move it')
  })

  it('is silent when the parts are indented under `cell`', () => {
    silent(BASE, 'outside-cell')
  })
})

// ---- missing-electrode -------------------------------------------------------------------------
describe('missing-electrode', () => {
  it('current passed with no cathode: a warning on the `cell` line', () => {
    const src = BASE.replace('  cathode nickel in product, area area\n', '').replace('cell\n', '⟦cell⟧\n')
    const { ds } = at(src, 'missing-electrode', 'warning')
    expect(ds[0].message).toContain('cathode')
    expect(ds[0].fixes).toEqual([])
  })

  it('no cell at all: both electrodes are missing, reported on the step', () => {
    at('⟦⟦step 1: current 1 A for 1 h⟧⟧\n', 'missing-electrode', 'warning')
  })

  it('is silent with both electrodes, or with no step', () => {
    silent(BASE, 'missing-electrode')
    silent('cell\n  compartment a 1 L\n  anode platinum in a\n', 'missing-electrode')
  })
})

// ---- step-incomplete ---------------------------------------------------------------------------
describe('step-incomplete', () => {
  it('no duration: an error with a fix that adds one', () => {
    const src = BASE.replace('step 1: current 2 A for 1 h', '⟦step 1: current 2 A⟧')
    const { text, ds } = at(src, 'step-incomplete', 'error')
    fixClears(text, ds[0], BASE)
  })

  it('a held voltage without a current: information, with a fix that adds a current', () => {
    const src = BASE.replace('step 1: current 2 A for 1 h', '⟦step 1: voltage 3 V for 1 h⟧')
    const { text, ds } = at(src, 'step-incomplete', 'information')
    fixClears(text, ds[0], BASE.replace('step 1: current 2 A for 1 h', 'step 1: voltage 3 V for 1 h, current 1 A'))
  })

  it('neither current nor voltage: an error', () => {
    const src = BASE.replace('step 1: current 2 A for 1 h', '⟦step 1: for 1 h⟧')
    at(src, 'step-incomplete', 'error')
  })

  it('a current density with no electrode area: an error on the density', () => {
    const src = 'cell\n  compartment a 1 L\n  anode platinum in a\n  cathode nickel in a\nstep 1: current ⟦10 mA/cm^2⟧ for 1 h\n'
    at(src, 'step-incomplete', 'error')
  })

  it('is silent on complete steps', () => {
    silent(BASE, 'step-incomplete')
    silent(BASE.replace('current 2 A for 1 h', 'voltage 3.6 V, current 1.2 A for 2 h'), 'step-incomplete')
  })
})

// ---- overfilled --------------------------------------------------------------------------------
describe('overfilled', () => {
  it('more liquid than the compartment holds: a warning on the last charge line', () => {
    // feed is 500 mL; 400 mL + 120 mL = 520 mL, 4 % over (the rule allows 2 %)
    const src = BASE.replace('charge product: water 200 mL', 'charge product: water 200 mL\n⟦charge feed: water 120 mL⟧  # top up')
    const { ds } = at(src, 'overfilled', 'warning')
    expect(ds[0].message).toContain('feed')
  })

  it('is silent within the allowance', () => {
    silent(BASE, 'overfilled')
    // 400 mL + 105 mL = 505 mL in 500 mL: 1 % over, within the 2 % allowance
    silent(BASE.replace('charge product: water 200 mL', 'charge product: water 200 mL\ncharge feed: water 105 mL'), 'overfilled')
  })
})

// ---- product-reaction --------------------------------------------------------------------------
describe('product-reaction', () => {
  it('a product no electrode reaction makes: information', () => {
    const src = BASE.replace('expect KOH 3 g in product', 'expect ⟦Na⟧ 3 g in product')
    const { ds } = at(src, 'product-reaction', 'information')
    expect(ds[0].fixes).toEqual([])
  })

  it('a product named in the wrong compartment: a warning with a fix', () => {
    const src = BASE.replace('expect KOH 3 g in product', 'expect KOH 3 g in ⟦feed⟧')
    const { text, ds } = at(src, 'product-reaction', 'warning')
    fixClears(text, ds[0], BASE)
  })

  it('is silent on known products in the right place', () => {
    silent(BASE, 'product-reaction')
    silent(BASE.replace('expect KOH 3 g in product', 'expect O2 100 mL in feed'), 'product-reaction')
  })
})

// ---- shadows-unit ------------------------------------------------------------------------------
describe('shadows-unit', () => {
  it('a value named like a unit is an error, and the unit keeps its meaning', () => {
    const src = [
      'cell',
      '  compartment bath 1 L',
      '  anode platinum in bath',
      '  cathode nickel in bath',
      'let ⟦min⟧ = 30 s',
      'step 1: current 1 A for 90 min',
      '',
    ].join('\n')
    const { a } = at(src, 'shadows-unit', 'error')
    // 1 A × 90 min = 1.5 A·h = 5400 C (arithmetic): `min` still means minutes
    expect(a.model.totals.chargeC).toBeCloseTo(5400, 9)
  })

  it('a value named like a constant is an error too: `pi` keeps meaning π', () => {
    const { a, ds } = at('let ⟦pi⟧ = 2 A\nlet x = pi * 1 A\n', 'shadows-unit', 'error')
    expect(ds[0].message).toMatch(/built-in constant/)
    // π = 3.14159265… (mathematical constant): the `let` did not change it
    expect(toNumber(a.model.values.get('x')!, 'A')).toBeCloseTo(Math.PI, 12)
  })

  it('is silent for names that are not units', () => {
    silent('let area = 36 cm^2\nlet j = 40 mA/cm^2\n', 'shadows-unit')
  })
})

// ---- approximate-amount ------------------------------------------------------------------------
describe('approximate-amount', () => {
  it('a concentrated solution by volume with wt% is a warning; a dilute one a note', () => {
    const src = BASE.replace(
      'charge product: water 200 mL',
      'charge product: water 100 mL, ⟦H2SO4 solution 10 mL at 98 wt%⟧, ⟦NaNO3 solution 50 mL at 2 wt%⟧',
    )
    const { ds } = at(src, 'approximate-amount', ['warning', 'information'])
    // 98 wt% sulfuric acid is about 1.84 g/mL (CRC Handbook, from memory): a water-density guess is 46 % low
    expect(ds[0].message).toContain('off by tens of percent')
  })

  it('is silent when the amount needs no density', () => {
    silent(BASE.replace('charge product: water 200 mL', 'charge product: NaOH solution 40 g at 50 wt%, KOH solution 0.1 L at 2 mol/L'), 'approximate-amount')
  })
})

// ---- below-charged -----------------------------------------------------------------------------
describe('below-charged', () => {
  it('an observed amount below what was charged is a warning, with a fix that adds the charged amount', () => {
    const charged = BASE.replace('charge product: water 200 mL', 'charge product: KOH 4 g, water 200 mL')
    const src = charged.replace('observe KOH 2.5 g', 'observe KOH ⟦3 g⟧').replace('expect KOH 3 g', 'expect KOH 6 g')
    const { text, ds } = at(src, 'below-charged', 'warning')
    // 3 g stated + 4 g charged = 7 g
    fixClears(text, ds[0], charged.replace('observe KOH 2.5 g', 'observe KOH 7 g').replace('expect KOH 3 g', 'expect KOH 6 g'))
  })

  it('is silent when the stated amount includes what was charged', () => {
    silent(BASE.replace('charge product: water 200 mL', 'charge product: KOH 1 g, water 200 mL'), 'below-charged')
  })
})

// ---- bad-reaction and unbalanced-reaction -------------------------------------------------------
describe('bad-reaction', () => {
  it('electrons on the wrong side for the electrode, and no electrons at all, are errors', () => {
    const src = BASE.replace('handling vent: hydrogen to the hood', 'reaction cathode: ⟦Cu^2+ -> Cu + 2 e-⟧\nreaction anode: ⟦H2O -> H2O⟧\nhandling vent: hydrogen to the hood')
    at(src, 'bad-reaction', 'error')
  })

  it('is silent on a readable reaction with electrons where they belong', () => {
    silent(BASE.replace('handling vent: hydrogen to the hood', 'reaction anode: 2 H2O -> O2 + 4 H+ + 4 e-\nhandling vent: hydrogen to the hood'), 'bad-reaction')
  })
})

describe('unbalanced-reaction', () => {
  it('an unbalanced half-reaction is an error, with a fix that writes the balanced coefficients', () => {
    const line = (eq: string) => BASE.replace('handling vent: hydrogen to the hood', `reaction anode: ${eq}\nhandling vent: hydrogen to the hood`)
    const { text, ds } = at(line('⟦OH- -> O2 + H2O + e-⟧'), 'unbalanced-reaction', 'error')
    // 4 OH⁻ → O₂ + 2 H₂O + 4 e⁻ (standard textbook stoichiometry)
    fixClears(text, ds[0], line('4 OH- -> O2 + 2 H2O + 4 e-'))
  })

  it('is silent on a balanced reaction', () => {
    silent(BASE.replace('handling vent: hydrogen to the hood', 'reaction anode: 4 OH- -> O2 + 2 H2O + 4 e-\nhandling vent: hydrogen to the hood'), 'unbalanced-reaction')
  })
})

// ---- two-amounts -------------------------------------------------------------------------------
describe('two-amounts', () => {
  it('a mass and an amount that disagree are an error, with a fix that rewrites the second', () => {
    // K2CO3 138.2046 g/mol (IUPAC 2021): 100 g = 0.72357 mol; 1.5 mol is 107 % off
    const src = BASE.replace('K2CO3 100 g', 'K2CO3 100 g (⟦1.5 mol⟧)')
    const { text, ds } = at(src, 'two-amounts', 'error')
    fixClears(text, ds[0], BASE.replace('K2CO3 100 g', 'K2CO3 100 g (0.7236 mol)'))
  })

  it('is silent when the two agree to rounding, and on `2 * (3 g)`', () => {
    // 100 / 138.2046 = 0.72357 mol, written 0.724 mol (0.06 % apart)
    silent(BASE.replace('K2CO3 100 g', 'K2CO3 100 g (0.724 mol)'), 'two-amounts')
    silent(BASE.replace('K2CO3 100 g', 'K2CO3 2 * (50 g)'), 'two-amounts')
  })
})

// ---- beyond-solubility -------------------------------------------------------------------------
describe('beyond-solubility', () => {
  it('a salt beyond its solubility in the water charged is a warning on the charge line', () => {
    // NaCl at 20 °C: about 35.9 g per 100 g water (CRC Handbook, from memory): 1 L of water takes ~358 g
    const src = BASE.replace('conditions 25 degC', 'conditions 20 degC').replace('charge product: water 200 mL', '⟦charge product: NaCl 400 g, water 1 L⟧')
    const { ds } = at(src, 'beyond-solubility', 'warning')
    expect(ds[0].message).toMatch(/^4\d(\.\d)? g of the 400 g NaCl stays solid/)
  })

  it('is silent below the solubility', () => {
    silent(BASE.replace('charge product: water 200 mL', 'charge product: NaCl 300 g, water 1 L'), 'beyond-solubility')
  })
})

// ---- below-reversible --------------------------------------------------------------------------
describe('below-reversible', () => {
  it('a cell voltage below the reversible voltage is a warning on the voltage', () => {
    // water splitting needs at least 1.229 V (standard textbook value)
    const src = BASE.replace('step 1: current 2 A for 1 h', 'step 1: voltage ⟦1.1 V⟧, current 2 A for 1 h')
    at(src, 'below-reversible', 'warning')
  })

  it('is silent above it', () => {
    silent(BASE.replace('step 1: current 2 A for 1 h', 'step 1: voltage 2.2 V, current 2 A for 1 h'), 'below-reversible')
  })
})

// ---- noted-reason ------------------------------------------------------------------------------
describe('noted-reason', () => {
  it('a noted comment without a reason, or with an unknown code, is a warning', () => {
    const src = BASE.replace('step 1: current 2 A for 1 h', 'step 1: current 2 A for 1 h ⟦# noted beyond-faraday⟧').replace('handling vent: hydrogen to the hood', 'handling vent: hydrogen to the hood ⟦# noted no-such-rule: because⟧')
    at(src, 'noted-reason', 'warning')
  })

  it('a noted comment turns a finding on its line into information, keeps its caution, and names the reason', () => {
    const src = BASE.replace('expect KOH 3 g in product', 'expect KOH 50 g in product # noted beyond-faraday: product side pre-charged from batch 2')
    const a = an(src)
    const d = a.diagnostics.find((x) => x.code === 'beyond-faraday')!
    expect(d.severity).toBe('information')
    expect(d.noted).toBe('product side pre-charged from batch 2')
    expect(d.message).toContain('noted (product side pre-charged from batch 2)')
    silent(src, 'noted-reason')
  })

  it('severity settings change or drop a rule', () => {
    const src = BASE.replace('expect KOH 3 g in product', 'expect KOH 50 g in product')
    expect(analyze(src, { severities: { 'beyond-faraday': 'warning' } }).diagnostics.find((x) => x.code === 'beyond-faraday')!.severity).toBe('warning')
    expect(analyze(src, { severities: { 'beyond-faraday': 'off' } }).diagnostics.find((x) => x.code === 'beyond-faraday')).toBeUndefined()
  })
})

// ---- include-file ------------------------------------------------------------------------------
describe('include-file', () => {
  const files: Record<string, string> = { '/ws/house.cellrun': 'let area = 36 cm^2\n', '/ws/a.cellrun': 'include "b.cellrun"\n', '/ws/b.cellrun': 'include "a.cellrun"\n' }
  const includes = (file: string) => ({ file, root: '/ws', read: (p: string) => files[p] })

  it('without a workspace to read from, an include is a note', () => {
    at('include "⟦house.cellrun⟧"\n', 'include-file', 'information')
  })

  it('a path outside the workspace, a missing file and a cycle are errors on the include path', () => {
    const m = marked('include "⟦../etc/x.cellrun⟧"\ninclude "⟦nothere.cellrun⟧"\ninclude "⟦a.cellrun⟧"\n')
    const ds = analyze(m.text, { includes: includes('/ws/main.cellrun') }).diagnostics.filter((d) => d.code === 'include-file')
    expect(ds.map((d) => d.span)).toEqual(m.ranges)
    expect(ds.map((d) => d.severity)).toEqual(['error', 'error', 'error'])
    expect(ds[2].message).toContain('cycle')
    pinned.add('include-file')
  })

  it('is silent when the include resolves, and the included value is known', () => {
    const a = analyze('include "house.cellrun"\nlet j = 40 mA/cm^2 * area\n', { includes: includes('/ws/main.cellrun') })
    expect(a.diagnostics.map((d) => d.code)).toEqual([])
  })
})

// ---- beyond-faraday ----------------------------------------------------------------------------
describe('beyond-faraday', () => {
  const plating = (metal: string, salt: string, plan: string) =>
    [
      'cell',
      '  compartment bath 1 L',
      '  anode platinum in bath',
      '  cathode steel in bath',
      `charge bath: ${salt}, water 900 mL`,
      'step 1: current 1 A for 1 h',
      `expect ${metal} ${plan} in bath`,
      '',
    ].join('\n')

  it('a plan above the Faraday maximum is an error, with a fix that plans the maximum', () => {
    // Ni at 1 A·h: 3600 / 96485.33212 / 2 × 58.6934 g/mol = 1.09497 g (rounds down to 1.09 g)
    const src = plating('Ni', 'NiSO4 100 g', '⟦2 g⟧')
    const { text, ds } = at(src, 'beyond-faraday', 'error')
    fixClears(text, ds[0], plating('Ni', 'NiSO4 100 g', '1.09 g'))
  })

  it('the fix rounds the maximum down, so it clears the error when rounding up would not', () => {
    // Cu at 1 A·h makes 63.546 × 3600 / (2 × 96485.33212) = 1.18550 g: 3 significant figures
    // rounded to nearest would be 1.19 g (above the maximum); the fix writes 1.18 g.
    const src = plating('Cu', 'CuSO4 100 g', '⟦2 g⟧')
    const { text, ds } = at(src, 'beyond-faraday', 'error')
    fixClears(text, ds[0], plating('Cu', 'CuSO4 100 g', '1.18 g'))
  })

  it('a plan above what the feed holds is an error too', () => {
    // 1 g CuSO4 holds 1 / 159.61 g/mol = 0.006265 mol Cu = 0.398 g, below the 1.19 g Faraday limit
    const src = plating('Cu', 'CuSO4 1 g', '⟦1 g⟧')
    const { ds } = at(src, 'beyond-faraday', 'error')
    expect(ds[0].message).toContain('feed')
  })

  it('is silent at or below the maximum', () => {
    silent(BASE, 'beyond-faraday')
    silent(plating('Cu', 'CuSO4 100 g', '1.18 g'), 'beyond-faraday')
  })
})

// ---- efficiency-over-100 -----------------------------------------------------------------------
describe('efficiency-over-100', () => {
  it('a measured yield above the 100 % maximum is a warning', () => {
    // KOH at 2 A·h at most 4.187 g (see BASE); 5 g is about 119 %
    const src = BASE.replace('observe KOH 2.5 g', 'observe KOH ⟦5 g⟧')
    const { ds } = at(src, 'efficiency-over-100', 'warning')
    expect(ds[0].fixes).toEqual([])
  })

  it('is silent below 100 %', () => {
    silent(BASE, 'efficiency-over-100')
  })
})

// ---- the registry ------------------------------------------------------------------------------
const rulesDir = fileURLToPath(new URL('../server/src/rules/', import.meta.url))
const examplesDir = fileURLToPath(new URL('../examples/', import.meta.url))
const HELPERS = new Set(['index', 'rule', 'formula-issue', 'noted'])

describe('the rule registry', () => {
  it('every rule code is unique', () => {
    const codes = RULES.map((r) => r.code)
    expect(new Set(codes).size).toBe(codes.length)
  })

  it('there is one rule in RULES for every rule module, named by its code', () => {
    const modules = readdirSync(rulesDir)
      .filter((f) => f.endsWith('.ts'))
      .map((f) => f.slice(0, -3))
      .filter((f) => !HELPERS.has(f))
      .sort()
    // Hazard rules live in rules/safety/ (their own test files cover them).
    expect(RULES.filter((r) => r.category !== 'safety').map((r) => r.code).sort()).toEqual(modules)
  })

  it('the shipped examples have no errors (warnings allowed)', () => {
    const files = readdirSync(examplesDir).filter((f) => f.endsWith('.cellrun'))
    expect(files.length).toBeGreaterThan(0)
    for (const f of files) {
      const a = an(readFileSync(examplesDir + f, 'utf8'))
      expect(a.diagnostics.filter((d) => d.severity === 'error').map((d) => `${f}: [${d.code}] ${d.message}`)).toEqual([])
    }
  })

  it('a kitchen-sink document with many problems still only uses registered codes', () => {
    an(
      [
        'rn "x"',
        'conditions -5 degC',
        'let a = 1 A + 1 V',
        'let a = q',
        'compartment loose 1 L',
        'cell',
        '  compartment feed 700',
        '  separator cation-exchang between feed and prod',
        '  anode mmo in feed, area sin(1)',
        'charge feed: Xq 3 g, C02 1 g, Cu2+ 1 g, water 900 mL',
        'step 1: current 3 V for 1 h',
        'step 2: curent 1 A',
        'step 3: voltage 2 V for -1 h, efficiency 85',
        'expect Na 3 g in feed',
        'expect H2 900 L',
        'observe H2 500 g',
        'handling vnt: x',
        '',
      ].join('\n'),
    )
  })

  // Runs last (tests in a file run in order): checks over every analysis made above.
  it('every diagnostic emitted in this file belongs to a rule in RULES, and no rule crashed', () => {
    const codes = new Set(RULES.map((r) => r.code))
    expect(analyses.length).toBeGreaterThan(50)
    for (const a of analyses) {
      for (const d of a.diagnostics) {
        expect(codes.has(d.code), `unregistered code ${d.code}`).toBe(true)
        expect(d.message).not.toMatch(/internal (error|parser error)/)
      }
    }
  })

  it('every rule has a test above that pins its diagnostics with markers', () => {
    expect([...pinned].sort()).toEqual(RULES.filter((r) => r.category !== 'safety').map((r) => r.code).sort())
  })
})

describe('the quick check for an acknowledgement comment', () => {
  it('finds `#\\s*noted\\s` where the pattern does, in any text at any place', () => {
    // The oracle is the pattern itself, run at the place (sticky).
    const pattern = /#\s*noted\s/y
    const text = fc.array(fc.constantFrom('#', ' ', '\t', '\u00a0', '\u2003', 'noted', 'note', 'd', 'x', '\n', 'NOTED'), { maxLength: 8 }).map((p) => p.join(''))
    fc.assert(
      fc.property(text, fc.nat({ max: 10 }), (t, at) => {
        const i = Math.min(at, t.length)
        pattern.lastIndex = i
        expect(mayBeNoted(t, i), `${JSON.stringify(t)} at ${i}`).toBe(pattern.test(t))
      }),
      { numRuns: 4000, seed: 41 },
    )
  })
})
