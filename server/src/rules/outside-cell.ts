// outside-cell: a part of the cell (compartment, separator, electrode, vessel) that is not indented
// under a `cell` line. It still counts; the fix indents it.
import { fix, type Diagnostic } from '../core/diagnostics'
import type { Rule } from './rule'

export const outsideCell: Rule = {
  code: 'outside-cell',
  severity: 'warning',
  summary: 'A compartment, separator, electrode or vessel line that is not indented under `cell`.',
  check({ model, index }) {
    const out: Diagnostic[] = []
    const hasCell = model.tree.lines.some((n) => n.kind === 'cell')
    for (const n of model.tree.lines) {
      if (!('inCell' in n) || n.inCell) continue
      const lineStart = index.lineStart(n.line)
      out.push({
        code: 'outside-cell',
        severity: 'warning',
        message: hasCell
          ? `\`${n.keyword?.text}\` describes the cell: indent it under the \`cell\` line`
          : `\`${n.keyword?.text}\` describes the cell: put it, indented, under a \`cell\` line`,
        span: n.keyword?.span ?? n.span,
        fixes: hasCell ? [fix('Indent under `cell`', { start: lineStart, end: lineStart + n.indent }, '  ')] : [],
      })
    }
    return out
  },
}
