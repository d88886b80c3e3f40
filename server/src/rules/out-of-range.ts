// out-of-range: values outside what is physically possible (a negative mass, an efficiency above
// 100 %) or outside what an aqueous run can be (a liquid-water temperature at the stated pressure).
import { spanOf } from '../core/positions'
import { fix, type Diagnostic } from '../core/diagnostics'
import { ZERO_CELSIUS } from '../core/constants'
import { fmt } from '../core/units'
import type { Rule } from './rule'

export const outOfRange: Rule = {
  code: 'out-of-range',
  severity: 'error',
  summary: 'A value outside its physical range: negative amounts, zero durations, efficiency above 100 %, ice or steam.',
  check({ model }) {
    const out: Diagnostic[] = []
    for (let idx = 0; idx < model.quantities.length; idx++) {
      const q = model.quantities[idx]
      if (q.number === undefined || !q.constraint) continue
      const v = q.number
      if (q.constraint === 'fraction') {
        if (v > 1 && v <= 100 && !q.expr.text.includes('%')) {
          out.push({
            code: 'out-of-range',
            severity: 'error',
            message: `${q.role} is ${fmt(v)}, which is ${fmt(v * 100)} %; write \`${q.expr.text} %\` for percent`,
            span: spanOf(q.expr),
            fixes: [fix('Read it as percent', { start: q.expr.end, end: q.expr.end }, ' %')],
          })
        } else if (v > 1 || v <= 0) {
          out.push({
            code: 'out-of-range',
            severity: 'error',
            message: `${q.role} must be above 0 % and at most 100 %; it is ${fmt(v * 100)} %`,
            span: spanOf(q.expr),
            fixes: [],
          })
        }
        continue
      }
      const bad = q.constraint === 'positive' ? v <= 0 : v < 0
      if (bad) {
        out.push({
          code: 'out-of-range',
          severity: 'error',
          message: `${q.role} must be ${q.constraint === 'positive' ? 'greater than zero' : 'zero or more'}`,
          span: spanOf(q.expr),
          fixes: [],
        })
      }
    }
    // An aqueous run needs liquid water: 0-100 °C near atmospheric pressure (wider under pressure).
    const tq = model.quantities.find((q) => q.kind === 'temperature' && q.number !== undefined && q.role.startsWith('a run condition'))
    if (tq && tq.number! > 0) {
      const c = tq.number! - ZERO_CELSIUS
      const highPressure = model.pressurePa > 150000
      if (c < 0 || (c > 100 && !highPressure)) {
        out.push({
          code: 'out-of-range',
          severity: 'warning',
          message: `${fmt(c)} °C is outside the liquid range of water at this pressure; an aqueous run needs 0-100 °C near 1 atm`,
          span: spanOf(tq.expr),
          fixes: [],
        })
      }
    }
    return out
  },
}
