// unknown-kind: a separator kind or a handling kind that Cellrun does not know.
import { fix, type Diagnostic } from '../core/diagnostics'
import { spanOf } from '../core/positions'
import { HANDLING_KINDS, SEPARATOR_KINDS, type Tok } from '../core/syntax'
import { closest } from '../core/text'
import type { Rule } from './rule'

export const unknownKind: Rule = {
  code: 'unknown-kind',
  severity: 'error',
  summary: 'A separator kind or handling kind that is not one of the known words.',
  check({ model }) {
    const out: Diagnostic[] = []
    const check = (tok: Tok, known: readonly string[], what: string, severity: 'error' | 'warning') => {
      if (known.includes(tok.text)) return
      const guess = closest(tok.text, known)
      out.push({
        code: 'unknown-kind',
        severity,
        message: `unknown ${what} \`${tok.text}\`; expected one of ${known.join(', ')}`,
        span: spanOf(tok),
        fixes: guess ? [fix(`Change to \`${guess}\``, spanOf(tok), guess)] : [],
      })
    }
    for (const s of model.separators) check(s.type, SEPARATOR_KINDS, 'separator kind', 'error')
    for (const h of model.handling) check(h.type, HANDLING_KINDS, 'handling kind', 'warning')
    return out
  },
}
