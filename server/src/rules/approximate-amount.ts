// approximate-amount: a solution charged by volume with wt% (or by mass with mol/L or g/L) needs
// the solution's density, which v1 takes as water's. Fine for dilute solutions; for concentrated
// ones the amount can be off by tens of percent (98 wt% sulfuric acid is 1.84 g/mL, not 1.00).
import { fmt } from '../core/units'
import type { Rule } from './rule'

/** Above this mass fraction the water-density guess is off by more than a few percent. */
const DILUTE_LIMIT_PERCENT = 5 // common practice, no source: dilute solutions are within a few % of water's density

export const approximateAmount: Rule = {
  code: 'approximate-amount',
  severity: 'information',
  summary: "A solution amount that needed the solution's density, taken as water's; a warning when the solution is concentrated.",
  check({ model }) {
    return model.approximations.map((a) => {
      const concentrated = a.massPercent > DILUTE_LIMIT_PERCENT
      return {
        code: 'approximate-amount',
        severity: concentrated ? ('warning' as const) : ('information' as const),
        message: concentrated
          ? `about ${fmt(a.massPercent)} wt%: with the density of water assumed, this amount may be off by tens of percent; ${a.suggestion}`
          : `the solution density is taken as water's (dilute, about ${fmt(a.massPercent)} wt%); ${a.suggestion} for an exact amount`,
        span: a.span,
        fixes: [],
      }
    })
  },
}
