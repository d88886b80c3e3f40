// two-amounts: an amount stated two ways that disagree, `K2CO3 260 g (2.1 mol)`. Usually a slip in
// one of them (a wrong molar mass, a hydrate counted as anhydrous); the fix rewrites the second
// from the first.
import { fix } from '../core/diagnostics'
import { fmt } from '../core/units'
import type { Rule } from './rule'

/** Rounding a written amount to 3 significant figures moves it by up to 0.5 %. */
const TOLERANCE = 0.005

export const twoAmounts: Rule = {
  code: 'two-amounts',
  severity: 'error',
  summary: 'An amount stated two ways (mass and moles, or volume) that disagree.',
  check({ model }) {
    return model.twoWays.flatMap((t) => {
      const rel = Math.abs(t.second - t.first) / Math.max(Math.abs(t.first), 1e-300)
      if (rel <= TOLERANCE) return []
      return [
        {
          code: 'two-amounts',
          severity: 'error' as const,
          message: `the two statements of ${t.what} disagree: ${fmt(t.first, 4)} mol against ${fmt(t.second, 4)} mol (${fmt(rel * 100)} % apart); the first gives ${t.suggestion}`,
          span: t.span,
          fixes: [fix(`Change to ${t.suggestion}`, t.span, t.suggestion)],
        },
      ]
    })
  },
}
