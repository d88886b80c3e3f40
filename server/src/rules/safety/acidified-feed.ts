// acidified-feed: acid meets a carbonate/bicarbonate feed (CO₂ comes off) or a hypochlorite
// (chlorine comes off). A warning when no vent, hood or scrubber is declared; with one declared the
// finding stays as information, with the volume, so the gas handling can be sized.
import type { Diagnostic } from '../../core/diagnostics'
import { ionsOf } from '../../core/engine'
import { parseFormula, prettyFormula } from '../../core/formula'
import type { Compartment, Model } from '../../core/model'
import { ZERO_CELSIUS } from '../../core/constants'
import type { Span } from '../../core/positions'
import { fmt } from '../../core/units'
import type { Rule } from '../rule'
import { appendLine, handlingOf, litresPerMol, produced } from './facts'

const STRONG_ACID_ANIONS = new Set(['Cl', 'SO4', 'HSO4', 'NO3', 'Br', 'I', 'ClO4'])
export const CO2_VENT_LINE = 'handling vent: CO2 from the acidified feed led to the exhaust'
export const CL2_SCRUBBER_LINE = 'handling scrubber: chlorine from the acidified hypochlorite through a caustic scrubber to the exhaust'
/** Below this the gas is a trace (mol). */
const TRACE = 1e-9

function ions(text: string) {
  return ionsOf(parseFormula(text.replace(/\((aq|s|l|g)\)$/, '')))
}

/** Moles of an ion charged into a compartment: anions by name, or protons from strong acids ('H'). */
function charged(c: Compartment, what: 'H' | 'OH' | 'CO3' | 'HCO3' | 'ClO'): number {
  let mol = 0
  for (const s of c.solutes.values()) {
    const i = ionsOf(s.formula)
    if (!i) continue
    if (what === 'H') {
      if (i.cation === 'H' && STRONG_ACID_ANIONS.has(i.anion)) mol += s.mol * i.cationCount
    } else if (i.anion === what && i.cation !== 'H') mol += s.mol * i.anionCount
  }
  return mol
}

/** CO₂ released at once where acid is charged together with carbonate: H⁺ + OH⁻ first, then CO₃²⁻ → HCO₃⁻ → CO₂. */
function chargedCo2(c: Compartment): number {
  let h = Math.max(0, charged(c, 'H') - charged(c, 'OH'))
  const co3 = charged(c, 'CO3')
  const t = Math.min(h, co3)
  h -= t
  return Math.min(h, charged(c, 'HCO3') + t)
}

interface Item {
  span: Span
  formula: string
  compartment: string
  line: number
}

function itemsWith(model: Model, anions: string[]): Item[] {
  const out: Item[] = []
  for (let li = 0; li < model.tree.lines.length; li++) {
    const n = model.tree.lines[li]
    if (n.kind !== 'charge') continue
    for (const it of n.items) {
      const i = ions(it.formula.text)
      if (i && i.cation !== 'H' && anions.includes(i.anion)) out.push({ span: it.span, formula: it.formula.text, compartment: n.compartment.text, line: n.line })
    }
  }
  return out
}

function acidNames(c: Compartment): string {
  return [...c.solutes.values()]
    .filter((s) => {
      const i = ionsOf(s.formula)
      return i && i.cation === 'H' && STRONG_ACID_ANIONS.has(i.anion)
    })
    .map((s) => prettyFormula(s.formula.text))
    .join(', ')
}

export const acidifiedFeed: Rule = {
  code: 'acidified-feed',
  severity: 'warning',
  category: 'safety',
  summary: 'Acid meets a carbonate or bicarbonate feed (CO₂ comes off) or a hypochlorite (chlorine comes off).',
  details:
    'Protons made at an oxygen anode, or acid charged, turn carbonate into bicarbonate and then release carbon dioxide; acid on a hypochlorite releases chlorine. ' +
    'The gas comes off with the anode gas, can foam the feed over and, in a closed cell, build pressure; CO₂ displaces air in a small room, and chlorine is toxic. ' +
    'Declare where the gas goes (a `handling vent`, `hood` or, for chlorine, a `scrubber`); the finding then stays as information with the volume, so the handling can be sized.',
  source:
    'Gas volume: ideal gas at the run conditions, V = nRT/p with R = 8.314462618 J/(mol·K) (exact since the SI 2019 revision). CO₂ from acidified carbonate/bicarbonate and Cl₂ from acidified hypochlorite (ClO⁻ + Cl⁻ + 2 H⁺ → Cl₂ + H₂O): textbook chemistry, common practice, no source.',
  caution:
    'Acidify carbonate or hypochlorite solutions slowly, with headspace and an open path for the gas to an exhaust so that it cannot build pressure or foam over; acidified hypochlorite releases chlorine, which belongs in a fume hood with a scrubber. Follow your local codes, the safety data sheets and your institution\'s licensed practice.',
  check({ model }) {
    const out: Diagnostic[] = []
    const Vm = litresPerMol(model)
    const where = `${fmt(model.temperatureK - ZERO_CELSIUS)} °C and ${fmt(model.pressurePa / 1000, 4)} kPa`

    // --- CO₂ from carbonate or bicarbonate.
    const chargedRelease = [...model.compartments.values()].map((c) => ({ c, mol: chargedCo2(c) })).filter((x) => x.mol > TRACE)
    const engineCo2 = produced(model, 'CO2')
    const sim = model.simulation
    const co2 = sim ? (sim.gases.CO2 ?? 0) : engineCo2 + chargedRelease.reduce((t, x) => t + x.mol, 0)
    if (co2 > TRACE) {
      const fromRun = (model.engine?.totals ?? []).filter((p) => p.formula === 'CO2' && p.mol > 0)
      const comps = [...new Set([...fromRun.map((p) => p.compartment), ...chargedRelease.map((x) => x.c.name)])]
      const carbonates = itemsWith(model, ['CO3', 'HCO3'])
      const item = carbonates.find((x) => comps.includes(x.compartment)) ?? carbonates[0]
      let span: Span | undefined = item?.span
      if (!span) {
        const stepLine = model.engine?.steps.find((s) => s.products.some((p) => p.formula === 'CO2' && p.mol > 0))?.line ?? model.steps[0]?.line
        span = stepLine !== undefined ? model.tree.lines[stepLine].span : model.tree.lines[0].span
      }
      const causes: string[] = []
      for (const x of chargedRelease) causes.push(`the ${acidNames(x.c)} charged into ${x.c.name}`)
      if (fromRun.length) causes.push(`the protons made at the anode in ${[...new Set(fromRun.map((p) => p.compartment))].join(', ')}`)
      if (causes.length === 0) causes.push('the acid formed in the run')
      const what = item ? `${prettyFormula(item.formula)} in ${item.compartment}` : 'the carbonate feed'
      const declared = handlingOf(model, 'vent', 'hood', 'scrubber')
      const message =
        `${what} is acidified by ${causes.join(' and ')}: about ${fmt(co2 * Vm)} L CO₂ comes off at ${where} (${sim ? 'simulation' : 'by the charge passed'})` +
        (declared.length ? `; gas handling is declared (\`handling ${declared[0].type.text}\`, line ${declared[0].line + 1}): check it takes this volume` : '; no vent or hood is declared for it')
      out.push({
        code: 'acidified-feed',
        severity: declared.length ? 'information' : 'warning',
        message,
        span,
        fixes: declared.length ? [] : [appendLine(model, CO2_VENT_LINE)],
      })
    }

    // --- Chlorine from hypochlorite charged together with a strong acid.
    for (const item of itemsWith(model, ['ClO'])) {
      const c = model.compartments.get(item.compartment)
      if (!c) continue
      const h = charged(c, 'H')
      const clo = charged(c, 'ClO')
      if (!(h > TRACE) || !(clo > TRACE)) continue
      const cl2 = Math.min(clo, h / 2)
      const declared = handlingOf(model, 'hood', 'scrubber')
      out.push({
        code: 'acidified-feed',
        severity: declared.length ? 'information' : 'warning',
        message:
          `${prettyFormula(item.formula)} is charged into ${item.compartment} with ${acidNames(c)}: acidified hypochlorite releases chlorine, up to about ${fmt(cl2 * Vm)} L Cl₂ at ${where} (ClO⁻ + Cl⁻ + 2 H⁺ → Cl₂ + H₂O)` +
          (declared.length ? `; \`handling ${declared[0].type.text}\` is declared (line ${declared[0].line + 1}): check it takes chlorine` : '; no hood or scrubber is declared for it'),
        span: item.span,
        fixes: declared.length ? [] : [appendLine(model, CL2_SCRUBBER_LINE)],
      })
    }
    return out
  },
}
