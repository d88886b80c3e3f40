// bad-expression: an expression that cannot be read, uses something the sandbox refuses, is too
// long or too deep, or cannot be computed (e.g. adding a mass to a volume).
import type { Diagnostic } from '../core/diagnostics'
import { spanOf } from '../core/positions'
import type { Rule } from './rule'

export const badExpression: Rule = {
  code: 'bad-expression',
  severity: 'error',
  summary: 'An expression that cannot be read or computed, or uses a construct that is not allowed.',
  check({ model }) {
    // A loop over every quantity of the document: most have no failure and cost nothing.
    const out: Diagnostic[] = []
    for (let idx = 0; idx < model.quantities.length; idx++) {
      const q = model.quantities[idx]
      const f = q.failure
      if (!f || f.reason === 'unknown-name') continue
      const start = q.expr.start + f.start
      const end = q.expr.start + Math.max(f.end, f.start)
      out.push({
        code: 'bad-expression',
        severity: 'error',
        message: `${f.message} (in ${q.role})`,
        span: end > start ? { start, end } : spanOf(q.expr),
        fixes: [],
      })
    }
    return out
  },
}
