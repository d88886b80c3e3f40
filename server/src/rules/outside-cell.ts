// outside-cell: a part of the cell (compartment, separator, electrode, vessel) that is not indented
// under a `cell` line. It still counts; the fix indents it.
import { fix, type Diagnostic } from '../core/diagnostics'
import { spanOf } from '../core/positions'
import { keywordOf } from '../core/syntax'
import type { Rule } from './rule'

export const outsideCell: Rule = {
  code: 'outside-cell',
  severity: 'warning',
  summary: 'A compartment, separator, electrode or vessel line that is not indented under `cell`.',
  check({ model, index }) {
    const out: Diagnostic[] = []
    const hasCell = model.tree.lines.some((n) => n.kind === 'cell')
    // The fix can only indent a line that directly continues the cell block (after the `cell` line
    // or its indented parts, blank lines aside); elsewhere indenting would not put it in the cell.
    let continuesCell = false
    for (let li = 0; li < model.tree.lines.length; li++) {
      const n = model.tree.lines[li]
      if (n.kind === 'blank') continue
      const part = 'inCell' in n
      if (part && !n.inCell) {
        const lineStart = index.lineStart(n.line)
        const kw = keywordOf(n)
        out.push({
          code: 'outside-cell',
          severity: 'warning',
          message: hasCell
            ? `\`${kw?.text}\` describes the cell: ${continuesCell ? 'indent it under the `cell` line' : 'move it, indented, under the `cell` line'}`
            : `\`${kw?.text}\` describes the cell: put it, indented, under a \`cell\` line`,
          span: spanOf(kw ?? n.span),
          fixes: continuesCell && n.indent === 0 ? [fix('Indent under `cell`', { start: lineStart, end: lineStart }, '  ')] : [],
        })
      }
      continuesCell = n.kind === 'cell' || (part && n.inCell) || (continuesCell && part && n.indent === 0)
    }
    return out
  },
}
