// Document formatting: one space between words, `key = value`, `, ` after the commas of a list,
// `: ` after the header of charge, step, handling and reaction lines, two-space indentation for
// indented lines (cell parts), one space before a comment that follows code, no trailing white
// space, and at most two blank lines in a row. Line breaks are kept as they are.
//
// Formatting never changes what the protocol means. Free text is left as written (the run title,
// `note` and `handling` text, comments), a line the parser cannot read only has its indentation
// and trailing space tidied, and an indented line stays indented (indentation decides what
// belongs to the cell). As a last guard the result is analysed again: when its diagnostics (codes,
// severities, messages) or its computed labels differ from the original's, because a message
// quotes text as written, the lines concerned are only tidied, and failing that the document is
// left as it is. Formatting twice gives the same text as formatting once.
import { analyze, type Analysis } from './analyze'
import type { Edit } from './diagnostics'
import type { ModelOptions } from './model'
import { commentStart } from './parser'
import { type LineIndex, type Span, spanOf } from './positions'
import type { LineNode } from './syntax'

export interface FormatResult {
  /** The formatted text (the original when nothing changes). */
  text: string
  /** Minimal edits from the original to the formatted text, in document order, not overlapping. */
  edits: Edit[]
}

/** The most blank lines kept in a row. */
export const MAX_BLANK_LINES = 2

/**
 * Format a document. `original` may pass an analysis of `text` made with the same options (the
 * editor has one cached); `options` must be those the document is analysed with.
 */
export function formatDocument(text: string, options: ModelOptions = {}, original?: Analysis): FormatResult {
  const a = original && original.text === text ? original : analyze(text, options)
  const index = a.index
  const count = index.lineCount
  const raw = Array.from({ length: count }, (_, i) => index.lineText(i))
  const safe = raw.map((r) => tidyLine(r).text)
  const full = raw.map((r, i) => formatLine(r, a.tree.lines[i], index.lineStart(i), text))
  const drops = blankDrops(safe)
  const target = signature(a)
  const perLine0 = lineSignatures(a)

  const attempt = (lines: string[], drop: ReadonlySet<number>): { text: string; ok: boolean; analysis?: Analysis } => {
    const t = assemble(text, index, lines, drop)
    if (t === text) return { text: t, ok: true }
    const b = analyze(t, options)
    return { text: t, ok: sameList(signature(b), target), analysis: b }
  }

  // The usual case: everything formatted, blank runs collapsed.
  const first = attempt(full, drops)
  if (first.ok) return result(text, index, first.text, full, drops)

  // Otherwise find the lines whose formatting changes what the analysis says, and only tidy those.
  const lines = [...full]
  const none = new Set<number>()
  let current = attempt(lines, none)
  for (let round = 0; !current.ok && round < 4; round++) {
    const changed = current.analysis ? lineSignatures(current.analysis) : new Map<number, string[]>()
    let culprits = [...new Set([...perLine0.keys(), ...changed.keys()])].filter(
      (i) => i < count && lines[i] !== safe[i] && !sameList(perLine0.get(i) ?? [], changed.get(i) ?? []),
    )
    if (culprits.length === 0) culprits = lines.map((_, i) => i).filter((i) => lines[i] !== safe[i])
    if (culprits.length === 0) break
    for (const i of culprits) lines[i] = safe[i]
    current = attempt(lines, none)
  }
  if (!current.ok) {
    for (let i = 0; i < count; i++) lines[i] = safe[i]
    current = attempt(lines, none)
    if (!current.ok) return { text, edits: [] }
  }
  if (drops.size > 0) {
    const collapsed = attempt(lines, drops)
    if (collapsed.ok) return result(text, index, collapsed.text, lines, drops)
  }
  return result(text, index, current.text, lines, none)
}

function result(original: string, index: LineIndex, text: string, lines: string[], drop: ReadonlySet<number>): FormatResult {
  if (text === original) return { text, edits: [] }
  const edits: Edit[] = []
  for (let i = 0; i < index.lineCount; i++) {
    const start = index.lineStart(i)
    const end = index.lineEnd(i)
    if (drop.has(i)) {
      const next = index.lineStart(i + 1)
      const prev = edits[edits.length - 1]
      if (prev && prev.newText === '' && prev.span.end === start) prev.span = { start: prev.span.start, end: next }
      else edits.push({ span: { start, end: next }, newText: '' })
      continue
    }
    const old = original.slice(start, end)
    const now = lines[i]
    if (old === now) continue
    // Only the part that differs: common prefix and suffix stay.
    let p = 0
    while (p < old.length && p < now.length && old[p] === now[p]) p++
    let s = 0
    while (s < old.length - p && s < now.length - p && old[old.length - 1 - s] === now[now.length - 1 - s]) s++
    edits.push({ span: { start: start + p, end: end - s }, newText: now.slice(p, now.length - s) })
  }
  return { text, edits }
}

/** The text with each line replaced and the dropped lines (and their line breaks) removed. */
function assemble(text: string, index: LineIndex, lines: readonly string[], drop: ReadonlySet<number>): string {
  let out = ''
  for (let i = 0; i < index.lineCount; i++) {
    if (drop.has(i)) continue
    out += lines[i] + text.slice(index.lineEnd(i), index.lineStart(i + 1))
  }
  return out
}

/** Blank lines to drop so that no more than MAX_BLANK_LINES stand in a row (the last ones of a run stay). */
function blankDrops(lines: readonly string[]): Set<number> {
  const drop = new Set<number>()
  for (let i = 0; i < lines.length; i++) {
    if (lines[i] !== '') continue
    let j = i
    while (j + 1 < lines.length && lines[j + 1] === '') j++
    for (let k = i; k <= j - MAX_BLANK_LINES; k++) drop.add(k)
    i = j
  }
  return drop
}

/** What formatting must keep: diagnostics (code, severity, message) and computed labels. */
export function signature(a: Analysis): string[] {
  return [
    ...a.diagnostics.map((d) => `diagnostic\u0000${d.code}\u0000${d.severity}\u0000${d.message}`),
    ...a.computed.map((c) => `computed\u0000${c.key}\u0000${c.label}`),
  ].sort()
}

function lineSignatures(a: Analysis): Map<number, string[]> {
  const out = new Map<number, string[]>()
  const put = (line: number, s: string) => {
    if (!out.has(line)) out.set(line, [])
    out.get(line)!.push(s)
  }
  for (const d of a.diagnostics) put(a.index.lineOf(d.span.start), `${d.code}\u0000${d.severity}\u0000${d.message}`)
  for (const c of a.computed) put(c.line, `${c.key}\u0000${c.label}`)
  for (const v of out.values()) v.sort()
  return out
}

function sameList(x: readonly string[], y: readonly string[]): boolean {
  return x.length === y.length && x.every((v, i) => v === y[i])
}

// ------------------------------------------------------------------------------------------------
// One line

interface Parts {
  /** Indentation as written. */
  indent: number
  /** The statement, from after the indentation to before the comment, trailing space removed. */
  code: string
  /** The comment, trailing space removed ('' when none). */
  comment: string
  text: string
}

/** Indentation (two spaces when indented at all), one space before a comment, no trailing space. */
function tidyLine(raw: string): Parts {
  const hash = commentStart(raw)
  const body = hash >= 0 ? raw.slice(0, hash) : raw
  const indent = body.length - body.trimStart().length
  const code = body.trimEnd().slice(Math.min(indent, body.trimEnd().length))
  const comment = hash >= 0 ? raw.slice(hash).trimEnd() : ''
  const lead = indent > 0 && (code !== '' || comment !== '') ? '  ' : ''
  return { indent, code, comment, text: join(lead, code, comment) }
}

function join(lead: string, code: string, comment: string): string {
  if (code === '' && comment === '') return ''
  return lead + code + (comment ? (code ? ' ' : '') + comment : '')
}

/** The whole line formatted: tidied, and the statement's spacing normalised. */
function formatLine(raw: string, node: LineNode | undefined, base: number, text: string): string {
  const tidy = tidyLine(raw)
  if (!node || node.kind === 'error' || node.kind === 'blank' || tidy.code === '') return tidy.text
  const codeStart = base + tidy.indent
  const lead = tidy.indent > 0 ? '  ' : ''
  return join(lead, normaliseCode(tidy.code, codeStart, node, text), tidy.comment)
}

/** Free text kept as written: the run title (with its quotes), note and handling text. */
function protectedSpans(node: LineNode, text: string): Span[] {
  switch (node.kind) {
    case 'run': {
      const t = spanOf(node.title)
      return [text[t.start - 1] === '"' && text[t.end] === '"' ? { start: t.start - 1, end: t.end + 1 } : t]
    }
    case 'note':
      return [spanOf(node.text)]
    case 'handling':
      return [spanOf(node.text)]
    default:
      return []
  }
}

/** The `:` that ends the header of a charge, step, handling or reaction line (absolute offset). */
function headerColon(node: LineNode, text: string): number | undefined {
  const after =
    node.kind === 'charge' ? node.compartment.end : node.kind === 'step' ? node.label.end : node.kind === 'handling' ? node.type.end : node.kind === 'reaction' ? node.role.end : undefined
  if (after === undefined) return undefined
  const at = text.indexOf(':', after)
  return at >= 0 ? at : undefined
}

const isBlank = (c: string | undefined) => c === ' ' || c === '\t'

function normaliseCode(code: string, codeStart: number, node: LineNode, text: string): string {
  const keep = protectedSpans(node, text)
  const colon = headerColon(node, text)
  const eq = node.kind === 'let' ? text.indexOf('=', node.name.end) : undefined
  let out = ''
  /** The output ends with a space that collapsing made (and that a comma or colon may take back). */
  let softSpace = false
  let depth = 0
  let i = 0
  const skipBlanks = () => {
    while (i < code.length && isBlank(code[i])) i++
  }
  while (i < code.length) {
    const abs = codeStart + i
    const kept = keep.find((s) => abs >= s.start && abs < s.end)
    if (kept) {
      const end = kept.end - codeStart
      out += code.slice(i, end)
      i = end
      softSpace = false
      continue
    }
    const c = code[i]
    if (isBlank(c)) {
      let j = i
      while (j < code.length && isBlank(code[j])) j++
      // A run that touches other white space (no-break, thin...) is left as written.
      if (/\s/.test(code[j] ?? '') || /\s/.test(code[i - 1] ?? '')) {
        out += code.slice(i, j)
        softSpace = false
      } else {
        out += ' '
        softSpace = true
      }
      i = j
      continue
    }
    const separator = (c === ',' && depth <= 0) || abs === colon
    if (separator || abs === eq) {
      if (softSpace) out = out.slice(0, -1)
      i++
      skipBlanks()
      const more = i < code.length && !/\s/.test(code[i])
      if (abs === eq) out += i < code.length ? ' = ' : ' ='
      else out += more ? `${c} ` : c
      softSpace = more
      continue
    }
    if (c === '(' || c === '[') depth++
    else if (c === ')' || c === ']') depth--
    out += c
    softSpace = false
    i++
  }
  return out
}
