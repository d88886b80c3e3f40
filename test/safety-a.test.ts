// Hazard rules, group A (server/src/rules/safety/group-a.ts): chlorine-handling, hydrogen-vent,
// mixed-gases, nitrogen-trichloride, chromium-anode. For each: it fires on a minimal protocol at the
// ⟦marked⟧ span with its severity, it stays silent when the hazard is handled or absent (and on the
// shipped examples, each case explained), its quick fix clears it, and its caution defers to local
// codes. A silent rule says nothing about safety; these tests only pin what the rules point at.
//
// Hand arithmetic used below (outside constants, not the code under test):
//   F = 96485.33212 C/mol (CODATA 2018, exact since SI 2019); R = 8.314462618 J/(mol·K) (CODATA 2018);
//   molar volume at 25 °C, 101.325 kPa: R × 298.15 K / 101325 Pa = 24.4654 L/mol;
//   Fe 55.845 g/mol, Na 22.990, Cl 35.45 (IUPAC 2021 standard atomic weights, from memory).
//   5 A for 1 h: 18000 C / F = 0.186556 mol e⁻.
import { readdirSync, readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import { analyze } from '../server/src/core/analyze'
import type { Diagnostic } from '../server/src/core/diagnostics'
import { RULES } from '../server/src/rules'
import { GROUP_A } from '../server/src/rules/safety/group-a'
import { chromiumRun } from '../server/src/rules/safety/chromium-anode'
import { nitrogenSource } from '../server/src/rules/safety/nitrogen-trichloride'
import { parseFormula } from '../server/src/core/formula'
import { marked } from './support/markers'
import { ruleTester } from './support/rule-tester'

// ---- helpers (as in test/rules.test.ts) --------------------------------------------------------

const tester = ruleTester()
const { at, silent } = tester
/** Apply the diagnostic's first fix; the result must equal `expected`; the code must be gone from the whole document. */
const fixClears = (text: string, d: Diagnostic, expected: string) => tester.fixClears(text, d, expected, { scope: 'document' })

const rule = (code: string) => RULES.find((r) => r.code === code)!

function cautionPresent(code: string, d: Diagnostic) {
  expect(d.caution, code).toBe(rule(code).caution)
  expect(d.caution).toMatch(/local codes/)
  expect(rule(code).category).toBe('safety')
  expect(rule(code).source).toBeTruthy()
}

const examplesDir = fileURLToPath(new URL('../examples/', import.meta.url))
const example = (name: string) => readFileSync(examplesDir + name, 'utf8')

const lines = (...xs: string[]) => xs.join('\n') + '\n'

// ---- the group ---------------------------------------------------------------------------------

describe('group A', () => {
  it('lists its rules in order, all hazard rules registered in RULES', () => {
    expect(GROUP_A.map((r) => r.code)).toEqual(['chlorine-handling', 'hydrogen-vent', 'mixed-gases', 'nitrogen-trichloride', 'chromium-anode'])
    for (const r of GROUP_A) {
      expect(RULES).toContain(r)
      expect(r.category).toBe('safety')
      expect(r.caution).toMatch(/local codes/)
      expect(r.caution).not.toMatch(/\bsafe\b|approved/i)
      expect(r.source).toBeTruthy()
      expect(r.details).toBeTruthy()
    }
  })

  it('the shipped examples are silent on every group-A rule (each case explained in the rule blocks)', () => {
    const files = readdirSync(examplesDir).filter((f) => f.endsWith('.cellrun'))
    expect(files.sort()).toEqual(['acid-copper-plating.cellrun', 'brine-chlorine.cellrun', 'koh-from-carbonate.cellrun'])
    for (const f of files) {
      for (const r of GROUP_A) silent(example(f), r.code)
    }
  })
})

// ---- chlorine-handling -------------------------------------------------------------------------

/** A membrane brine cell: chlorine at the anode, hydrogen vented. */
const BRINE = lines(
  'run "brine"',
  'cell',
  '  compartment anolyte 500 mL',
  '  compartment catholyte 500 mL',
  '  separator cation-exchange between anolyte and catholyte',
  '  ⟦anode mmo-titanium in anolyte, area 50 cm^2⟧',
  '  cathode nickel in catholyte, area 50 cm^2',
  'charge anolyte: NaCl 100 g, water 450 mL',
  'charge catholyte: NaOH 10 g, water 450 mL',
  'step 1: current 5 A for 1 h',
  'handling vent: hydrogen to the exhaust',
)
const unmark = (s: string) => marked(s).text

describe('chlorine-handling', () => {
  it('fires on the anode line of a brine cell, with the chlorine volume', () => {
    const { ds } = at(BRINE, 'chlorine-handling', 'warning')
    // Cl₂: 0.186556 mol e⁻ / 2 = 0.093278 mol (NaCl 100 g / 58.44 g/mol = 1.711 mol, not limiting)
    // × 24.4654 L/mol = 2.282 L.
    expect(ds[0].message).toContain('about 2.28 L Cl₂')
    expect(ds[0].message).toContain('25 °C, 101.3 kPa')
    cautionPresent('chlorine-handling', ds[0])
    expect(rule('chlorine-handling').source).toMatch(/IDLH 10 ppm.*NIOSH/)
  })

  it('fires where chloride is too dilute for the engine to choose chlorine, but meets an inert anode', () => {
    // NaCl 0.5 g / 58.44 g/mol = 0.00856 mol in 0.5 L = 0.017 mol/L, below the engine's 0.05 mol/L.
    const src = BRINE.replace('NaCl 100 g', 'Na2SO4 30 g, NaCl 0.5 g')
    const { ds, a } = at(src, 'chlorine-handling', 'warning')
    expect(a.model.engine?.anode?.kind).toBe('oxygen')
    expect(ds[0].message).toContain('NaCl charged where an inert mmo-titanium anode works')
    expect(ds[0].message).toContain('too dilute')
  })

  it('fires on a stated anode reaction that makes chlorine', () => {
    const src = BRINE.replace('NaCl 100 g', 'Na2SO4 30 g') + 'reaction anode: 2 Cl- -> Cl2 + 2 e-\n'
    const { ds } = at(src, 'chlorine-handling', 'warning')
    expect(ds[0].message).toContain('stated anode reaction')
    expect(ds[0].message).toContain('no chloride is charged')
  })

  it('is silent with a scrubber, a hood or a detector declared', () => {
    for (const kind of ['scrubber', 'hood', 'detector']) silent(unmark(BRINE) + `handling ${kind}: anode side\n`, 'chlorine-handling')
  })

  it('is silent without chloride, and at a soluble anode in chloride', () => {
    silent(unmark(BRINE).replace('NaCl 100 g', 'Na2SO4 30 g'), 'chlorine-handling')
    // A copper anode dissolves (engine: soluble anode) instead of oxidising chloride.
    silent(unmark(BRINE).replace('anode mmo-titanium', 'anode copper'), 'chlorine-handling')
  })

  it('is silent on the brine example because it declares a scrubber (the example does evolve chlorine)', () => {
    const text = example('brine-chlorine.cellrun')
    const a = silent(text, 'chlorine-handling')
    expect(a.model.engine?.anode?.kind).toBe('chlorine')
    expect(text).toMatch(/^handling scrubber:/m)
    // Without its scrubber line the rule fires there.
    const without = text.replace(/^handling scrubber:.*\n/m, '')
    expect(analyze(without).diagnostics.filter((d) => d.code === 'chlorine-handling')).toHaveLength(1)
  })

  it('its fix appends a scrubber line, which clears it', () => {
    const { text, ds } = at(BRINE, 'chlorine-handling', 'warning')
    expect(ds[0].fixes[0].title).toBe('Add `handling scrubber: anode off-gas through NaOH solution`')
    fixClears(text, ds[0], text + 'handling scrubber: anode off-gas through NaOH solution\n')
  })

  it('its fix adds a line break first when the text does not end with one', () => {
    const text = unmark(BRINE).trimEnd()
    const d = analyze(text).diagnostics.find((x) => x.code === 'chlorine-handling')!
    fixClears(text, d, text + '\nhandling scrubber: anode off-gas through NaOH solution\n')
  })
})

// ---- hydrogen-vent -----------------------------------------------------------------------------

/** Alkaline water electrolysis through a membrane, no handling declared. */
const WATER = lines(
  'run "alkaline water"',
  'cell',
  '  compartment anolyte 500 mL',
  '  compartment catholyte 500 mL',
  '  separator cation-exchange between anolyte and catholyte',
  '  anode nickel in anolyte, area 50 cm^2',
  '  ⟦cathode nickel in catholyte, area 50 cm^2⟧',
  'charge anolyte: KOH 50 g, water 450 mL',
  'charge catholyte: KOH 50 g, water 450 mL',
  'step 1: current 5 A for 1 h',
  'step 2: current 2 A for 1 h',
)

describe('hydrogen-vent', () => {
  it('fires on the cathode line, with the hydrogen volume and peak rate', () => {
    const { ds } = at(WATER, 'hydrogen-vent', 'warning')
    // H₂: (5 + 2) A × 3600 s = 25200 C / F = 0.261178 mol e⁻ / 2 = 0.130589 mol × 24.4654 L/mol = 3.195 L;
    // peak in step 1: 0.186556 / 2 = 0.093278 mol in 1 h × 24.4654 = 2.282 L/h.
    expect(ds[0].message).toContain('about 3.19 L H₂')
    expect(ds[0].message).toContain('up to 2.28 L/h')
    cautionPresent('hydrogen-vent', ds[0])
    // Flammable range, source named in the rule: NFPA 497 / IEC 60079-20-1 (from memory).
    expect(ds[0].caution).toMatch(/4 to 75 vol %/)
    expect(rule('hydrogen-vent').source).toMatch(/4-75 vol % in air: NFPA 497 \/ IEC 60079-20-1/)
  })

  it('is silent with a vent or a hood declared', () => {
    silent(unmark(WATER) + 'handling vent: to the roof\n', 'hydrogen-vent')
    silent(unmark(WATER) + 'handling hood: cell in the fume hood\n', 'hydrogen-vent')
  })

  it('is silent when no hydrogen forms (a metal deposited at 100 %)', () => {
    const plating = lines(
      'cell',
      '  compartment bath 1 L',
      '  anode copper in bath, area 50 cm^2',
      '  cathode copper in bath, area 50 cm^2',
      'charge bath: CuSO4 100 g, water 900 mL',
      'step 1: current 1 A for 1 h',
    )
    silent(plating, 'hydrogen-vent')
  })

  it('is silent on the examples: each makes hydrogen and declares a vent or a hood', () => {
    for (const f of ['acid-copper-plating.cellrun', 'brine-chlorine.cellrun', 'koh-from-carbonate.cellrun']) {
      const a = silent(example(f), 'hydrogen-vent')
      // The copper bath too: its plating step runs at 97 %, the rest evolves hydrogen; it has `handling hood`.
      expect(a.model.engine?.totals.some((p) => p.formula === 'H2' && p.mol > 0), f).toBe(true)
      expect(a.model.handling.some((h) => h.type.text === 'vent' || h.type.text === 'hood'), f).toBe(true)
    }
  })

  it('its fix appends a vent line, which clears it', () => {
    const { text, ds } = at(WATER, 'hydrogen-vent', 'warning')
    fixClears(text, ds[0], text + 'handling vent: hydrogen led outdoors away from ignition sources\n')
  })
})

// ---- mixed-gases -------------------------------------------------------------------------------

/** Water electrolysis in one compartment: hydrogen and oxygen in one headspace. */
const UNDIVIDED = lines(
  'run "undivided"',
  '⟦cell⟧',
  '  compartment bath 1 L',
  '  anode platinum in bath, area 50 cm^2',
  '  cathode platinum in bath, area 50 cm^2',
  'charge bath: Na2SO4 50 g, water 900 mL',
  'step 1: current 5 A for 1 h',
  'handling vent: to the exhaust',
)

const TWO = (separator: string) =>
  lines(
    'cell',
    '  compartment anolyte 500 mL',
    '  compartment catholyte 500 mL',
    separator,
    '  anode nickel in anolyte, area 50 cm^2',
    '  cathode nickel in catholyte, area 50 cm^2',
    'charge anolyte: KOH 50 g, water 450 mL',
    'charge catholyte: KOH 50 g, water 450 mL',
    'step 1: current 5 A for 1 h',
    'handling vent: to the exhaust',
  )

describe('mixed-gases', () => {
  it('is a warning on the cell line when the electrodes share a compartment, with the gas share', () => {
    const { ds } = at(UNDIVIDED, 'mixed-gases', 'warning')
    // H₂ 0.186556 / 2 × 24.4654 = 2.282 L; O₂ 0.186556 / 4 × 24.4654 = 1.141 L; H₂ share 2/3 = 66.7 vol %.
    expect(ds[0].message).toContain('share compartment bath')
    expect(ds[0].message).toContain('2.28 L H₂, 1.14 L O₂')
    expect(ds[0].message).toContain('66.7 vol %')
    expect(ds[0].fixes).toEqual([])
    cautionPresent('mixed-gases', ds[0])
  })

  it('is a warning on a separator of kind none', () => {
    const { ds } = at(TWO('  ⟦separator none between anolyte and catholyte⟧'), 'mixed-gases', 'warning')
    expect(ds[0].message).toContain('is `none`')
  })

  it('is a warning on the cell line when no separator joins the two compartments', () => {
    const src = TWO('  compartment spare 100 mL').replace(/^cell$/m, '⟦cell⟧')
    const { ds } = at(src, 'mixed-gases', 'warning')
    expect(ds[0].message).toContain('no separator is declared between anolyte and catholyte')
  })

  it('is a warning on a diaphragm', () => {
    const { ds } = at(TWO('  ⟦separator diaphragm between anolyte and catholyte⟧'), 'mixed-gases', 'warning')
    expect(ds[0].message).toContain('porous')
  })

  it('names chlorine when an undivided chloride cell makes it', () => {
    const src = UNDIVIDED.replace('Na2SO4 50 g', 'NaCl 50 g')
    const { ds } = at(src, 'mixed-gases', 'warning')
    expect(ds[0].message).toContain('hydrogen and chlorine')
  })

  it('is silent through an ion-exchange membrane, and with a soluble anode (no anode gas)', () => {
    silent(TWO('  separator cation-exchange between anolyte and catholyte'), 'mixed-gases')
    silent(TWO('  separator anion-exchange between anolyte and catholyte'), 'mixed-gases')
    // Acid copper plating: the copper anode dissolves, so only a little hydrogen comes off.
    silent(example('acid-copper-plating.cellrun'), 'mixed-gases')
    // The brine and KOH examples run through cation-exchange membranes.
    silent(example('brine-chlorine.cellrun'), 'mixed-gases')
    silent(example('koh-from-carbonate.cellrun'), 'mixed-gases')
  })

  it('is silent until a step passes charge (no gas comes off yet)', () => {
    silent(UNDIVIDED.replace('⟦cell⟧', 'cell').replace('step 1: current 5 A for 1 h\n', ''), 'mixed-gases')
  })

  it('has no quick fix; dividing the cell (as its details say) clears it', () => {
    expect(rule('mixed-gases').details).toMatch(/Divide the cell/)
    expect(rule('mixed-gases').details).toMatch(/off-gases apart/)
    silent(TWO('  separator cation-exchange between anolyte and catholyte'), 'mixed-gases')
  })
})

// ---- nitrogen-trichloride ----------------------------------------------------------------------

describe('nitrogen-trichloride', () => {
  it('is an error on each ammonium salt, ammonia, amine or urea charged where chlorine forms', () => {
    const src = lines(
      'cell',
      '  compartment bath 1 L',
      '  anode platinum in bath, area 50 cm^2',
      '  cathode nickel in bath, area 50 cm^2',
      'charge bath: NaCl 50 g, ⟦NH4Cl⟧ 2 g, ⟦CO(NH2)2⟧ 1 g, ⟦CH3NH2⟧ 1 g, ⟦NH3⟧ 0.1 mol, ⟦(NH4)2SO4⟧ 1 g, KNO3 1 g, Na2CO3 1 g, water 900 mL',
      'step 1: current 2 A for 1 h',
      'handling vent: to the exhaust',
      'handling scrubber: caustic',
    )
    const { ds } = at(src, 'nitrogen-trichloride', 'error')
    expect(ds.map((d) => d.message.split(' is charged')[0])).toEqual([
      'NH₄Cl (an ammonium salt)',
      'CO(NH₂)₂ (urea)',
      'CH₃NH₂ (an amine)',
      'NH₃ (ammonia)',
      '(NH₄)₂SO₄ (an ammonium salt)',
    ])
    expect(ds[0].message).toContain('NCl₃')
    expect(ds[0].fixes).toEqual([])
    cautionPresent('nitrogen-trichloride', ds[0])
  })

  it('fires with ammonium chloride alone as the chloride (ammonium chloride is itself a chloride)', () => {
    const src = lines(
      'cell',
      '  compartment bath 1 L',
      '  anode graphite in bath, area 50 cm^2',
      '  cathode nickel in bath, area 50 cm^2',
      'charge bath: ⟦NH4Cl⟧ 50 g, water 900 mL',
      'step 1: current 2 A for 1 h',
    )
    at(src, 'nitrogen-trichloride', 'error')
  })

  it('fires in the anolyte of a membrane cell (urea in brine)', () => {
    const src = unmark(BRINE).replace('NaCl 100 g', 'NaCl 100 g, ⟦CH4N2O⟧ 1 g')
    at(src, 'nitrogen-trichloride', 'error')
  })

  it('is silent when the nitrogen compound is kept from the chlorine', () => {
    // In the catholyte, behind a cation-exchange membrane.
    silent(unmark(BRINE).replace('NaOH 10 g', 'NaOH 10 g, NH4Cl 1 g'), 'nitrogen-trichloride')
    // No chloride: a sulfate bath with ammonium sulfate.
    silent(unmark(BRINE).replace('NaCl 100 g', 'Na2SO4 30 g, (NH4)2SO4 5 g'), 'nitrogen-trichloride')
    // A soluble copper anode in an ammoniacal chloride bath dissolves instead of making chlorine.
    const copper = lines(
      'cell',
      '  compartment bath 1 L',
      '  anode copper in bath, area 50 cm^2',
      '  cathode copper in bath, area 50 cm^2',
      'charge bath: CuCl2 20 g, NH4Cl 50 g, water 900 mL',
      'step 1: current 1 A for 1 h',
    )
    silent(copper, 'nitrogen-trichloride')
    // Cyanides, nitrates and carbonates are not counted as amines.
    for (const f of ['NaCN', 'K4Fe(CN)6', 'KNO3', 'Na2CO3', 'NaSCN']) expect(nitrogenSource(parseFormula(f), f), f).toBeUndefined()
    expect(nitrogenSource(parseFormula('(CH3)4NCl'), '(CH3)4NCl')).toBe('an amine')
  })

  it('is silent on the examples (none charges a nitrogen compound)', () => {
    for (const f of ['acid-copper-plating.cellrun', 'brine-chlorine.cellrun', 'koh-from-carbonate.cellrun']) silent(example(f), 'nitrogen-trichloride')
  })

  it('has no quick fix; taking the nitrogen compound out clears it', () => {
    const src = unmark(BRINE).replace('NaCl 100 g', 'NaCl 100 g, NH4Cl 1 g')
    expect(analyze(src).diagnostics.filter((d) => d.code === 'nitrogen-trichloride').map((d) => d.fixes)).toEqual([[]])
    silent(src.replace(', NH4Cl 1 g', ''), 'nitrogen-trichloride')
  })
})

// ---- chromium-anode ----------------------------------------------------------------------------

describe('chromium-anode', () => {
  it('is an error on the material words of a stainless anode in brine; the fix uses mmo-titanium', () => {
    const src = unmark(BRINE)
      .replace('anode mmo-titanium in anolyte', 'anode ⟦stainless steel⟧ mesh in anolyte')
      .concat('handling scrubber: caustic\n')
    const { text, ds } = at(src, 'chromium-anode', 'error')
    expect(ds[0].fixes[0].title).toBe('Change the anode material to mmo-titanium')
    fixClears(text, ds[0], text.replace('stainless steel mesh', 'mmo-titanium mesh'))
  })

  it('gives the dissolved steel and its chromium where the engine has the stainless anode pitting in chloride', () => {
    const src = unmark(BRINE).replace('anode mmo-titanium in anolyte', 'anode ⟦stainless-steel⟧ in anolyte')
    const { text, ds, a } = at(src, 'chromium-anode', 'error')
    expect(a.model.engine?.anode?.kind).toBe('dissolution')
    // Stainless in chloride pits (engine: dissolution as Fe²⁺): 0.186556 mol e⁻ / 2 = 0.093278 mol
    // × 55.845 g/mol = 5.209 g; at 18 % Cr (type 304: 18-20 wt %, ASTM A240, from memory) 0.938 g.
    // Anode current density: 5 A / 50 cm² = 100 mA/cm².
    expect(ds[0].message).toContain('about 5.21 g of the anode dissolving')
    expect(ds[0].message).toContain('0.938 g chromium')
    expect(ds[0].message).toContain('up to 100 mA/cm²')
    cautionPresent('chromium-anode', ds[0])
    expect(rule('chromium-anode').source).toMatch(/IARC/)
    fixClears(text, ds[0], text.replace('stainless-steel', 'mmo-titanium'))
  })

  it('in a neutral sulfate anolyte the fix uses platinized titanium', () => {
    const src = unmark(BRINE).replace('NaCl 100 g', 'Na2SO4 30 g').replace('anode mmo-titanium', 'anode ⟦ss316l⟧')
    const { text, ds } = at(src, 'chromium-anode', 'error')
    fixClears(text, ds[0], text.replace('ss316l', 'platinized-titanium'))
  })

  it('in an alkaline anolyte the fix uses nickel', () => {
    const src = WATER.replace('⟦cathode', 'cathode').replace('⟧', '').replace('anode nickel', 'anode ⟦inconel-625⟧')
    const { text, ds } = at(src, 'chromium-anode', 'error')
    fixClears(text, ds[0], text.replace('inconel-625', 'nickel'))
  })

  it('recognises the usual chromium-bearing names, and not plain steels or inert anodes', () => {
    const hit = (m: string) => {
      const r = chromiumRun(m)
      return r && m.slice(r.start, r.end)
    }
    expect(hit('stainless-steel')).toBe('stainless-steel')
    expect(hit('304')).toBe('304')
    expect(hit('aisi-316L plate')).toBe('aisi-316L')
    expect(hit('ss 316 mesh')).toBe('ss 316')
    expect(hit('chrome-plated copper')).toBe('chrome-plated')
    for (const m of ['nichrome', 'Hastelloy-C276', 'ferrochrome', 'chromium', 'SUS304', 'stainless steel 316L']) expect(hit(m), m).toBeTruthy()
    for (const m of ['steel', 'mild-steel', 'carbon-steel', 'aisi-1018', 'platinum mesh', 'mmo-titanium', 'nickel', 'graphite', 'platinized-titanium']) {
      expect(hit(m), m).toBeUndefined()
    }
  })

  it('is silent for a stainless cathode and for inert anodes, and on the examples', () => {
    silent(unmark(WATER).replace('cathode nickel', 'cathode stainless-steel'), 'chromium-anode')
    silent(unmark(BRINE), 'chromium-anode')
    // The examples use mmo-titanium and copper anodes.
    for (const f of ['acid-copper-plating.cellrun', 'brine-chlorine.cellrun', 'koh-from-carbonate.cellrun']) silent(example(f), 'chromium-anode')
  })
})

// ---- noted -------------------------------------------------------------------------------------

describe('a `# noted CODE: reason` comment on the finding line', () => {
  it('turns the finding into information and keeps the caution', () => {
    const src = BRINE.replace('area 50 cm^2⟧', 'area 50 cm^2⟧ # noted chlorine-handling: off-gas goes to the building scrubber')
    const { ds } = at(src, 'chlorine-handling', 'information')
    expect(ds[0].noted).toBe('off-gas goes to the building scrubber')
    expect(ds[0].message).toMatch(/^noted \(off-gas goes to the building scrubber\): chlorine evolves/)
    expect(ds[0].caution).toBe(rule('chlorine-handling').caution)
    expect(ds[0].caution).toMatch(/local codes/)
  })

  it('works for an error rule too (mixed-gases on the cell line)', () => {
    const src = UNDIVIDED.replace('⟦cell⟧', '⟦cell⟧ # noted mixed-gases: purged with nitrogen far below the lower limit')
    const { ds } = at(src, 'mixed-gases', 'information')
    expect(ds[0].caution).toMatch(/local codes/)
    expect(analyze(marked(src).text).diagnostics.filter((d) => d.code === 'noted-reason')).toEqual([])
  })
})
