// The structural invariants of one analysis, shared by the vitest suite (test/fuzz.test.ts) and the
// standalone fuzz runner (test/fuzz/run.ts). Plain Errors only, no test framework: `checkAll`
// throws an Error naming the first broken invariant, and lets any exception from the core through.
import { spanOf } from '../../server/src/core/positions'
import { analyze, hoverAt, outline, type Analysis, type OutlineItem } from '../../server/src/core/analyze'

export interface SpanLike {
  start: number
  end: number
}

function isSpan(v: unknown): v is SpanLike {
  return typeof v === 'object' && v !== null && typeof (v as SpanLike).start === 'number' && typeof (v as SpanLike).end === 'number'
}

/** Every span-shaped object reachable in plain data (syntax nodes are plain objects and arrays). */
export function spansIn(v: unknown, path: string, out: { path: string; span: SpanLike }[] = []): { path: string; span: SpanLike }[] {
  if (Array.isArray(v)) v.forEach((x, i) => spansIn(x, `${path}[${i}]`, out))
  else if (typeof v === 'object' && v !== null) {
    if (isSpan(v)) out.push({ path, span: v })
    for (const [k, x] of Object.entries(v)) if (typeof x === 'object') spansIn(x, `${path}.${k}`, out)
  }
  return out
}

/** Line bounds computed here, independently of the core's LineIndex: [start, end) without the break. */
export function lineBounds(text: string): { start: number; end: number }[] {
  const out: { start: number; end: number }[] = []
  const re = /\r\n|\r|\n/g
  let from = 0
  for (let m = re.exec(text); m; m = re.exec(text)) {
    out.push({ start: from, end: m.index })
    from = m.index + m[0].length
  }
  out.push({ start: from, end: text.length })
  return out
}

export function expectSpan(span: SpanLike, lo: number, hi: number, what: string): void {
  const ok = Number.isInteger(span.start) && Number.isInteger(span.end) && lo <= span.start && span.start <= span.end && span.end <= hi
  if (!ok) throw new Error(`${what}: span ${JSON.stringify(span)} is not within [${lo}, ${hi}] with start <= end`)
}

export function expectOffset(offset: number, hi: number, what: string): void {
  if (!Number.isInteger(offset) || offset < 0 || offset > hi) throw new Error(`${what}: offset ${offset} is outside [0, ${hi}]`)
}

/** Analyse `text` and check every structural invariant; returns the analysis for further checks. */
export function checkAll(text: string): Analysis {
  const a = analyze(text)
  const n = text.length
  const lines = lineBounds(text)

  // One node per line, in order, with its own line number. (Two independent line counts first: the
  // regex scan above and String.split must agree, or the check below would prove nothing.)
  const splitCount = text.split(/\r\n|\r|\n/).length
  if (splitCount !== lines.length) throw new Error(`the test's own line counts disagree: ${splitCount} by split, ${lines.length} by scan`)
  if (a.tree.lines.length !== lines.length) throw new Error(`${a.tree.lines.length} syntax nodes for ${lines.length} lines`)
  a.tree.lines.forEach((node, i) => {
    if (node.line !== i) throw new Error(`node ${i} says it is on line ${node.line}`)
    // Every span in a node (statement, keyword, tokens, comment, error, fix) stays on its own line.
    for (const { path, span } of spansIn(node, `line ${i} (${node.kind})`)) expectSpan(span, lines[i].start, lines[i].end, path)
  })

  for (const d of a.diagnostics) {
    expectSpan(d.span, 0, n, `diagnostic ${d.code}`)
    for (const f of d.fixes) for (const e of f.edits) expectSpan(e.span, 0, n, `fix "${f.title}" of ${d.code}`)
    // The core's defensive catch-alls turn a crash into a diagnostic; none should ever fire.
    if (/internal (parser )?error/.test(d.message)) throw new Error(`a rule or the parser crashed: ${d.message}`)
  }
  for (const c of a.computed) {
    expectSpan(c.span, 0, n, `computed ${c.key} span`)
    expectOffset(c.anchor, n, `computed ${c.key} anchor`)
  }
  for (const q of a.model.quantities) expectSpan(spanOf(q.expr), 0, n, `quantity ${q.role}`)
  for (const f of a.model.formulas) expectSpan(spanOf(f.tok), 0, n, `formula ${f.tok.text}`)
  for (const r of a.model.refs) expectSpan(spanOf(r.tok), 0, n, `reference ${r.tok.text}`)
  for (const d of a.model.declarations) expectSpan(spanOf(d.tok), 0, n, `declaration ${d.tok.text}`)

  // The editor-facing views must hold up too.
  const walk = (items: OutlineItem[]): void => {
    for (const it of items) {
      expectSpan(it.span, 0, n, `outline ${it.name} span`)
      expectSpan(it.selection, 0, n, `outline ${it.name} selection`)
      walk(it.children)
    }
  }
  walk(outline(a))
  const probes = new Set([0, n, n >> 1, ...a.diagnostics.map((d) => d.span.start), ...a.computed.map((c) => c.anchor)])
  for (const o of probes) {
    const h = hoverAt(a, o)
    if (h) expectSpan(h.span, 0, n, `hover at ${o}`)
  }
  return a
}
