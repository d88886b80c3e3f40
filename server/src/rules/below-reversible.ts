// below-reversible: a step holds the cell voltage below the reversible voltage of the chosen
// reactions: at that voltage the cell cannot drive them (a few millivolts of Nernst correction aside).
import { fmt } from '../core/units'
import { spanOf } from '../core/positions'
import type { Rule } from './rule'

export const belowReversible: Rule = {
  code: 'below-reversible',
  severity: 'warning',
  summary: 'A stated cell voltage below the reversible voltage of the chosen electrode reactions.',
  check({ model }) {
    const v = model.voltages
    if (!v || v.reversible <= 0) return []
    // The voltage clause of each step line, looked up once (not searched for every step).
    const voltageOn = new Map<number, (typeof model.quantities)[number]>()
    for (let idx = 0; idx < model.quantities.length; idx++) {
      const x = model.quantities[idx]
      if (x.keyword?.text === 'voltage' && !voltageOn.has(x.line)) voltageOn.set(x.line, x)
    }
    return model.steps.flatMap((s) => {
      if (s.voltageV === undefined || s.voltageV >= v.reversible) return []
      const q = voltageOn.get(s.line)
      return [
        {
          code: 'below-reversible',
          severity: 'warning' as const,
          message: `${fmt(s.voltageV)} V is below the reversible voltage of this cell, ${fmt(v.reversible)} V (standard states): the chosen reactions cannot run, whatever the current stated`,
          span: q ? spanOf(q.expr) : s.span,
          fixes: [],
        },
      ]
    })
  },
}
