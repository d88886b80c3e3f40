// mixed-gases: hydrogen from the cathode and oxygen or chlorine from the anode come off into one
// headspace: the electrodes share a compartment, the separator between them is `none` (or not
// declared), or it is a porous diaphragm.
import type { Diagnostic } from '../../core/diagnostics'
import type { Span } from '../../core/positions'
import { fmt } from '../../core/units'
import type { Rule } from '../rule'
import { chlorineSite } from './chlorine-handling'
import { cellSpan, litresPerMol, produced } from './facts'

export const mixedGases: Rule = {
  code: 'mixed-gases',
  severity: 'warning',
  category: 'safety',
  summary: 'Hydrogen and oxygen or chlorine come off into one headspace (no separator, or a porous diaphragm).',
  details:
    'Hydrogen mixed with oxygen or chlorine is explosive over a wide range of compositions and needs very little energy to ignite; hydrogen-chlorine mixtures can be set off even by light. ' +
    'An undivided cell, a separator of kind `none` or a missing separator puts both gases in one headspace; a porous diaphragm lets gas cross and the headspaces are often shared. Undivided cells are common (plating, electrowinning, chlorate), so this is a warning: what makes them safe is the ventilation and the purge, which the protocol should state. ' +
    'Divide the cell with a membrane and keep the anode and cathode off-gases apart, each led away on its own.',
  source: 'gas volumes and the hydrogen share: ideal gas at the run conditions from the engine totals (hand arithmetic: water electrolysis gives 2 H2 : 1 O2, 66.7 vol % H2); hydrogen flammable range 4-75 vol % in air: NFPA 497 / IEC 60079-20-1, from memory',
  caution:
    'Keep hydrogen apart from oxygen and chlorine: separate compartments and off-gas lines, or dilute the common headspace far below the lower flammable limit with a purge, with no ignition sources near. ' +
    "Follow your local codes, the safety data sheets and your institution's licensed practice.",
  check({ model }) {
    const e = model.engine
    if (!e?.anode || !e.cathode) return []
    const statedMakes = (r: typeof e.anode, formula: string) => r.kind === 'stated' && !!r.stated?.some((p) => p.formula === formula)
    const h2 = produced(model, 'H2')
    const o2 = produced(model, 'O2')
    const cl2 = produced(model, 'Cl2')
    // Gases that actually come off in the run (engine totals); in one solution the engine turns the
    // chlorine into hypochlorite, but chlorine still comes off where the anode makes it.
    if (!(h2 > 0)) return []
    const oxygen = o2 > 0
    const chlorine = cl2 > 0 || e.anode.kind === 'chlorine' || statedMakes(e.anode, 'Cl2') || chlorineSite(model)?.anode.compartment === e.anode.compartment
    if (!(oxygen || chlorine)) return []

    const a = e.anode.compartment
    const c = e.cathode.compartment
    let span: Span
    let severity: 'warning'
    let how: string
    if (a === c) {
      span = cellSpan(model)
      severity = 'warning'
      how = `the anode and the cathode share compartment ${a}`
    } else {
      const sep = model.separators.find((s) => s.between.includes(a) && s.between.includes(c))
      if (!sep) {
        span = cellSpan(model)
        severity = 'warning'
        how = `no separator is declared between ${a} and ${c}`
      } else if (sep.type.text === 'none') {
        span = model.tree.lines[sep.line].span
        severity = 'warning'
        how = `the separator between ${a} and ${c} is \`none\``
      } else if (sep.type.text === 'diaphragm') {
        span = model.tree.lines[sep.line].span
        severity = 'warning'
        how = `the diaphragm between ${a} and ${c} is porous: gas crosses it and the headspaces are often shared`
      } else return []
    }

    const Vm = litresPerMol(model)
    const oxidants = [oxygen ? 'oxygen' : '', chlorine ? 'chlorine' : ''].filter(Boolean).join(' and ')
    const volumes = [h2 > 0 ? `${fmt(h2 * Vm)} L H₂` : '', o2 > 0 ? `${fmt(o2 * Vm)} L O₂` : '', cl2 > 0 ? `${fmt(cl2 * Vm)} L Cl₂` : ''].filter(Boolean)
    const share = h2 > 0 && o2 + cl2 > 0 ? `; hydrogen is ${fmt((100 * h2) / (h2 + o2 + cl2))} vol % of the gas` : ''
    const d: Diagnostic = {
      code: 'mixed-gases',
      severity,
      message: `hydrogen and ${oxidants} come off into one headspace: ${how}` + (volumes.length ? ` (${volumes.join(', ')} over the run${share})` : ''),
      span,
      fixes: [],
    }
    return [d]
  },
}
