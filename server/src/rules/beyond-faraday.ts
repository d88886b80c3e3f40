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
      const q = y.quantity
      // Speak in the unit the line uses: mass, amount, or gas volume at the run's conditions.
      const shown = q.kind === 'amount' ? `${fmt(max)} mol` : y.litresPerMol ? `${fmt(max * y.litresPerMol)} L` : `${fmt(max * M)} g`
      const why = feedLimited
        ? `the feed holds enough for only ${shown} (${y.limitWhy})`
        : `the charge passed makes at most ${shown} (${fmt(max)} mol at ${y.reaction.electrons} e⁻ each)`
      const replacement = shown
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
