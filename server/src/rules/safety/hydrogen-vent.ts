// hydrogen-vent: the run makes hydrogen (engine totals) and the protocol declares no vent or hood
// for it.
import type { Diagnostic } from '../../core/diagnostics'
import { fmt } from '../../core/units'
import type { Rule } from '../rule'
import { conditionsText } from './chlorine-handling'
import { appendLine, cellSpan, handlingOf, litresPerMol, peakGasRate, produced } from './facts'

export const hydrogenVent: Rule = {
  code: 'hydrogen-vent',
  severity: 'warning',
  category: 'safety',
  summary: 'The run makes hydrogen and no vent or hood is declared for it.',
  details:
    'Hydrogen is flammable in air from about 4 to 75 vol % and ignites with very little energy; it collects under ceilings and in closed headspaces. ' +
    'Lead the cathode off-gas out of the room (or into a hood exhaust), dilute it well below the lower flammable limit and keep ignition sources away. ' +
    'Declare the arrangement with `handling vent: ...` or `handling hood: ...`.',
  source: 'hydrogen flammable range 4-75 vol % in air: NFPA 497 / IEC 60079-20-1, from memory; gas volumes: ideal gas at the run conditions (engine totals)',
  caution:
    'Hydrogen is flammable in air from about 4 to 75 vol %: vent it outdoors or into a working exhaust, away from sparks, hot surfaces and open flames, and keep any headspace well below 4 vol %. ' +
    "Follow your local codes, the safety data sheets and your institution's licensed practice.",
  check({ model }) {
    if (handlingOf(model, 'vent', 'hood').length > 0) return []
    const mol = produced(model, 'H2')
    if (!(mol > 0)) return []
    const litres = mol * litresPerMol(model)
    const peak = peakGasRate(model, 'H2')
    // Attach to the cathode where the hydrogen forms, else to the cell.
    const where = (model.engine?.totals ?? []).find((p) => p.formula === 'H2' && p.mol > 0)?.compartment
    const cathode = model.electrodes.find((e) => e.role === 'cathode' && e.compartment === where) ?? model.electrodes.find((e) => e.role === 'cathode')
    const span = cathode ? model.tree.lines[cathode.line].span : cellSpan(model)
    const d: Diagnostic = {
      code: 'hydrogen-vent',
      severity: 'warning',
      message:
        `the run makes about ${fmt(litres)} L H₂ (${conditionsText(model)}, dry ideal gas)` +
        (peak > 0 ? `, at up to ${fmt(peak)} L/h` : '') +
        `${where ? ` in ${where}` : ''}; no \`handling vent\` or \`handling hood\` is declared`,
      span,
      fixes: [appendLine(model, 'handling vent: hydrogen led outdoors away from ignition sources')],
    }
    return [d]
  },
}
