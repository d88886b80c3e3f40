// unknown-name: an expression uses a name no `let` defines, or a line names a compartment the
// cell does not declare. The fix offers the closest declared name.
import { spanOf } from '../core/positions'
import { fix, type Diagnostic } from '../core/diagnostics'
import { closest } from '../core/text'
import type { Rule } from './rule'

export const unknownName: Rule = {
  code: 'unknown-name',
  severity: 'error',
  summary: 'A name that is not defined: a value without a `let`, or a compartment the cell does not declare.',
  check({ model }) {
    const out: Diagnostic[] = []
    const valueNames = [...model.values.keys()]
    const laterLets = new Map(model.declarations.filter((d) => d.of === 'value').map((d) => [d.tok.text, d.line]))
    for (let idx = 0; idx < model.quantities.length; idx++) {
      const q = model.quantities[idx]
      const f = q.failure
      if (!f || f.reason !== 'unknown-name' || !f.name) continue
      const span = { start: q.expr.start + f.start, end: q.expr.start + f.end }
      const later = laterLets.get(f.name)
      const guess = closest(f.name, valueNames)
      out.push({
        code: 'unknown-name',
        severity: 'error',
        message:
          later !== undefined && later >= q.line
            ? `\`${f.name}\` is defined later, on line ${later + 1}; a value can use only the values defined above it`
            : `unknown name \`${f.name}\`${guess ? `; did you mean \`${guess}\`?` : ' (define it with `let`, or check the unit)'}`,
        span,
        fixes: guess ? [fix(`Change to \`${guess}\``, span, guess)] : [],
      })
    }
    const compartments = [...model.compartments.keys()]
    for (let idx = 0; idx < model.refs.length; idx++) {
      const r = model.refs[idx]
      if (r.resolved) continue
      const guess = closest(r.tok.text, compartments)
      out.push({
        code: 'unknown-name',
        severity: 'error',
        message: `no compartment \`${r.tok.text}\` in the cell${
          guess ? `; did you mean \`${guess}\`?` : compartments.length ? ` (declared: ${compartments.join(', ')})` : ' (declare it with `compartment NAME VOLUME` under `cell`)'
        }`,
        span: spanOf(r.tok),
        fixes: guess ? [fix(`Change to \`${guess}\``, spanOf(r.tok), guess)] : [],
      })
    }
    return out
  },
}
