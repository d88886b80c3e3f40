// beyond-faraday: an `expect` line plans more product than the charge passed can make (Faraday's
// law with the steps' current efficiencies), or more than the charged feed contains.
import { spanOf } from '../core/positions'
import { fix } from '../core/diagnostics'
import { prettyFormula } from '../core/formula'
import { fmt, fmtDown } from '../core/units'
import type { Rule } from './rule'

export const beyondFaraday: Rule = {
  code: 'beyond-faraday',
  severity: 'error',
  summary: "A planned yield larger than Faraday's law allows for the charge passed (or than the feed holds).",
  check({ model }) {
    return model.yields.flatMap((y) => {
      if (y.kind !== 'expect' || y.formedMol === undefined || y.maxMolEff === undefined || !y.reaction) return []
      const max = y.maxMolEff
      if (y.formedMol <= max * (1 + 1e-9)) return []
      const M = y.formula.formula.molarMass
      const pf = prettyFormula(y.formula.tok.text)
      const q = y.quantity
      // Speak in the unit the line uses: mass, amount, or gas volume at the run's conditions.
      const total = y.initialMol + max
      const shownWith = (f: (n: number) => string) =>
        q.kind === 'amount' ? `${f(total)} mol` : y.litresPerMol ? `${f(total * y.litresPerMol)} L` : `${f(total * M)} g`
      const shown = shownWith(fmt)
      // Round the replacement down, so the planned amount it writes stays within the maximum.
      const replacement = shownWith(fmtDown)
      const charged = y.initialMol > 0 ? `, with the ${fmt(y.initialMol * M)} g charged before the run` : ''
      const why = y.feedLimited
        ? `with the feed running out, the run forms at most ${shown}${charged} (${fmt(max)} mol formed)`
        : `the charge passed allows at most ${shown}${charged} (${fmt(max)} mol formed by ${y.reaction.equation})`
      return [
        {
          code: 'beyond-faraday',
          severity: 'error' as const,
          message: `planned ${pf} exceeds the theoretical maximum: ${why}`,
          span: spanOf(q.expr),
          fixes: replacement ? [fix(`Plan the theoretical maximum (${replacement})`, spanOf(q.expr), replacement)] : [],
        },
      ]
    })
  },
}
