// syntax: a line the parser could not read. The parser suggests a fix for a misspelt keyword.
import { fix } from '../core/diagnostics'
import type { Rule } from './rule'

export const syntax: Rule = {
  code: 'syntax',
  severity: 'error',
  summary: 'A line that does not follow the protocol format.',
  check({ model }) {
    return model.tree.lines.flatMap((n) =>
      n.kind === 'error'
        ? [
            {
              code: 'syntax',
              severity: 'error' as const,
              message: n.message,
              span: n.errorSpan,
              fixes: n.fix ? [fix(n.fix.title, n.fix.span, n.fix.newText)] : [],
            },
          ]
        : [],
    )
  },
}
