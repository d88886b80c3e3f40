// below-reversible: a step holds the cell voltage below the reversible voltage of the chosen
// reactions: at that voltage the cell cannot drive them (a few millivolts of Nernst correction aside).
import { fmt } from '../core/units'
import type { Rule } from './rule'

export const belowReversible: Rule = {
  code: 'below-reversible',
  severity: 'warning',
  summary: 'A stated cell voltage below the reversible voltage of the chosen electrode reactions.',
  check({ model }) {
    const v = model.voltages
    if (!v || v.reversible <= 0) return []
    return model.steps.flatMap((s) => {
      if (s.voltageV === undefined || s.voltageV >= v.reversible) return []
      const q = model.quantities.find((x) => x.line === s.line && x.keyword?.text === 'voltage')
      return [
        {
          code: 'below-reversible',
          severity: 'warning' as const,
          message: `${fmt(s.voltageV)} V is below the reversible voltage of this cell, ${fmt(v.reversible)} V (standard states): the chosen reactions cannot run, whatever the current stated`,
          span: q?.expr.span ?? s.span,
          fixes: [],
        },
      ]
    })
  },
}
