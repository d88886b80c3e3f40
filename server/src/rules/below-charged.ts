// below-charged: an `expect` or `observe` amount smaller than what was charged of the same substance
// into that compartment before the run: the run would have consumed product, which v1's electrode
// reactions never do. Usually the line means the amount formed, not the amount there after the run.
import { spanOf } from '../core/positions'
import { fix } from '../core/diagnostics'
import { prettyFormula } from '../core/formula'
import { fmt } from '../core/units'
import type { Rule } from './rule'

export const belowCharged: Rule = {
  code: 'below-charged',
  severity: 'warning',
  summary: 'A planned or measured amount below what was already charged before the run.',
  check({ model }) {
    return model.yields.flatMap((y) => {
      if (y.formedMol === undefined || y.formedMol >= 0 || y.mol === undefined || y.quantity.kind !== 'mass') return []
      const M = y.formula.formula.molarMass
      const charged = y.initialMol * M
      const total = `${fmt(y.mol * M + charged)} g`
      return [
        {
          code: 'below-charged',
          severity: 'warning' as const,
          message: `${fmt(charged)} g of ${prettyFormula(y.formula.tok.text)} was charged before the run, more than the ${fmt(y.mol * M)} g stated; \`${y.kind}\` states the amount there after the run, charged amount included`,
          span: spanOf(y.quantity.expr),
          fixes: [fix(`Add the charged amount (${total})`, spanOf(y.quantity.expr), total)],
        },
      ]
    })
  },
}
