// unbalanced-reaction: a stated half-reaction whose elements or charge do not balance. The fix
// writes the smallest whole-number coefficients that balance it (exact rational arithmetic).
import { spanOf } from '../core/positions'
import { fix } from '../core/diagnostics'
import { fmt } from '../core/units'
import type { Rule } from './rule'

export const unbalancedReaction: Rule = {
  code: 'unbalanced-reaction',
  severity: 'error',
  summary: 'A stated half-reaction whose elements or charge do not balance (fix: the balanced coefficients).',
  check({ model }) {
    return model.reactions.flatMap((r) => {
      if (!r.parsed.ok || r.check.balanced) return []
      const off = Object.entries(r.check.elements)
        .filter(([, v]) => v !== 0)
        .map(([el, v]) => `${el} ${v > 0 ? '+' : ''}${fmt(v, 6)}`)
      if (r.check.charge !== 0) off.push(`charge ${r.check.charge > 0 ? '+' : ''}${fmt(r.check.charge, 6)}`)
      const b = r.balanced
      return [
        {
          code: 'unbalanced-reaction',
          severity: 'error' as const,
          message: `the reaction does not balance (right minus left: ${off.join(', ')})${b && !b.ok ? `; ${b.reason}` : ''}`,
          span: spanOf(r.equation),
          fixes: b && b.ok ? [fix(`Balance: ${b.text}`, spanOf(r.equation), b.text)] : [],
        },
      ]
    })
  },
}
