// step-incomplete: a step that cannot give a charge: no duration, no current or voltage, a current
// density with no electrode area to multiply it by, or a constant-voltage step with no current.
import { fix, type Diagnostic } from '../core/diagnostics'
import type { Rule } from './rule'

export const stepIncomplete: Rule = {
  code: 'step-incomplete',
  severity: 'error',
  summary: 'A step that does not say enough to compute its charge.',
  check({ model }) {
    const out: Diagnostic[] = []
    for (let idx = 0; idx < model.steps.length; idx++) {
      const s = model.steps[idx]
      const end = { start: s.span.end, end: s.span.end }
      if (!s.hasDurationClause) {
        out.push({
          code: 'step-incomplete',
          severity: 'error',
          message: `step ${s.label} needs a duration, e.g. \`for 2 h\``,
          span: s.span,
          fixes: [fix('Add a duration', end, ' for 1 h')],
        })
      }
      if (!s.hasCurrentClause && !s.hasVoltageClause) {
        out.push({
          code: 'step-incomplete',
          severity: 'error',
          message: `step ${s.label} needs a \`current\` (or \`voltage\` with the expected current)`,
          span: s.span,
          fixes: [],
        })
      } else if (!s.hasCurrentClause) {
        out.push({
          code: 'step-incomplete',
          severity: 'information',
          message: `step ${s.label} holds the voltage; its current is not known, so its charge is left out of the totals. Add the expected current, e.g. \`, current 1.5 A\``,
          span: s.span,
          fixes: [fix('Add an expected current', end, ', current 1 A')],
        })
      }
      if (s.densityWithoutArea) {
        const on = s.densityWithoutArea.on
        out.push({
          code: 'step-incomplete',
          severity: 'error',
          message:
            on === 'cathode'
              ? 'a current density is taken over the cathode area: give every cathode an area (`cathode ... in ..., area 36 cm^2`), or write `on anode` / `on separator`'
              : `a current density \`on ${on}\` needs an area on every ${on} (\`, area 36 cm^2\`)`,
          span: s.densityWithoutArea.span,
          fixes: [],
        })
      }
    }
    return out
  },
}
