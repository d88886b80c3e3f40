// include-file: an `include` that cannot be followed: the path leaves the workspace, the file cannot
// be read, including it makes a cycle, or the file has lines Cellrun cannot read.
import { spanOf } from '../core/positions'
import type { Diagnostic } from '../core/diagnostics'
import type { Rule } from './rule'

export const includeFile: Rule = {
  code: 'include-file',
  severity: 'error',
  summary: 'An `include` that leaves the workspace, cannot be read, makes a cycle, or names a file with unreadable lines.',
  category: 'consistency',
  check({ model }) {
    const out: Diagnostic[] = model.includeProblems.map((p) => ({
      code: 'include-file',
      severity: p.kind === 'syntax' ? ('warning' as const) : ('error' as const),
      message: p.message,
      span: p.span,
      fixes: [],
    }))
    if (!model.includesFollowed) {
      for (let li = 0; li < model.tree.lines.length; li++) {
        const n = model.tree.lines[li]
        if (n.kind !== 'include') continue
        out.push({ code: 'include-file', severity: 'information', message: 'includes are not followed here (no workspace to read from)', span: spanOf(n.path), fixes: [] })
      }
    }
    return out
  },
}
