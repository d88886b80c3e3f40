// beyond-faraday: an `expect` line plans more product than the charge passed can make (Faraday's
// law with the steps' current efficiencies), or more than the charged feed contains.
import { fix } from '../core/diagnostics'
import { prettyFormula } from '../core/formula'
import { fmt } from '../core/units'
import type { Rule } from './rule'

export const beyondFaraday: Rule = {
  code: 'beyond-faraday',
  severity: 'error',
  summary: "A planned yield larger than Faraday's law allows for the charge passed (or than the feed holds).",
  check({ model }) {
    return model.yields.flatMap((y) => {
      if (y.kind !== 'expect' || y.mol === undefined || y.maxMolEff === undefined || !y.reaction) return []
      const feedLimited = y.limitMol !== undefined && y.limitMol < y.maxMolEff
      const max = feedLimited ? y.limitMol! : y.maxMolEff
      if (y.mol <= max * (1 + 1e-9)) return []
      const M = y.formula.formula.molarMass
      const pf = prettyFormula(y.formula.tok.text)
      const why = feedLimited
        ? `the feed holds enough for only ${fmt(max * M)} g (${y.limitWhy})`
        : `the charge passed makes at most ${fmt(max * M)} g (${fmt(max)} mol at ${y.reaction.electrons} e⁻ each)`
      const q = y.quantity
      const replacement = q.kind === 'amount' ? `${fmt(max)} mol` : q.kind === 'mass' ? `${fmt(max * M)} g` : undefined
      return [
        {
          code: 'beyond-faraday',
          severity: 'error' as const,
          message: `planned ${pf} exceeds the theoretical maximum: ${why}`,
          span: q.expr.span,
          fixes: replacement ? [fix(`Plan the theoretical maximum (${replacement})`, q.expr.span, replacement)] : [],
        },
      ]
    })
  },
}
