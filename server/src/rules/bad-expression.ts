// bad-expression: an expression that cannot be read, uses something the sandbox refuses, is too
// long or too deep, or cannot be computed (e.g. adding a mass to a volume).
import type { Rule } from './rule'

export const badExpression: Rule = {
  code: 'bad-expression',
  severity: 'error',
  summary: 'An expression that cannot be read or computed, or uses a construct that is not allowed.',
  check({ model }) {
    return model.quantities.flatMap((q) => {
      const f = q.failure
      if (!f || f.reason === 'unknown-name') return []
      const start = q.expr.start + f.start
      const end = q.expr.start + Math.max(f.end, f.start)
      return [
        {
          code: 'bad-expression',
          severity: 'error' as const,
          message: `${f.message} (in ${q.role})`,
          span: end > start ? { start, end } : { start: q.expr.start, end: q.expr.end },
          fixes: [],
        },
      ]
    })
  },
}
