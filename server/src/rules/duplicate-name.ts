// duplicate-name: a value or compartment defined twice. The first definition counts.
import { spanOf } from '../core/positions'
import type { Diagnostic } from '../core/diagnostics'
import type { Rule } from './rule'

export const duplicateName: Rule = {
  code: 'duplicate-name',
  severity: 'error',
  summary: 'A named value or a compartment defined more than once.',
  check({ model }) {
    const seen = new Map<string, number>()
    const out: Diagnostic[] = []
    for (let idx = 0; idx < model.declarations.length; idx++) {
      const d = model.declarations[idx]
      const key = `${d.of}:${d.tok.text}`
      const first = seen.get(key)
      if (first === undefined) {
        seen.set(key, d.line)
        continue
      }
      out.push({
        code: 'duplicate-name',
        severity: 'error',
        message: `${d.of === 'value' ? 'the value' : 'the compartment'} \`${d.tok.text}\` is already defined on line ${first + 1}`,
        span: spanOf(d.tok),
        fixes: [],
      })
    }
    return out
  },
}
