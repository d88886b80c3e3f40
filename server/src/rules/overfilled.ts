// overfilled: more liquid is charged into a compartment than its declared volume holds.
import { fmt } from '../core/units'
import type { Diagnostic } from '../core/diagnostics'
import type { Rule } from './rule'

export const overfilled: Rule = {
  code: 'overfilled',
  severity: 'warning',
  summary: 'The liquid charged into a compartment is more than its declared volume.',
  check({ model }) {
    const out: Diagnostic[] = []
    for (const c of model.compartments.values()) {
      if (c.volumeL === undefined || c.lastChargeLine === undefined) continue
      // 2 % allowance: volumes measured by cylinder, and dissolving salts change the volume anyway.
      if (c.chargedVolumeL <= c.volumeL * 1.02) continue
      out.push({
        code: 'overfilled',
        severity: 'warning',
        message: `${fmt(c.chargedVolumeL * 1000)} mL of liquid is charged into ${c.name}, which is declared as ${fmt(c.volumeL * 1000)} mL`,
        span: model.tree.lines[c.lastChargeLine].span,
        fixes: [],
      })
    }
    return out
  },
}
