// missing-electrode: the protocol passes current but the cell has no anode or no cathode.
import type { Diagnostic } from '../core/diagnostics'
import type { Rule } from './rule'

export const missingElectrode: Rule = {
  code: 'missing-electrode',
  severity: 'warning',
  summary: 'Steps pass current but the cell declares no anode or no cathode.',
  check({ model }) {
    if (model.steps.length === 0) return []
    const cell = model.tree.lines.find((n) => n.kind === 'cell')
    const at = cell?.span ?? model.tree.lines.find((n) => n.kind === 'step')!.span
    const out: Diagnostic[] = []
    for (const role of ['anode', 'cathode'] as const) {
      if (model.electrodes.some((e) => e.role === role)) continue
      out.push({
        code: 'missing-electrode',
        severity: 'warning',
        message: `the cell has no ${role}; declare it, e.g. \`${role} ${role === 'anode' ? 'platinum' : 'nickel'} in COMPARTMENT, area 10 cm^2\``,
        span: at,
        fixes: [],
      })
    }
    return out
  },
}
