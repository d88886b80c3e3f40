// acid-through-cation-membrane: acid is made (planned, or simulated below pH 2) on the anode side of
// a cation-exchange separator. Protons are far more mobile than sodium or potassium, so as the acid
// builds they carry more and more of the current back through the membrane and the efficiency for
// the hydroxide collapses.
import { spanOf } from '../../core/positions'
import { fix, type Diagnostic } from '../../core/diagnostics'
import { ionsOf } from '../../core/engine'
import { parseFormula, prettyFormula } from '../../core/formula'
import type { Model } from '../../core/model'
import { fmt } from '../../core/units'
import type { Rule } from '../rule'

/**
 * Limiting equivalent ionic conductivities at 25 °C, S·cm²/mol (CRC Handbook, "Ionic conductivity
 * and diffusion at infinite dilution", from memory); the same values as the simulation's table.
 */
const LAMBDA: Record<string, number> = { H: 349.65, Li: 38.66, Na: 50.08, K: 73.48 }
/** Anolyte pH below which the acid is taken as built up (the simulation's own event threshold). */
const ACID_PH = 2
/** A fall of the simulated efficiency by this much (absolute) counts as a fall. */
const FALL = 0.05

/** Acids a protocol would plan: H with a known anion (not water, not carbonic acid). */
function isAcid(formula: string): boolean {
  const i = ionsOf(parseFormula(formula))
  return !!i && i.cation === 'H' && !['OH', 'CO3', 'HCO3'].includes(i.anion)
}

function pct(x: number): string {
  return `${fmt(x * 100)} %`
}

/** The anode side's main cation other than protons (for the mobility comparison). */
function feedCation(model: Model, comp: string): string | undefined {
  const ions = model.engine?.ions.get(comp)
  if (!ions) return undefined
  const c = [...ions.cations].filter(([el, v]) => el !== 'H' && v.mol > 0).sort((a, b) => b[1].mol - a[1].mol)[0]
  return c?.[0]
}

/** The simulation: when the anolyte first falls below pH 2, and how the hydroxide efficiency goes after it. */
function simulatedCollapse(model: Model, anodeComp: string): { time: number; before: number; after: number; afterLine: number; ph: number } | undefined {
  const sim = model.simulation
  const main = sim?.mainProduct
  if (!sim || !main || !/OH/.test(main.formula) || ionsOf(parseFormula(main.formula))?.anion !== 'OH') return undefined
  const first = sim.series.find((p) => (p.compartments.find((c) => c.name === anodeComp)?.ph ?? 7) < ACID_PH)
  if (!first) return undefined
  const upTo = sim.series.filter((p) => p.time <= first.time)
  const before = Math.max(...upTo.map((p) => p.efficiency))
  // The worst step ending after the anolyte turned acid.
  let after: { eff: number; line: number } | undefined
  for (const s of sim.steps) {
    if (s.endTime < first.time || !s.product || !(s.electronMol > 0)) continue
    if (!after || s.product.efficiency < after.eff) after = { eff: s.product.efficiency, line: s.line }
  }
  if (!after || !(after.eff < before - FALL)) return undefined
  const ph = Math.min(...sim.steps.flatMap((s) => s.compartments.filter((c) => c.name === anodeComp).map((c) => c.ph)))
  return { time: first.time, before, after: after.eff, afterLine: after.line, ph }
}

function clock(s: number): string {
  if (s >= 3600) return `${fmt(s / 3600)} h`
  if (s >= 60) return `${fmt(s / 60)} min`
  return `${fmt(s)} s`
}

export const acidThroughCationMembrane: Rule = {
  code: 'acid-through-cation-membrane',
  severity: 'warning',
  category: 'safety',
  summary: 'Acid made on the anode side of a cation-exchange separator: protons outrun the sodium or potassium and the efficiency collapses as the acid builds.',
  details:
    'A cation-exchange membrane passes whatever cations the anolyte holds, in proportion to their concentration and mobility. Protons are about 7 times as mobile as Na⁺ (about 5 times K⁺), so once the anolyte turns acid they carry a growing share of the current, neutralise the hydroxide made at the cathode, and the efficiency collapses while the cell heats and gasses. ' +
    'If the acid is the product, an anion-exchange separator (anions moving to the anode side) is the usual choice (the quick fix); if the hydroxide is, stop before the anolyte turns strongly acid, or buffer or neutralise the feed.',
  source:
    'Limiting ionic conductivities at 25 °C: H⁺ 349.65, Na⁺ 50.08, K⁺ 73.48, Li⁺ 38.66 S·cm²/mol (CRC Handbook, "Ionic conductivity and diffusion at infinite dilution", from memory): H⁺/Na⁺ ≈ 7.0, H⁺/K⁺ ≈ 4.8. The efficiency loss of salt splitting with cation membranes as acid builds: common practice, no source.',
  caution:
    'Watch the anolyte pH and the cell voltage, and stop or neutralise before the anolyte turns strongly acid; a collapsing efficiency turns more of the current into heat and gas, and acid on one side with caustic on the other makes a leak or a membrane failure more hazardous. Follow your local codes, the safety data sheets and your institution\'s licensed practice.',
  check({ model }) {
    const anode = model.electrodes.find((e) => e.role === 'anode')
    const cathode = model.electrodes.find((e) => e.role === 'cathode')
    if (!anode || !cathode || anode.compartment === cathode.compartment) return []
    const sep = model.separators.find((s) => s.between.includes(anode.compartment) && s.between.includes(cathode.compartment))
    if (!sep || sep.type.text !== 'cation-exchange') return []
    const a = anode.compartment
    const planned = model.yields.find(
      (y) => y.kind === 'expect' && (!y.compartment || y.compartment.text === a) && isAcid(y.formula.tok.text),
    )
    const sim = simulatedCollapse(model, a)
    if (!planned && !sim) return []
    const cat = feedCation(model, a)
    const ratio = cat && LAMBDA[cat] ? ` (about ${fmt(LAMBDA.H / LAMBDA[cat], 2)}× as mobile as ${cat}⁺, CRC limiting conductivities)` : ' (several times as mobile as other cations)'
    const simText = sim
      ? `; in the simulation ${a} falls below pH ${ACID_PH} after ${clock(sim.time)} (down to pH ${fmt(sim.ph, 2)}) and the hydroxide efficiency falls from ${pct(sim.before)} to ${pct(sim.after)}`
      : ''
    const head = planned
      ? `${prettyFormula(planned.formula.tok.text)} is planned in ${a}, the anode side of a cation-exchange separator`
      : `${a}, the anode side of this cation-exchange separator, turns strongly acid`
    const d: Diagnostic = {
      code: 'acid-through-cation-membrane',
      severity: 'warning',
      message: `${head}: as the acid builds, protons${ratio} carry more and more of the current through the membrane, so the efficiency collapses${simText}`,
      span: spanOf(sep.type),
      // Only when the acid is the product is an anion-exchange separator the remedy.
      fixes: planned ? [fix('Use an anion-exchange separator (the anion moves to the anode side)', spanOf(sep.type), 'anion-exchange')] : [],
    }
    return [d]
  },
}
