// crystallising-product: the simulation has a salt reaching saturation and crystallising during the
// run. Crystals block lines, pumps and the separator's face; a blocked line can build pressure.
import type { Diagnostic } from '../../core/diagnostics'
import { parseFormula, prettyFormula } from '../../core/formula'
import type { Model } from '../../core/model'
import { fmt } from '../../core/units'
import type { Rule } from '../rule'

/** Seconds as a chemist reads them. */
function clock(s: number): string {
  if (s >= 3600) return `${fmt(s / 3600)} h`
  if (s >= 60) return `${fmt(s / 60)} min`
  return `${fmt(s)} s`
}

/** The salt a `saturated` event is about: from its message, else the solids of that compartment at the end of the step. */
function saltOf(model: Model, ev: { line: number; compartment?: string; message: string }): { shown: string; key?: string } {
  const step = model.simulation?.steps.find((s) => s.line === ev.line)
  const solids = step?.compartments.find((c) => c.name === ev.compartment)?.solids ?? {}
  const m = /^(\S+) reaches saturation/.exec(ev.message)
  if (m) {
    const key = Object.keys(solids).find((k) => prettyFormula(k) === m[1])
    return { shown: m[1], ...(key ? { key } : {}) }
  }
  const key = Object.keys(solids)[0]
  return key ? { shown: prettyFormula(key), key } : { shown: 'a salt' }
}

export const crystallisingProduct: Rule = {
  code: 'crystallising-product',
  severity: 'warning',
  category: 'safety',
  summary: 'The simulation has a salt reaching saturation and crystallising during the run: it may block lines, pumps or the separator.',
  details:
    'As the run concentrates a compartment (the product building up, water carried off by drag or used at the electrodes) a salt can pass its solubility and crystallise. ' +
    'Crystals settle in lines, pumps, valves and on the separator, where they block the flow, starve the cell or damage the membrane, and a blocked line can build pressure. ' +
    'Dilute the compartment (more water charged), run warmer where the salt is more soluble, or stop the run earlier, before the time given.',
  source:
    'Solubilities: the tables in server/src/core/data/solubility.ts (CRC Handbook and Perry\'s Chemical Engineers\' Handbook, as named there); the time from the simulation. Blocking by crystals: common practice, no source.',
  caution:
    'Watch lines, pumps and the separator for crystals, keep a way to stop the current and flush the cell with warm water, and never clear a blocked line under pressure. Follow your local codes, the safety data sheets and your institution\'s licensed practice.',
  check({ model }) {
    const sim = model.simulation
    if (!sim) return []
    const out: Diagnostic[] = []
    for (const ev of sim.events) {
      if (ev.kind !== 'saturated') continue
      const node = model.tree.lines[ev.line]
      if (!node) continue
      const salt = saltOf(model, ev)
      const step = sim.steps.find((s) => s.line === ev.line)
      const solidMol = salt.key ? step?.compartments.find((c) => c.name === ev.compartment)?.solids[salt.key] : undefined
      const M = salt.key ? parseFormula(salt.key).molarMass : NaN
      const solid = solidMol !== undefined && solidMol > 0 && Number.isFinite(M) ? `; about ${fmt(solidMol * M)} g solid by the end of this step` : ''
      const label = node.kind === 'step' ? `step ${node.label.text}` : 'this step'
      out.push({
        code: 'crystallising-product',
        severity: 'warning',
        message: `${salt.shown} reaches saturation in ${ev.compartment ?? 'the cell'} and starts to crystallise after ${clock(ev.time)} of the run (${label}, simulated)${solid}: crystals may block lines, pumps or the separator`,
        span: node.span,
        fixes: [],
      })
    }
    return out
  },
}
