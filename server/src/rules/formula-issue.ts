// Shared by the formula rules: turn the formula parser's issues of some codes into diagnostics.
import { spanOf } from '../core/positions'
import { fix, type Diagnostic } from '../core/diagnostics'
import type { FormulaIssue } from '../core/formula'
import type { Model } from '../core/model'

export function formulaDiagnostics(model: Model, codes: readonly FormulaIssue['code'][], ruleCode: string): Diagnostic[] {
  const out: Diagnostic[] = []
  for (let idx = 0; idx < model.formulas.length; idx++) {
    const ff = model.formulas[idx]
    if (ff.isWater) continue
    for (const issue of ff.formula.issues) {
      if (!codes.includes(issue.code)) continue
      const base = ff.tok.start
      const span = { start: base + issue.start, end: base + Math.max(issue.end, issue.start + 1) }
      out.push({
        code: ruleCode,
        severity: issue.severity,
        message: issue.message,
        span: { start: span.start, end: Math.min(span.end, ff.tok.end) },
        fixes: issue.replacement !== undefined ? [fix(`Change to \`${issue.replacement}\``, spanOf(ff.tok), issue.replacement)] : [],
      })
    }
  }
  return out
}
