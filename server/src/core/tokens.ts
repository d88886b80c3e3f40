// Semantic tokens, with the standard token types of LSP only:
//
//   keyword   statement keywords, step clause words, the connecting words (between, and, in, area,
//             drag, on, solution, at) and the electrode named by a `reaction` line
//   variable  `let` names (declaration + readonly where defined, readonly where used), compartment
//             names (declaration where defined) and unknown names inside expressions
//   type      separator kinds, handling kinds, vessel and electrode materials; units inside
//             expressions are `type` with the modifier defaultLibrary
//   struct    chemical formulas (charge items, expect / observe, species in a reaction)
//   number    numbers; operator: + - * / ^ and the `=` of `let`, `->` of a reaction
//   function  sqrt and abs; label: a step's label; string: the run title (with its quotes), note
//             and handling text; comment: comments
//
// Every token lies within one line and tokens do not overlap; they come sorted by position.
import type { Analysis } from './analyze'
import { type Span, spanOf } from './positions'
import { connectives, expressionsOf, isUnitName, letNames, scanExpression } from './scan'
import { keywordOf, type LineNode } from './syntax'

export const TOKEN_TYPES = ['keyword', 'variable', 'type', 'struct', 'number', 'operator', 'function', 'label', 'string', 'comment'] as const
export const TOKEN_MODIFIERS = ['declaration', 'readonly', 'defaultLibrary'] as const

export type TokenType = (typeof TOKEN_TYPES)[number]
export type TokenModifier = (typeof TOKEN_MODIFIERS)[number]

export interface SemanticToken {
  span: Span
  type: TokenType
  modifiers: TokenModifier[]
}

export function semanticTokens(a: Analysis): SemanticToken[] {
  const values = letNames(a.tree.lines)
  const out: SemanticToken[] = []
  const add = (span: Span | undefined, type: TokenType, ...modifiers: TokenModifier[]) => {
    if (span && span.end > span.start) out.push({ span, type, modifiers })
  }
  for (const n of a.tree.lines) {
    const kw = n.kind === 'error' ? undefined : keywordOf(n)
    if (kw) add(spanOf(kw), 'keyword')
    lineTokens(a, n, add)
    for (const s of connectives(a.text, n)) add(s, 'keyword')
    for (const e of expressionsOf(n)) {
      const toks = scanExpression(e)
      toks.forEach((t, i) => {
        const next = toks[i + 1]
        if (t.kind === 'number') add(t.span, 'number')
        else if (t.text === '°' && next?.kind === 'name' && /^[CF]$/.test(next.text) && next.span.start === t.span.end) {
          // `°C`: one unit.
          add({ start: t.span.start, end: next.span.end }, 'type', 'defaultLibrary')
          toks[i + 1] = { ...next, kind: 'punctuation' }
        } else if (t.kind === 'operator') add(t.span, 'operator')
        else if (t.kind === 'function') add(t.span, 'function', 'defaultLibrary')
        else if (isUnitName(t, toks[i + 1])) {
          // `wt%`: one unit over both tokens when they touch.
          if (t.text === 'wt' && next?.text === '%' && next.span.start === t.span.end) {
            add({ start: t.span.start, end: next.span.end }, 'type', 'defaultLibrary')
            toks[i + 1] = { ...next, kind: 'punctuation' }
          } else add(t.span, 'type', 'defaultLibrary')
        } else if (t.kind === 'name') add(t.span, 'variable', ...(values.has(t.text) ? (['readonly'] as const) : []))
      })
    }
    if (n.comment) add(n.comment, 'comment')
  }
  out.sort((x, y) => x.span.start - y.span.start || x.span.end - y.span.end)
  // Drop any overlap (none is expected), keeping the first.
  const clean: SemanticToken[] = []
  for (const t of out) {
    const last = clean[clean.length - 1]
    if (last && t.span.start < last.span.end) continue
    clean.push(t)
  }
  return clean
}

type Add = (span: Span | undefined, type: TokenType, ...modifiers: TokenModifier[]) => void

function lineTokens(a: Analysis, n: LineNode, add: Add): void {
  switch (n.kind) {
    case 'run': {
      const quoted = a.text[n.title.start - 1] === '"' && a.text[n.title.end] === '"'
      add(quoted ? { start: n.title.start - 1, end: n.title.end + 1 } : spanOf(n.title), 'string')
      break
    }
    case 'note':
      add(spanOf(n.text), 'string')
      break
    case 'let': {
      add(spanOf(n.name), 'variable', 'declaration', 'readonly')
      const eq = a.text.indexOf('=', n.name.end)
      if (eq >= 0 && eq < n.expr.start) add({ start: eq, end: eq + 1 }, 'operator')
      break
    }
    case 'vessel':
      add(spanOf(n.material), 'type')
      break
    case 'compartment':
      add(spanOf(n.name), 'variable', 'declaration')
      break
    case 'separator':
      add(spanOf(n.type), 'type')
      add(spanOf(n.between[0]), 'variable')
      add(spanOf(n.between[1]), 'variable')
      break
    case 'electrode':
      add(spanOf(n.material), 'type')
      add(spanOf(n.compartment), 'variable')
      break
    case 'charge':
      add(spanOf(n.compartment), 'variable')
      for (const item of n.items) add(spanOf(item.formula), 'struct')
      break
    case 'step':
      add(spanOf(n.label), 'label')
      for (const c of n.clauses) {
        add(spanOf(c.keyword), 'keyword')
        if (c.on) add(spanOf(c.on), 'keyword')
      }
      break
    case 'expect':
    case 'observe':
      add(spanOf(n.formula), 'struct')
      if (n.compartment) add(spanOf(n.compartment), 'variable')
      break
    case 'handling':
      add(spanOf(n.type), 'type')
      add(spanOf(n.text), 'string')
      break
    case 'reaction':
      add(spanOf(n.role), 'keyword')
      equationTokens(n.equation.text, n.equation.start, add)
      break
  }
}

/** `2 Cl- -> Cl2 + 2 e-`: coefficients, species and the arrow and plus signs. */
function equationTokens(text: string, base: number, add: Add): void {
  const re = /\S+/g
  for (let m = re.exec(text); m; m = re.exec(text)) {
    const w = m[0]
    const start = base + m.index
    if (/^(->|→|=|<->|⇌|\+)$/.test(w)) add({ start, end: start + w.length }, 'operator')
    else if (/^\d+(\.\d+)?$/.test(w)) add({ start, end: start + w.length }, 'number')
    else {
      const coef = /^\d+(?:\.\d+)?(?=[A-Za-z(\[])/.exec(w)
      if (coef) add({ start, end: start + coef[0].length }, 'number')
      const from = start + (coef ? coef[0].length : 0)
      add({ start: from, end: start + w.length }, 'struct')
    }
  }
}
