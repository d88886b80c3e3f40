// product-reaction: an `expect`/`observe` product that no electrode reaction makes, or that forms
// at the other electrode than the compartment named.
import { spanOf } from '../core/positions'
import type { Diagnostic } from '../core/diagnostics'
import type { Rule } from './rule'

export const productReaction: Rule = {
  code: 'product-reaction',
  severity: 'warning',
  summary: 'A planned or measured product that no electrode reaction forms, or one named in the wrong compartment.',
  check({ model }) {
    const out: Diagnostic[] = []
    for (let idx = 0; idx < model.yields.length; idx++) {
      const y = model.yields[idx]
      if (y.noReaction) {
        out.push({
          code: 'product-reaction',
          severity: 'information',
          message: `${y.noReaction}; no theoretical yield is computed for this line`,
          span: spanOf(y.formula.tok),
          fixes: [],
        })
      }
      if (y.wrongCompartment && y.compartment) {
        const where = y.wrongCompartment.formedIn
        out.push({
          code: 'product-reaction',
          severity: 'warning',
          message: `${y.formula.tok.text} forms in ${where.join(' and ')}, not in ${y.compartment.text}`,
          span: spanOf(y.compartment),
          fixes: where.length === 1 ? [{ title: `Change to \`${where[0]}\``, edits: [{ span: spanOf(y.compartment), newText: where[0] }] }] : [],
        })
      }
    }
    return out
  },
}
