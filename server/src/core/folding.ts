// Folding ranges: the `cell` block, runs of comment lines, `# region` ... `# endregion` markers, and
// runs of consecutive `charge`, `step` and `handling` lines. Lines are 0-based; a range folds the
// lines after its start line up to and including its end line.
import type { Analysis } from './analyze'

export interface FoldingRange {
  startLine: number
  endLine: number
  kind?: 'comment' | 'region'
}

const REGION = /^#\s*region\b/i
const END_REGION = /^#\s*endregion\b/i

export function foldingRanges(a: Analysis): FoldingRange[] {
  const lines = a.tree.lines
  const out: FoldingRange[] = []
  const commentOnly = (i: number) => {
    const n = lines[i]
    return n.kind === 'blank' && n.comment !== undefined
  }
  const commentText = (i: number) => {
    const c = lines[i].comment
    return c ? a.text.slice(c.start, c.end).trim() : ''
  }
  const marker = (i: number) => commentOnly(i) && (REGION.test(commentText(i)) || END_REGION.test(commentText(i)))

  // The cell block: the `cell` line and the indented lines that follow it (blank lines between them).
  for (let i = 0; i < lines.length; i++) {
    if (lines[i].kind !== 'cell') continue
    let end = i
    for (let j = i + 1; j < lines.length; j++) {
      const n = lines[j]
      if (n.kind === 'blank') {
        if (n.comment && n.indent > 0) end = j
        continue
      }
      if (n.indent === 0) break
      end = j
    }
    if (end > i) out.push({ startLine: i, endLine: end })
  }

  // Runs of comment-only lines (region markers apart).
  for (let i = 0; i < lines.length; i++) {
    if (!commentOnly(i) || marker(i)) continue
    let j = i
    while (j + 1 < lines.length && commentOnly(j + 1) && !marker(j + 1)) j++
    if (j > i) out.push({ startLine: i, endLine: j, kind: 'comment' })
    i = j
  }

  // # region ... # endregion, nested.
  const open: number[] = []
  for (let i = 0; i < lines.length; i++) {
    if (!commentOnly(i)) continue
    const t = commentText(i)
    if (REGION.test(t)) open.push(i)
    else if (END_REGION.test(t)) {
      const start = open.pop()
      if (start !== undefined && i > start) out.push({ startLine: start, endLine: i, kind: 'region' })
    }
  }

  // Runs of consecutive charge, step and handling lines.
  for (let i = 0; i < lines.length; i++) {
    const kind = lines[i].kind
    if (kind !== 'charge' && kind !== 'step' && kind !== 'handling') continue
    let j = i
    while (j + 1 < lines.length && lines[j + 1].kind === kind) j++
    if (j > i) out.push({ startLine: i, endLine: j })
    i = j
  }

  return out.sort((x, y) => x.startLine - y.startLine || y.endLine - x.endLine)
}
