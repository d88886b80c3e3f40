// caustic-in-glass: a hydroxide (charged, or formed by the run) in a cell whose vessel is glass.
// Strong alkali dissolves silicate glass, fastest hot and concentrated: an error when the cell
// reaches 60 °C with 20 wt% hydroxide or more, else a warning.
import { spanOf } from '../../core/positions'
import { fix, type Diagnostic } from '../../core/diagnostics'
import { ionsOf } from '../../core/engine'
import { parseFormula, prettyFormula } from '../../core/formula'
import type { Model } from '../../core/model'
import { ZERO_CELSIUS } from '../../core/constants'
import { fmt } from '../../core/units'
import type { Rule } from '../rule'
import { peakTemperature } from './facts'

/** Vessel words that mean a silicate glass (glass-filled or glass-fibre plastics are not). */
const GLASS_WORDS = new Set(['glass', 'glassware', 'borosilicate', 'borosilicate-glass', 'pyrex', 'duran', 'simax', 'soda-lime', 'soda-lime-glass', 'quartz', 'fused-quartz', 'fused-silica', 'silica-glass', 'glass-lined'])
const NOT_GLASS = /filled|reinforced|fib(re|er)|frp/i

export function isGlass(material: string): boolean {
  const words = material.toLowerCase().split(/[\s,;/()]+/).filter(Boolean)
  return words.some((w) => GLASS_WORDS.has(w)) && !words.some((w) => NOT_GLASS.test(w))
}
/** Hot: the rule's own threshold (common practice, no source). */
export const HOT_CELSIUS = 60
/** Concentrated: the rule's own threshold (common practice, no source). */
export const STRONG_WT_PERCENT = 20
/** Hydroxide at or above this concentration in the simulation counts (pH 12); below it the trace is ignored. */
const OH_MIN_MOLAR = 0.01

interface Found {
  formula: string
  compartment: string
  /** Mass fraction of the hydroxide, %, where it can be told. */
  wtPercent?: number
  how: 'charged' | 'formed' | 'simulated'
}

function isHydroxide(formula: string): boolean {
  const i = ionsOf(parseFormula(formula))
  return !!i && i.anion === 'OH' && i.cation !== 'H'
}

function hydroxideOf(el: string, z: number): string {
  return z === 1 ? `${el}OH` : `${el}(OH)${z}`
}

/** Every hydroxide in the cell: charged, formed by the engine, or in the simulated state. */
function hydroxides(model: Model): Found[] {
  const out: Found[] = []
  for (const c of model.compartments.values()) {
    let totalG = c.waterG
    for (const s of c.solutes.values()) totalG += s.g
    for (const [text, s] of c.solutes) {
      if (!isHydroxide(text) || !(s.mol > 0)) continue
      out.push({ formula: text, compartment: c.name, how: 'charged', ...(c.waterKnown && totalG > 0 ? { wtPercent: (100 * s.g) / totalG } : {}) })
    }
  }
  const sim = model.simulation
  if (sim) {
    for (const snap of [...sim.steps.flatMap((s) => s.compartments), ...sim.final]) {
      const oh = snap.species['OH^-'] ?? 0
      if (!(snap.volumeL > 0) || oh / snap.volumeL < OH_MIN_MOLAR) continue
      // Pair the hydroxide with the most plentiful cation (by charge) of the compartment.
      let best: [string, number, number] | undefined
      for (const [k, v] of Object.entries(snap.species)) {
        const m = /^([A-Z][a-z]?)\^(\d*)\+$/.exec(k)
        if (!m || m[1] === 'H') continue
        const z = m[2] ? Number(m[2]) : 1
        if (!best || v * z > best[1] * best[2]) best = [m[1], v, z]
      }
      if (!best) continue
      const formula = hydroxideOf(best[0], best[2])
      const M = parseFormula(formula).molarMass
      out.push({ formula, compartment: snap.name, how: 'simulated', ...(snap.massG > 0 && Number.isFinite(M) ? { wtPercent: (100 * (oh / best[2]) * M) / snap.massG } : {}) })
    }
  } else {
    for (const p of model.engine?.totals ?? []) {
      if (p.mol > 0 && isHydroxide(p.formula)) out.push({ formula: p.formula, compartment: p.compartment, how: 'formed' })
    }
  }
  return out
}

export const causticInGlass: Rule = {
  code: 'caustic-in-glass',
  severity: 'warning',
  category: 'safety',
  summary: 'A hydroxide (charged or formed by the run) in a glass vessel: alkali dissolves glass, fastest hot and concentrated.',
  details:
    'Sodium, potassium and lithium hydroxide etch silicate glass (borosilicate, soda-lime, quartz): the wall thins, ground joints seize, and hot strong caustic can crack a vessel and spill. ' +
    'The finding is an error when the cell reaches 60 °C (run temperature or simulated peak) with 20 wt% hydroxide or more. ' +
    'Polypropylene serves to about 80-100 °C; for hot strong caustic use PTFE/PFA or nickel (common practice, no source). The quick fix changes the vessel to polypropylene.',
  source:
    "Alkali attack on glass rising steeply with temperature and concentration: glass manufacturers' chemical resistance tables (e.g. Schott and Corning data for borosilicate 3.3, where hot NaOH removes glass many times faster than acids), from memory. " +
    'The 60 °C and 20 wt% thresholds and the polypropylene/PTFE/nickel limits: common practice, no source.',
  caution:
    'Hold hydroxide solutions, above all hot or strong ones, in polypropylene, PTFE/PFA or nickel rather than glass, and inspect any glassware that has held caustic before reuse; hot caustic causes severe burns, so wear a face shield and alkali-resistant gloves. Follow your local codes, the safety data sheets and your institution\'s licensed practice.',
  check({ model }) {
    const vessel = model.vessel
    if (!vessel || !isGlass(vessel.material.text)) return []
    const found = hydroxides(model)
    if (found.length === 0) return []
    // The strongest hydroxide found names the finding.
    const strongest = found.reduce((a, b) => ((b.wtPercent ?? -1) > (a.wtPercent ?? -1) ? b : a))
    const peakC = peakTemperature(model) - ZERO_CELSIUS
    const hot = peakC >= HOT_CELSIUS - 1e-9
    const strong = (strongest.wtPercent ?? 0) >= STRONG_WT_PERCENT
    const error = hot && strong
    const wasCharged = found.some((f) => f.how === 'charged' && f.formula === strongest.formula && f.compartment === strongest.compartment)
    const how = wasCharged ? 'charged' : strongest.how === 'formed' ? 'formed by the run' : 'formed in the simulated run'
    const conc = strongest.wtPercent !== undefined ? `, up to ${fmt(strongest.wtPercent)} wt%,` : ''
    const temp = `${fmt(peakC)} °C${model.simulation && peakTemperature(model) > model.temperatureK + 0.5 ? ' (simulated peak)' : ''}`
    const why = error
      ? `hot (${temp}) and strong (≥ ${STRONG_WT_PERCENT} wt%) caustic dissolves glass quickly; the vessel can thin and crack`
      : `alkali etches glass, faster when hot or concentrated (here ${temp}${strongest.wtPercent !== undefined ? `, ${fmt(strongest.wtPercent)} wt%` : ''})`
    const d: Diagnostic = {
      code: 'caustic-in-glass',
      severity: error ? 'error' : 'warning',
      message: `${prettyFormula(strongest.formula)} in ${strongest.compartment} (${how})${conc} in a ${vessel.material.text} vessel: ${why}`,
      span: spanOf(vessel.material),
      fixes: [fix('Change the vessel to polypropylene', spanOf(vessel.material), 'polypropylene')],
    }
    return [d]
  },
}
