// noted-reason: a `# noted CODE: reason` comment must name a rule Cellrun has and give the reason;
// without them it acknowledges nothing.
import type { Diagnostic } from '../core/diagnostics'
import { mayBeNoted, NOTED_ANY } from './noted'
import type { Rule } from './rule'

export const notedReason: Rule = {
  code: 'noted-reason',
  severity: 'warning',
  summary: 'A `# noted CODE: reason` comment without a reason, or naming a rule that does not exist.',
  category: 'consistency',
  check({ model }) {
    const out: Diagnostic[] = []
    const text = model.tree.text
    for (let li = 0; li < model.tree.lines.length; li++) {
      const n = model.tree.lines[li]
      if (!n.comment || !mayBeNoted(text, n.comment.start)) continue
      const c = text.slice(n.comment.start, n.comment.end)
      const m = NOTED_ANY.exec(c)
      if (!m) continue
      const code = m[1]
      if (!knownCodes().has(code)) {
        out.push({ code: 'noted-reason', severity: 'warning', message: `\`${code}\` is not a Cellrun rule code; \`cellrun explain\` lists them`, span: n.comment, fixes: [] })
      } else if (!m[2]?.trim()) {
        out.push({ code: 'noted-reason', severity: 'warning', message: `say why ${code} is accepted here: \`# noted ${code}: REASON\`; without a reason it stays as it is`, span: n.comment, fixes: [] })
      }
    }
    return out
  },
}

let codes: Set<string> | undefined
/** Filled by the registry (index.ts) to avoid an import cycle. */
export function setKnownCodes(all: readonly string[]): void {
  codes = new Set(all)
}
function knownCodes(): Set<string> {
  return codes ?? new Set()
}
