// Hazard rules, group b: caustic-in-glass, crystallising-product, acid-through-cation-membrane,
// undivided-chloride, acidified-feed. For each: it fires on a minimal protocol (code, severity and
// the exact ⟦marked⟧ span), stays silent when the hazard is handled and on the shipped examples,
// its quick fix (where it has one) applied and re-analysed clears it, and its caution defers to
// local codes. Then one test that `# noted CODE: reason` makes a finding information.
//
// Figures checked here are hand arithmetic from outside constants, named beside them:
// atomic weights IUPAC 2021 (from memory): H 1.008, Li 6.94, C 12.011, N 14.007, O 15.999,
// Na 22.990, S 32.06, Cl 35.45, K 39.098; R = 8.314462618 J/(mol·K) (SI 2019, exact);
// water 0.99820 g/mL at 20 °C (CRC Handbook, from memory);
// limiting ionic conductivities H⁺ 349.65, Na⁺ 50.08 S·cm²/mol (CRC Handbook, from memory).
import { readdirSync, readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import { analyze } from '../server/src/core/analyze'
import { RULES } from '../server/src/rules'
import { GROUP_B } from '../server/src/rules/safety/group-b'
import { marked } from './support/markers'
import { ruleTester } from './support/rule-tester'

// ---- helpers (as in rules.test.ts) ---------------------------------------------------------------

const { at, silent, fixClears, applyFix } = ruleTester()

const lines = (...xs: string[]) => [...xs, ''].join('\n')
const rule = (code: string) => GROUP_B.find((r) => r.code === code)!

const examplesDir = fileURLToPath(new URL('../examples/', import.meta.url))
const EXAMPLES = readdirSync(examplesDir)
  .filter((f) => f.endsWith('.cellrun'))
  .map((f) => ({ name: f, text: readFileSync(examplesDir + f, 'utf8') }))

/** The rule is silent on all three shipped examples (none has this hazard; see each block). */
function silentOnExamples(code: string) {
  expect(EXAMPLES.length).toBe(3)
  for (const e of EXAMPLES) {
    const ds = analyze(e.text).diagnostics.filter((d) => d.code === code)
    expect(ds.map((d) => `${e.name}: ${d.message}`)).toEqual([])
  }
}

/** Every rule of the group: registered, safety, a caution deferring to local codes, a source, details. */
describe('group b registration', () => {
  it('lists the five rules, in order, each registered once in RULES', () => {
    expect(GROUP_B.map((r) => r.code)).toEqual(['caustic-in-glass', 'crystallising-product', 'acid-through-cation-membrane', 'undivided-chloride', 'acidified-feed'])
    for (const r of GROUP_B) expect(RULES.filter((x) => x.code === r.code)).toHaveLength(1)
  })

  it.each(GROUP_B.map((r) => [r.code, r] as const))('%s: safety category, summary, details and source', (_code, r) => {
    expect(r.category).toBe('safety')
    expect(r.summary.length).toBeGreaterThan(20)
    expect(r.details?.length ?? 0).toBeGreaterThan(50)
    expect(r.source?.length ?? 0).toBeGreaterThan(20)
    expect(r.caution).toMatch(/local codes/)
  })
})

// ---- caustic-in-glass --------------------------------------------------------------------------
// Alkaline water electrolysis in a glass beaker. KOH 100 g in 300 mL water: 300 × 0.99820 = 299.46 g
// water, 100 / 399.46 = 25.0 wt% KOH (hand arithmetic), above the rule's 20 wt%; 60 °C stated.
const GLASS_HOT = lines(
  'run "alkaline water in glass"',
  'conditions 60 degC',
  'cell',
  '  vessel ⟦borosilicate glass⟧',
  '  compartment bath 500 mL',
  '  anode nickel in bath',
  '  cathode nickel in bath',
  'charge bath: KOH 100 g, water 300 mL',
  'step 1: current 2 A for 1 h',
)
// Salt splitting in a glass H-cell: no hydroxide charged; the run forms NaOH in product.
const GLASS_SPLIT = lines(
  'run "split in glass"',
  'cell',
  '  vessel ⟦glass⟧',
  '  compartment feed 500 mL',
  '  compartment product 250 mL',
  '  separator cation-exchange between feed and product',
  '  anode platinum in feed',
  '  cathode nickel in product',
  'charge feed: Na2SO4 50 g, water 400 mL',
  'charge product: water 200 mL',
  'step 1: current 2 A for 1 h',
)

describe('caustic-in-glass', () => {
  const r = rule('caustic-in-glass')

  it('hot (60 °C) and strong (25 wt% KOH) caustic in borosilicate glass: an error on the material', () => {
    const { ds } = at(GLASS_HOT, 'caustic-in-glass', 'error')
    expect(ds[0].message).toMatch(/KOH/)
    expect(ds[0].message).toMatch(/60 °C/)
    expect(ds[0].caution).toBe(r.caution)
    expect(ds[0].caution).toMatch(/local codes/)
  })

  it('the same solution at 25 °C: a warning', () => {
    at(GLASS_HOT.replace('conditions 60 degC', 'conditions 25 degC'), 'caustic-in-glass', 'warning')
  })

  it('hot but dilute (KOH 5 g in 300 mL, 1.6 wt% by hand): a warning', () => {
    // 5 / (5 + 299.46) = 1.64 wt%
    at(GLASS_HOT.replace('KOH 100 g', 'KOH 5 g'), 'caustic-in-glass', 'warning')
  })

  it('hydroxide formed by the run (NaOH from sodium sulfate), none charged: a warning', () => {
    const { ds } = at(GLASS_SPLIT, 'caustic-in-glass', 'warning')
    expect(ds[0].message).toMatch(/NaOH in product \(formed/)
  })

  it('the quick fix changes the vessel to polypropylene, which clears it', () => {
    const { text, ds } = at(GLASS_HOT, 'caustic-in-glass', 'error')
    fixClears(text, ds[0], text.replace('vessel borosilicate glass', 'vessel polypropylene'))
  })

  it('is silent for plastics (including glass-filled ones), for glass without hydroxide, and without a vessel line', () => {
    const plain = marked(GLASS_HOT).text
    silent(plain.replace('borosilicate glass', 'ptfe'), 'caustic-in-glass')
    silent(plain.replace('borosilicate glass', 'glass-filled polypropylene'), 'caustic-in-glass')
    silent(plain.replace('  vessel borosilicate glass\n', ''), 'caustic-in-glass')
    // Acid copper sulfate in glass: no hydroxide anywhere.
    silent(
      lines(
        'run "copper in a beaker"',
        'cell',
        '  vessel pyrex',
        '  compartment bath 1 L',
        '  anode copper in bath',
        '  cathode copper in bath',
        'charge bath: CuSO4·5H2O 200 g, H2SO4 50 g, water 900 mL',
        'step 1: current 1 A for 1 h',
      ),
      'caustic-in-glass',
    )
  })

  it('is silent on the shipped examples (polypropylene and PVDF vessels)', () => {
    silentOnExamples('caustic-in-glass')
  })
})

// ---- crystallising-product ---------------------------------------------------------------------
// Lithium hydroxide from lithium chloride into a small catholyte: LiOH dissolves only about 12.8 g per
// 100 g water at 20 °C (Perry's, from memory), so it crystallises before the end of the 4 h run.
const LIOH = lines(
  'run "LiOH"',
  'cell',
  '  vessel polypropylene',
  '  compartment feed 500 mL',
  '  compartment product 100 mL',
  '  separator cation-exchange between feed and product',
  '  anode platinum in feed',
  '  cathode nickel in product',
  'charge feed: LiCl 100 g, water 400 mL',
  'charge product: water 80 mL',
  '⟦step 1: current 5 A for 4 h⟧',
  'handling scrubber: anolyte gas through caustic to the hood',
  'handling vent: catholyte hydrogen to the exhaust',
)

describe('crystallising-product', () => {
  const r = rule('crystallising-product')

  it('LiOH crystallising in the catholyte: a warning on the step line, naming salt, compartment and time', () => {
    const { ds } = at(LIOH, 'crystallising-product', 'warning')
    const d = ds[0]
    expect(d.message).toMatch(/^LiOH reaches saturation in product/)
    // The time is within the run: after 0 and before the end of the 4 h step.
    const m = /after ([\d.]+) (h|min|s) of the run/.exec(d.message)
    expect(m).not.toBeNull()
    const hours = Number(m![1]) / (m![2] === 'h' ? 1 : m![2] === 'min' ? 60 : 3600)
    expect(hours).toBeGreaterThan(0)
    expect(hours).toBeLessThan(4)
    expect(d.fixes).toEqual([])
    expect(d.caution).toMatch(/local codes/)
    expect(r.details).toMatch(/[Dd]ilute/)
  })

  it('is silent when the catholyte is diluted, or the run stops earlier', () => {
    const plain = marked(LIOH).text
    // 80 mL → 400 mL water in a 500 mL catholyte: at most 0.75 mol LiOH = 18 g over the 4 h
    // (5 A × 4 h = 72 000 C / 96 485 C/mol = 0.746 mol e⁻), below 12.8 g/100 g × 400 g = 51 g.
    silent(plain.replace('compartment product 100 mL', 'compartment product 500 mL').replace('water 80 mL', 'water 400 mL'), 'crystallising-product')
    // 1 h: at most 0.187 mol = 4.5 g LiOH, with about 80 g of water or more: below 12.8 g/100 g.
    silent(plain.replace('for 4 h', 'for 1 h'), 'crystallising-product')
  })

  it('is silent on the shipped examples (their simulations report no crystallising salt)', () => {
    silentOnExamples('crystallising-product')
  })
})

// ---- acid-through-cation-membrane --------------------------------------------------------------
// Two-compartment salt splitting: sodium sulfate feed, platinum anode; the acid stays on the anode side.
const SPLIT = [
  'run "split"',
  'cell',
  '  vessel polypropylene',
  '  compartment feed 500 mL',
  '  compartment product 250 mL',
  '  separator CATION between feed and product',
  '  anode platinum in feed',
  '  cathode nickel in product',
  'charge feed: Na2SO4 50 g, water 400 mL',
  'charge product: water 200 mL',
  'step 1: current 2 A for 1 h',
  'step 2: current 2 A for 3 h',
  'handling vent: hydrogen and oxygen to the exhaust',
]
const SPLIT_ACID = lines(...SPLIT, 'expect H2SO4 10 g in feed').replace('CATION', '⟦cation-exchange⟧')
const SPLIT_BASE = lines(...SPLIT, 'expect NaOH 5 g in product').replace('CATION', '⟦cation-exchange⟧')

describe('acid-through-cation-membrane', () => {
  const r = rule('acid-through-cation-membrane')

  it('an acid planned on the anode side of a cation-exchange separator: a warning on the separator kind, with the anion-exchange fix', () => {
    const { text, ds } = at(SPLIT_ACID, 'acid-through-cation-membrane', 'warning')
    // λ(H⁺)/λ(Na⁺) = 349.65 / 50.08 = 6.98, shown as "about 7×" (CRC, from memory; hand arithmetic)
    expect(ds[0].message).toMatch(/H₂SO₄ is planned in feed/)
    expect(ds[0].message).toMatch(/about 7× as mobile as Na⁺/)
    expect(ds[0].caution).toMatch(/local codes/)
    const after = fixClears(text, ds[0], text.replace('separator cation-exchange', 'separator anion-exchange'))
    expect(after.diagnostics.filter((d) => d.code === 'acid-through-cation-membrane')).toEqual([])
  })

  it('NaOH planned, but the simulated anolyte falls below pH 2 while the efficiency falls: a warning without a fix', () => {
    const { ds } = at(SPLIT_BASE, 'acid-through-cation-membrane', 'warning')
    expect(ds[0].message).toMatch(/falls below pH 2/)
    expect(ds[0].message).toMatch(/efficiency falls from [\d.]+ % to [\d.]+ %/)
    // Only when the acid is the product is an anion-exchange separator the remedy.
    expect(ds[0].fixes).toEqual([])
    expect(r.source).toMatch(/349\.65/)
  })

  it('is silent with an anion-exchange separator, and with a carbonate feed that keeps the anolyte buffered', () => {
    silent(marked(SPLIT_ACID).text.replace('cation-exchange', 'anion-exchange'), 'acid-through-cation-membrane')
    // K2CO3 100 g = 0.724 mol CO₃²⁻ takes up 2 A·h = 0.0746 mol H⁺ (7200 C / 96 485 C/mol) as bicarbonate.
    silent(
      lines(
        'run "carbonate"',
        'cell',
        '  vessel polypropylene',
        '  compartment feed 500 mL',
        '  compartment product 250 mL',
        '  separator cation-exchange between feed and product',
        '  anode platinum in feed',
        '  cathode nickel in product',
        'charge feed: K2CO3 100 g, water 400 mL',
        'charge product: water 200 mL',
        'step 1: current 2 A for 1 h',
        'expect KOH 3 g in product',
      ),
      'acid-through-cation-membrane',
    )
  })

  it('is silent on the shipped examples (the brine anolyte stays near neutral in the model, the carbonate feed is buffered, the plating bath has no separator)', () => {
    silentOnExamples('acid-through-cation-membrane')
  })
})

// ---- undivided-chloride ------------------------------------------------------------------------
const HYPO = [
  'run "hypochlorite"',
  'conditions 25 degC',
  '⟦cell⟧',
  '  vessel polypropylene',
  '  compartment bath 1 L',
  '  anode mmo-titanium in bath',
  '  cathode titanium in bath',
  'charge bath: NaCl 30 g, water 900 mL',
  'step 1: current 5 A for 1 h',
  'handling hood: the cell runs in the fume hood',
]

describe('undivided-chloride', () => {
  const r = rule('undivided-chloride')

  it('a cool undivided brine cell: a warning on the cell line (hypochlorite), no fix', () => {
    const { ds } = at(lines(...HYPO), 'undivided-chloride', 'warning')
    expect(ds[0].message).toMatch(/hypochlorite/)
    expect(ds[0].fixes).toEqual([])
    expect(ds[0].caution).toMatch(/local codes/)
  })

  it('warm (45 °C) with sugar charged: chlorate forms with an organic, an error on the sugar', () => {
    const src = lines(...HYPO)
      .replace('conditions 25 degC', 'conditions 45 degC')
      .replace('water 900 mL', 'water 900 mL, ⟦C12H22O11 5 g⟧')
    const { ds } = at(src, 'undivided-chloride', ['warning', 'error'])
    expect(ds[0].message).toMatch(/chlorate/)
    expect(ds[0].message).toMatch(/45 °C/)
    expect(ds[1].message).toMatch(/organic/)
  })

  it('cool with an organic: a warning on it; warm with ammonium: an error on it', () => {
    at(lines(...HYPO).replace('water 900 mL', 'water 900 mL, ⟦CH3COONa 5 g⟧'), 'undivided-chloride', ['warning', 'warning'])
    at(
      lines(...HYPO)
        .replace('conditions 25 degC', 'conditions 50 degC')
        .replace('water 900 mL', 'water 900 mL, ⟦NH4Cl 1 g⟧'),
      'undivided-chloride',
      ['warning', 'error'],
    )
  })

  it('names acid and reducing agents charged into the shared solution', () => {
    const { ds } = at(lines(...HYPO).replace('water 900 mL', 'water 900 mL, H2SO4 1 g, Na2SO3 1 g'), 'undivided-chloride', 'warning')
    expect(ds[0].message).toMatch(/with acid charged \(H₂SO₄\): the chlorine from the anode comes off as gas while the acid lasts/)
    expect(ds[0].message).toMatch(/reducing agents charged \(Na₂SO₃\)/)
  })

  it('ammonium chloride alone counts as the chloride (the engine does not split NH₄Cl into ions): it fires, an error on NH₄Cl when warm', () => {
    // NH4Cl 50 g / 53.49 g/mol = 0.935 mol in 1 L: far above the engine's 0.05 mol/L chloride for chlorine.
    const nh4 = lines(...HYPO).replace('NaCl 30 g', 'NH4Cl 50 g')
    const { ds } = at(nh4, 'undivided-chloride', 'warning')
    expect(ds[0].message).toMatch(/ammonium charged \(NH₄Cl\) forms explosive nitrogen trichloride/)
    at(nh4.replace('conditions 25 degC', 'conditions 45 degC').replace('NH4Cl 50 g', '⟦NH4Cl 50 g⟧'), 'undivided-chloride', ['warning', 'error'])
  })

  it('is silent when the cell is divided by a membrane, and when the anode evolves oxygen', () => {
    silent(
      lines(
        'run "divided"',
        'cell',
        '  vessel polypropylene',
        '  compartment anolyte 500 mL',
        '  compartment catholyte 500 mL',
        '  separator cation-exchange between anolyte and catholyte',
        '  anode mmo-titanium in anolyte',
        '  cathode nickel in catholyte',
        'charge anolyte: NaCl 100 g, water 450 mL',
        'charge catholyte: NaOH 10 g, water 450 mL',
        'step 1: current 5 A for 1 h',
      ),
      'undivided-chloride',
    )
    // Sodium sulfate, no chloride: the anode evolves oxygen.
    silent(marked(lines(...HYPO)).text.replace('NaCl 30 g', 'Na2SO4 30 g'), 'undivided-chloride')
    expect(r.severity).toBe('warning')
  })

  it('is silent on the shipped examples (the brine cell is divided by a membrane; the others hold no chloride)', () => {
    silentOnExamples('undivided-chloride')
  })
})

// ---- acidified-feed ----------------------------------------------------------------------------
// K2CO3 10 g = 10 / 138.205 = 0.07236 mol (K₂CO₃: 2 × 39.098 + 12.011 + 3 × 15.999 = 138.205 g/mol).
// 2 A × 2 h = 14 400 C / 96 485.33 C/mol = 0.1492 mol H⁺ made at the anode, all staying in the feed
// as K⁺ leaves: more than the 2 × 0.07236 = 0.1447 mol that turns all the carbonate to CO₂.
// V = nRT/p = 0.07236 × 8.314462618 × 298.15 / 101 325 = 1.770 L (hand arithmetic).
const CO2_FEED = lines(
  'run "carbonate runs out"',
  'cell',
  '  vessel polypropylene',
  '  compartment feed 500 mL',
  '  compartment product 250 mL',
  '  separator cation-exchange between feed and product',
  '  anode platinum in feed',
  '  cathode nickel in product',
  'charge feed: ⟦K2CO3 10 g⟧, water 400 mL',
  'charge product: water 200 mL',
  'step 1: current 2 A for 2 h',
)

describe('acidified-feed', () => {
  const r = rule('acidified-feed')

  it('a carbonate feed acidified by the anode: a warning on the carbonate, with the CO₂ volume', () => {
    const { ds } = at(CO2_FEED, 'acidified-feed', 'warning')
    expect(ds[0].message).toMatch(/about 1\.77 L CO₂/)
    expect(ds[0].caution).toMatch(/local codes/)
  })

  it('the quick fix appends a vent line; re-analysed, the warning is gone and an information note with the volume stays', () => {
    const { text, ds } = at(CO2_FEED, 'acidified-feed', 'warning')
    const fixed = applyFix(text, ds[0].fixes[0])
    expect(fixed).toBe(text + 'handling vent: CO2 from the acidified feed led to the exhaust\n')
    const after = analyze(fixed).diagnostics.filter((d) => d.code === 'acidified-feed')
    expect(after.map((d) => d.severity)).toEqual(['information'])
    expect(after[0].message).toMatch(/about 1\.77 L CO₂/)
    expect(after[0].fixes).toEqual([])
  })

  it('acid charged onto carbonate, no cell: CO₂ from the charges', () => {
    // Na2CO3 10 g = 10 / 105.988 = 0.09435 mol; H2SO4 5 g = 5 / 98.072 = 0.05098 mol = 0.10196 mol H⁺;
    // 0.09435 mol H⁺ turn carbonate to bicarbonate, the other 0.00761 mol release CO₂:
    // 0.00761 × 24.465 L/mol (RT/p at 25 °C, 101.325 kPa) = 0.186 L (hand arithmetic).
    const { ds } = at(lines('run "neutralise"', 'cell', '  compartment tank 1 L', 'charge tank: ⟦Na2CO3 10 g⟧, H2SO4 5 g, water 800 mL'), 'acidified-feed', 'warning')
    expect(ds[0].message).toMatch(/about 0\.186 L CO₂/)
    expect(ds[0].message).toMatch(/H₂SO₄ charged/)
  })

  it('acid charged with hypochlorite: chlorine, a warning on the hypochlorite; the scrubber fix makes it information', () => {
    // NaClO 10 g = 10 / 74.44 = 0.1343 mol; HCl 5 g = 5 / 36.458 = 0.1371 mol H⁺ → up to 0.0686 mol Cl₂
    // (2 H⁺ per Cl₂) = 0.0686 × 24.465 L/mol = 1.68 L at 25 °C (hand arithmetic).
    const src = lines('run "bleach"', 'cell', '  compartment tank 1 L', 'charge tank: ⟦NaClO 10 g⟧, HCl 5 g, water 800 mL')
    const { text, ds } = at(src, 'acidified-feed', 'warning')
    expect(ds[0].message).toMatch(/up to about 1\.68 L Cl₂/)
    const fixed = applyFix(text, ds[0].fixes[0])
    expect(fixed).toBe(text + 'handling scrubber: chlorine from the acidified hypochlorite through a caustic scrubber to the exhaust\n')
    expect(analyze(fixed).diagnostics.filter((d) => d.code === 'acidified-feed').map((d) => d.severity)).toEqual(['information'])
  })

  it('with a hood declared: information, still with the volume', () => {
    at(CO2_FEED + 'handling hood: the feed side vents inside the fume hood\n', 'acidified-feed', 'information')
  })

  it('is silent while the carbonate takes up all the acid (bicarbonate, no CO₂), and with no acid at all', () => {
    // K2CO3 100 g = 0.7236 mol CO₃²⁻ against 2 A·h = 0.0746 mol H⁺: all stays as bicarbonate.
    silent(marked(CO2_FEED).text.replace('K2CO3 10 g', 'K2CO3 100 g').replace('for 2 h', 'for 1 h'), 'acidified-feed')
    silent(lines('run "soda"', 'cell', '  compartment tank 1 L', 'charge tank: Na2CO3 10 g, water 800 mL'), 'acidified-feed')
    expect(r.source).toMatch(/8\.314462618/)
  })

  it('is silent on the shipped examples (the KOH run keeps its feed as carbonate/bicarbonate: no CO₂ in the model)', () => {
    silentOnExamples('acidified-feed')
  })
})

// ---- noted -------------------------------------------------------------------------------------
describe('`# noted CODE: reason` on the finding line', () => {
  it('turns caustic-in-glass into information and keeps the caution', () => {
    const text = marked(GLASS_HOT).text.replace('vessel borosilicate glass', 'vessel borosilicate glass  # noted caustic-in-glass: thick-walled beaker, replaced after each run')
    const ds = analyze(text).diagnostics.filter((d) => d.code === 'caustic-in-glass')
    expect(ds).toHaveLength(1)
    expect(ds[0].severity).toBe('information')
    expect(ds[0].noted).toBe('thick-walled beaker, replaced after each run')
    expect(ds[0].caution).toMatch(/local codes/)
    // Without a reason it acknowledges nothing.
    const bare = marked(GLASS_HOT).text.replace('vessel borosilicate glass', 'vessel borosilicate glass  # noted caustic-in-glass')
    expect(analyze(bare).diagnostics.filter((d) => d.code === 'caustic-in-glass').map((d) => d.severity)).toEqual(['error'])
  })
})
