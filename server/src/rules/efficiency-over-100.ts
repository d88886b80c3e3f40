// efficiency-over-100: an `observe` line records more product than the charge passed can make at
// 100 % current efficiency: a weighing or record slip (wet product, product charged at the start).
import { spanOf } from '../core/positions'
import { prettyFormula } from '../core/formula'
import { fmt } from '../core/units'
import type { Rule } from './rule'

export const efficiencyOver100: Rule = {
  code: 'efficiency-over-100',
  severity: 'warning',
  summary: 'A measured yield that implies more than 100 % current efficiency.',
  check({ model }) {
    return model.yields.flatMap((y) => {
      if (y.kind !== 'observe' || y.formedMol === undefined || !y.maxMol100) return []
      const ce = y.formedMol / y.maxMol100
      if (ce <= 1 + 1e-9) return []
      return [
        {
          code: 'efficiency-over-100',
          severity: 'warning' as const,
          message: `the measured ${prettyFormula(y.formula.tok.text)} implies ${fmt(ce * 100)} % current efficiency; check for moisture in the product, product charged before the run, or the charge passed`,
          span: spanOf(y.quantity.expr),
          fixes: [],
        },
      ]
    })
  },
}
