// bad-reaction: a stated half-reaction that cannot be read, or whose electrons stand on the wrong
// side for its electrode: an anode takes electrons from the solution (they appear among the
// products), a cathode gives them (they appear among the reactants).
import { spanOf } from '../core/positions'
import type { Diagnostic } from '../core/diagnostics'
import type { Rule } from './rule'

export const badReaction: Rule = {
  code: 'bad-reaction',
  severity: 'error',
  summary: 'A stated half-reaction that cannot be read, has no electrons, or has them on the wrong side for its electrode.',
  check({ model }) {
    const out: Diagnostic[] = []
    for (const r of model.reactions) {
      const base = r.equation.start
      for (const e of r.parsed.errors) {
        out.push({
          code: 'bad-reaction',
          severity: 'error',
          message: e.message,
          span: { start: base + e.start, end: base + Math.max(e.end, e.start + 1) > r.equation.end ? r.equation.end : base + Math.max(e.end, e.start + 1) },
          fixes: [],
        })
      }
      if (!r.parsed.ok) continue
      const want = r.role === 'anode' ? 'right' : 'left'
      if (r.electronSide === want) continue
      const what =
        r.electronSide === 'none'
          ? 'has no electrons: a half-reaction at an electrode gives or takes them (write them as `e-`)'
          : r.electronSide === 'both'
            ? 'has electrons on both sides'
            : r.role === 'anode'
              ? 'takes electrons, which makes it a reduction; an anode oxidises (electrons on the right: `2 Cl- -> Cl2 + 2 e-`)'
              : 'gives electrons, which makes it an oxidation; a cathode reduces (electrons on the left: `Cu^2+ + 2 e- -> Cu`)'
      out.push({ code: 'bad-reaction', severity: 'error', message: `this ${r.role} reaction ${what}`, span: spanOf(r.equation), fixes: [] })
    }
    return out
  },
}
