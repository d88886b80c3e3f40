// beyond-solubility: more of a salt is charged than the compartment's water dissolves at the run
// temperature (CRC/Perry's solubility tables, data/solubility.ts). The rest stays solid: it may
// dissolve as the run goes on, or block pipes, pumps and the separator.
import { prettyFormula } from '../core/formula'
import { fmt } from '../core/units'
import type { Rule } from './rule'

export const beyondSolubility: Rule = {
  code: 'beyond-solubility',
  severity: 'warning',
  summary: 'A salt charged beyond its solubility in the water of its compartment at the run temperature.',
  check({ model }) {
    return model.undissolved.map((u) => ({
      code: 'beyond-solubility',
      severity: 'warning' as const,
      message:
        `${fmt(u.chargedG - u.dissolvedG)} g of the ${fmt(u.chargedG)} g ${prettyFormula(u.formula)} stays solid in ${u.compartment}: ` +
        `at ${fmt(u.celsius)} °C water dissolves ${fmt(u.gPer100gWater)} g per 100 g, ${fmt(u.dissolvedG)} g in the water charged` +
        (u.others ? ' (other salts there lower it further)' : ''),
      span: u.span,
      fixes: [],
    }))
  },
}
