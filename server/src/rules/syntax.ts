// syntax: a line the parser could not read. The parser suggests a fix for a misspelt keyword.
import { fix, type Diagnostic } from '../core/diagnostics'
import type { Rule } from './rule'

export const syntax: Rule = {
  code: 'syntax',
  severity: 'error',
  summary: 'A line that does not follow the protocol format.',
  check({ model }) {
    const out: Diagnostic[] = []
    for (let li = 0; li < model.tree.lines.length; li++) {
      const n = model.tree.lines[li]
      if (n.kind !== 'error') continue
      out.push({ code: 'syntax', severity: 'error', message: n.message, span: n.errorSpan, fixes: n.fix ? [fix(n.fix.title, n.fix.span, n.fix.newText)] : [] })
    }
    return out
  },
}
