// Inline markers for test documents.
//   ⟦ ... ⟧   a range (e.g. where a diagnostic must be); several allowed, in order
//   ‸         a cursor position (e.g. where a hover is asked for); at most one
// `marked(src)` strips the markers and returns the clean text with the ranges and the cursor as
// UTF-16 offsets into the clean text.
export interface Marked {
  text: string
  ranges: { start: number; end: number }[]
  cursor?: number
}

export function marked(src: string): Marked {
  let text = ''
  const ranges: { start: number; end: number }[] = []
  const open: number[] = []
  let cursor: number | undefined
  for (const ch of src) {
    if (ch === '⟦') open.push(text.length)
    else if (ch === '⟧') {
      const start = open.pop()
      if (start === undefined) throw new Error('unbalanced ⟧ in test document')
      ranges.push({ start, end: text.length })
    } else if (ch === '‸') {
      if (cursor !== undefined) throw new Error('more than one cursor ‸ in test document')
      cursor = text.length
    } else text += ch
  }
  if (open.length) throw new Error('unclosed ⟦ in test document')
  ranges.sort((a, b) => a.start - b.start)
  return { text, ranges, ...(cursor !== undefined ? { cursor } : {}) }
}

/** Text covered by a span, for readable assertions. */
export function covered(text: string, span: { start: number; end: number }): string {
  return text.slice(span.start, span.end)
}
