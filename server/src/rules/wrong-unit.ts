// wrong-unit: a value of the wrong kind for its place, e.g. a current given in volts. Where the
// value fits another step clause (a voltage after `current`), the fix changes the clause word.
import { spanOf } from '../core/positions'
import { fix, type Diagnostic, type Fix } from '../core/diagnostics'
import { KIND_LABEL, prettyUnit } from '../core/units'
import type { Rule } from './rule'

const CLAUSE_FOR_KIND: Record<string, string> = { current: 'current', 'current-density': 'current', voltage: 'voltage', time: 'for' }

export const wrongUnit: Rule = {
  code: 'wrong-unit',
  severity: 'error',
  summary: 'A value whose unit does not fit where it stands (a current in volts, a mass where a volume belongs).',
  check({ model }) {
    // A loop over every quantity of the document: most are of the kind expected and cost nothing.
    const out: Diagnostic[] = []
    for (let idx = 0; idx < model.quantities.length; idx++) {
      const q = model.quantities[idx]
      if (q.value === undefined || q.kind === undefined || q.anyKind) continue
      if (q.kind !== 'other' && q.expected.includes(q.kind)) continue
      const got =
        q.kind === 'other'
          ? `a quantity in ${prettyUnit(typeof q.value === 'number' ? '' : q.value.formatUnits())}`
          : KIND_LABEL[q.kind]
      const want = q.expected.map((k) => KIND_LABEL[k]).join(' or ')
      const fixes: Fix[] = []
      const kw = q.keyword
      if (kw && q.kind !== 'other' && CLAUSE_FOR_KIND[q.kind] && CLAUSE_FOR_KIND[q.kind] !== kw.text) {
        const to = CLAUSE_FOR_KIND[q.kind]
        fixes.push(fix(`Change \`${kw.text}\` to \`${to}\``, spanOf(kw), to))
      }
      if (q.kind === 'dimensionless' && q.expected.length === 1 && q.expected[0] !== 'dimensionless') {
        const unit: Record<string, string> = { mass: 'g', volume: 'mL', time: 'h', current: 'A', voltage: 'V', area: 'cm^2', amount: 'mol' }
        const u = unit[q.expected[0]]
        if (u) fixes.push(fix(`Add the unit \`${u}\``, { start: q.expr.end, end: q.expr.end }, ` ${u}`))
      }
      out.push({
        code: 'wrong-unit',
        severity: 'error',
        message: `${q.role} must be ${want}, but \`${q.expr.text}\` is ${got}`,
        span: spanOf(q.expr),
        fixes,
      })
    }
    return out
  },
}
