// product-reaction: an `expect`/`observe` product that no electrode reaction makes, or that forms
// at the other electrode than the compartment named.
import type { Diagnostic } from '../core/diagnostics'
import type { Rule } from './rule'

export const productReaction: Rule = {
  code: 'product-reaction',
  severity: 'warning',
  summary: 'A planned or measured product that no electrode reaction forms, or one named in the wrong compartment.',
  check({ model }) {
    const out: Diagnostic[] = []
    for (const y of model.yields) {
      if (y.noReaction) {
        out.push({
          code: 'product-reaction',
          severity: 'information',
          message: `${y.noReaction}; no theoretical yield is computed for this line`,
          span: y.formula.tok.span,
          fixes: [],
        })
      }
      if (y.wrongCompartment && y.compartment) {
        const holders = model.electrodes.filter((e) => e.role === y.wrongCompartment!.expected).map((e) => e.compartment)
        out.push({
          code: 'product-reaction',
          severity: 'warning',
          message: `${y.formula.tok.text} forms at the ${y.wrongCompartment.expected}, which is in ${holders.join(', ')}, not in ${y.compartment.text}`,
          span: y.compartment.span,
          fixes: holders.length === 1 ? [{ title: `Change to \`${holders[0]}\``, edits: [{ span: y.compartment.span, newText: holders[0] }] }] : [],
        })
      }
    }
    return out
  },
}
