// chlorine-handling: chlorine comes off at an anode (the engine's anode evolves chlorine, a stated
// anode reaction makes Cl2, or chloride is charged where an inert anode works) and the protocol
// declares no scrubber, hood or detector for it.
//
// Also exports the shared queries of the chlorine-related hazard rules of group A (where chlorine
// forms, which compartments share one solution, which charged salts are chlorides).
import type { Diagnostic } from '../../core/diagnostics'
import { ZERO_CELSIUS } from '../../core/constants'
import { chooseAnode } from '../../core/engine'
import type { Formula } from '../../core/formula'
import type { Electrode, Model } from '../../core/model'
import { fmt } from '../../core/units'
import type { Rule } from '../rule'
import { appendLine, handlingOf, litresPerMol, produced } from './facts'

/** A chloride (or chlorine itself): chlorine in the formula, and no oxygen (chlorate, perchlorate, hypochlorite are not). */
export function isChloride(f: Formula): boolean {
  return f.ok && (f.counts.get('Cl') ?? 0) > 0 && !f.counts.has('O')
}

/**
 * The compartments that share one solution with `comp`: itself, those joined to it by a separator
 * of kind `none`, and, when the engine treats the anode and cathode sides as one solution (no
 * separator between them), both of them.
 */
export function sharedSolution(model: Model, comp: string): Set<string> {
  const out = new Set([comp])
  let grew = true
  while (grew) {
    grew = false
    for (const s of model.separators) {
      if (s.type.text !== 'none') continue
      const [a, b] = s.between
      if (out.has(a) !== out.has(b)) {
        out.add(a)
        out.add(b)
        grew = true
      }
    }
  }
  const e = model.engine
  if (e?.anode && e.cathode && e.coupling === 'same' && (out.has(e.anode.compartment) || out.has(e.cathode.compartment))) {
    out.add(e.anode.compartment)
    out.add(e.cathode.compartment)
  }
  return out
}

/** Chlorides charged into any of these compartments, by formula text. */
export function chloridesIn(model: Model, comps: Set<string>): string[] {
  const out: string[] = []
  for (const c of comps) {
    for (const [text, s] of model.compartments.get(c)?.solutes ?? []) if (isChloride(s.formula) && s.mol > 0 && !out.includes(text)) out.push(text)
  }
  return out
}

export interface ChlorineSite {
  anode: Electrode
  /** The compartments that share the anode's solution (where the chlorine forms and dissolves). */
  solution: Set<string>
  /** Why chlorine is expected there. */
  why: string
}

/** Where chlorine forms: the first anode that evolves it, and why; undefined when none does. */
export function chlorineSite(model: Model): ChlorineSite | undefined {
  const e = model.engine
  for (const anode of model.electrodes) {
    if (anode.role !== 'anode' || !model.compartments.has(anode.compartment)) continue
    const solution = sharedSolution(model, anode.compartment)
    const engineHere = e?.anode?.compartment === anode.compartment && e.anode.material === anode.material.text ? e.anode : undefined
    if (engineHere?.kind === 'chlorine') return { anode, solution, why: engineHere.reason }
    if (engineHere?.kind === 'stated' && engineHere.stated?.some((p) => p.formula === 'Cl2')) {
      return { anode, solution, why: `the stated anode reaction ${engineHere.equation} makes chlorine` }
    }
    const chlorides = chloridesIn(model, solution)
    if (chlorides.length === 0) continue
    // Is the anode inert here (it evolves gas rather than dissolving)? Ask the engine's own choice.
    const ions = e?.ions.get(anode.compartment)
    const ph = e?.ph.get(anode.compartment)
    if (!ions || !ph) continue
    const choice = chooseAnode(anode.material.text, anode.compartment, ions, ph, model.compartments.get(anode.compartment)?.volumeL)
    if (choice.kind !== 'chlorine' && choice.kind !== 'oxygen') continue
    return { anode, solution, why: `${chlorides.join(', ')} charged where an inert ${anode.material.text} anode works: chloride oxidises to chlorine beside the oxygen` }
  }
  return undefined
}

/** The run's conditions, for gas volumes: "25 °C, 101.3 kPa". */
export function conditionsText(model: Model): string {
  return `${fmt(model.temperatureK - ZERO_CELSIUS)} °C, ${fmt(model.pressurePa / 1000, 4)} kPa`
}

export const chlorineHandling: Rule = {
  code: 'chlorine-handling',
  severity: 'warning',
  category: 'safety',
  summary: 'Chlorine evolves at an anode and no scrubber, hood or chlorine detector is declared for it.',
  details:
    'Chlorine is a toxic, heavier-than-air gas that irritates the airways at a few ppm and is immediately dangerous at 10 ppm. ' +
    'Wherever an anode can evolve it (chloride at an inert anode, or a stated reaction that makes Cl2), the anode off-gas should be led through a caustic scrubber or handled in a fume hood, ideally with a chlorine detector. ' +
    'Declare the arrangement with `handling scrubber: ...`, `handling hood: ...` or `handling detector: ...`.',
  source: 'chlorine IDLH 10 ppm, OSHA PEL ceiling 1 ppm: NIOSH Pocket Guide to Chemical Hazards, from memory; gas volumes: ideal gas at the run conditions (engine totals)',
  caution:
    'Lead chlorine-bearing off-gas through a caustic scrubber or keep the cell in a working fume hood, with a chlorine detector and a respirator suited to chlorine at hand. ' +
    "Follow your local codes, the safety data sheets and your institution's licensed practice.",
  check({ model }) {
    if (handlingOf(model, 'scrubber', 'hood', 'detector').length > 0) return []
    const site = chlorineSite(model)
    if (!site) return []
    const litres = produced(model, 'Cl2') * litresPerMol(model)
    const hypochlorite = (model.engine?.totals ?? []).some((p) => /ClO$/.test(p.formula) && p.mol > 0)
    const amount =
      litres > 0
        ? `about ${fmt(litres)} L Cl₂ over the run (${conditionsText(model)}, dry ideal gas)`
        : hypochlorite
          ? 'the engine counts the chlorine as hypochlorite in the shared solution, but chlorine still escapes from it'
          : !(model.totals.chargeC > 0)
            ? 'no charge is stated yet'
            : chloridesIn(model, site.solution).length === 0
              ? 'the engine counts no Cl₂ as no chloride is charged for it'
              : 'the engine counts no free Cl₂ (it takes the chloride as too dilute, or used up), but some chlorine still comes off'
    const node = model.tree.lines[site.anode.line]
    const d: Diagnostic = {
      code: 'chlorine-handling',
      severity: 'warning',
      message: `chlorine evolves at the ${site.anode.material.text} anode in ${site.anode.compartment} (${site.why}): ${amount}; no \`handling scrubber\`, \`handling hood\` or \`handling detector\` is declared`,
      span: node.span,
      fixes: [appendLine(model, 'handling scrubber: anode off-gas through NaOH solution')],
    }
    return [d]
  },
}
