// All position handling lives here.
//
// The core works in UTF-16 code-unit offsets into the document text (which is what a JavaScript
// string index is, and what LSP positions count by default). This module converts between
// offsets, 0-based {line, character} positions (LSP) and 1-based line:column pairs (the CLI).
// Line breaks: "\n", "\r\n" and a lone "\r" each end a line, as LSP specifies.

export interface Span {
  /** UTF-16 offset of the first character. */
  start: number
  /** UTF-16 offset one past the last character. */
  end: number
}

export interface Position {
  /** 0-based line. */
  line: number
  /** 0-based UTF-16 code-unit offset within the line. */
  character: number
}

export class LineIndex {
  /** Offsets at which each line starts. */
  readonly lineStarts: number[]

  constructor(readonly text: string) {
    const starts = [0]
    if (text.indexOf('\r') < 0) {
      // Only "\n" breaks (the usual case): the native search is much faster than a loop.
      for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n', i + 1)) starts.push(i + 1)
    } else {
      for (let i = 0; i < text.length; i++) {
        const c = text.charCodeAt(i)
        if (c === 13 /* \r */) {
          if (text.charCodeAt(i + 1) === 10) i++
          starts.push(i + 1)
        } else if (c === 10 /* \n */) {
          starts.push(i + 1)
        }
      }
    }
    this.lineStarts = starts
  }

  get lineCount(): number {
    return this.lineStarts.length
  }

  /** Offset where line `line` starts (clamped to the document). */
  lineStart(line: number): number {
    if (line <= 0) return 0
    if (line >= this.lineStarts.length) return this.text.length
    return this.lineStarts[line]
  }

  /** Offset just past the last content character of `line` (before its line break). */
  lineEnd(line: number): number {
    if (line < 0) return 0
    if (line >= this.lineStarts.length - 1) return this.text.length
    let end = this.lineStarts[line + 1]
    const t = this.text
    if (end > 0 && t.charCodeAt(end - 1) === 10) end--
    if (end > 0 && t.charCodeAt(end - 1) === 13) end--
    return end
  }

  /** The text of one line without its line break. */
  lineText(line: number): string {
    return this.text.slice(this.lineStart(line), this.lineEnd(line))
  }

  /** 0-based line containing `offset` (clamped). */
  lineOf(offset: number): number {
    const starts = this.lineStarts
    if (offset <= 0) return 0
    let lo = 0
    let hi = starts.length - 1
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1
      if (starts[mid] <= offset) lo = mid
      else hi = mid - 1
    }
    return lo
  }

  positionAt(offset: number): Position {
    const o = Math.max(0, Math.min(offset, this.text.length))
    const line = this.lineOf(o)
    const character = Math.min(o, this.lineEnd(line)) - this.lineStart(line)
    return { line, character }
  }

  /** Offset of an LSP position; a character past the end of its line clamps to the line end. */
  offsetAt(pos: Position): number {
    if (pos.line < 0) return 0
    if (pos.line >= this.lineStarts.length) return this.text.length
    const start = this.lineStart(pos.line)
    const end = this.lineEnd(pos.line)
    return Math.max(start, Math.min(start + Math.max(0, pos.character), end))
  }

  /** 1-based line and column for human output (the column counts UTF-16 units, as the editor does). */
  humanAt(offset: number): { line: number; column: number } {
    const p = this.positionAt(offset)
    return { line: p.line + 1, column: p.character + 1 }
  }
}

/** A span covering `[start, end)` of a string that itself starts at `base`. */
export function spanAt(base: number, start: number, end: number): Span {
  return { start: base + start, end: base + end }
}

export function spanContains(span: Span, offset: number): boolean {
  return offset >= span.start && offset <= span.end
}

/** Where a token stands, as a span of its own (a token is read in place; a span handed out is a copy). */
export function spanOf(t: Span): Span {
  return { start: t.start, end: t.end }
}
