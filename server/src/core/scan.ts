// Reading a syntax tree a second time, for the editor features (references, semantic tokens,
// completion): the expressions each line holds, the tokens inside an expression, and the
// connecting words (`between`, `and`, `in`, `area`...) that the tree does not keep. Pure: plain
// data in and out; no mathjs (expressions are scanned here, not parsed).
import type { Span } from './positions'
import type { Expr, LineNode, Tok } from './syntax'
import { isUnitSymbol } from './units'

/** Every expression a line holds, in order of position. */
export function expressionsOf(n: LineNode): Expr[] {
  const out: Expr[] = []
  switch (n.kind) {
    case 'conditions':
      out.push(...n.items)
      break
    case 'let':
      out.push(n.expr)
      break
    case 'compartment':
      out.push(n.volume)
      break
    case 'separator':
      if (n.area) out.push(n.area)
      if (n.drag) out.push(n.drag)
      break
    case 'electrode':
      if (n.area) out.push(n.area)
      break
    case 'charge':
      for (const item of n.items) {
        out.push(item.quantity)
        if (item.concentration) out.push(item.concentration)
        if (item.alternate) out.push(item.alternate)
      }
      break
    case 'step':
      for (const c of n.clauses) out.push(c.expr)
      break
    case 'expect':
    case 'observe':
      out.push(n.quantity)
      if (n.alternate) out.push(n.alternate)
      break
  }
  return out.sort((a, b) => a.start - b.start)
}

export type ExprTokenKind = 'number' | 'name' | 'function' | 'operator' | 'punctuation' | 'other'

export interface ExprToken {
  kind: ExprTokenKind
  text: string
  span: Span
}

const FUNCTIONS = new Set(['sqrt', 'abs'])
// `²` and `³` are read as powers (`cm²` is `cm^2`), not as part of a name.
const NAME = /[\p{L}_$](?:(?![²³])[\p{L}\p{N}_$])*/uy
const NUMBER = /(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?/y
const SPACE = /\s+/y

/**
 * The tokens of an expression as written: numbers, names (let values, units, constants), the
 * functions `sqrt` and `abs`, operators and brackets. Mirrors how the expression reader sees
 * names: a name starts with a letter, `_` or `$` and runs over letters, digits, `_` and `$`
 * (so `area2` is one name and `2area` is a number and a name).
 */
export function scanExpression(e: Expr): ExprToken[] {
  const out: ExprToken[] = []
  const t = e.text
  let i = 0
  const at = (re: RegExp): string | null => {
    re.lastIndex = i
    const m = re.exec(t)
    return m ? m[0] : null
  }
  while (i < t.length) {
    const sp = at(SPACE)
    if (sp) {
      i += sp.length
      continue
    }
    const num = at(NUMBER)
    if (num) {
      out.push({ kind: 'number', text: num, span: { start: e.start + i, end: e.start + i + num.length } })
      i += num.length
      continue
    }
    const name = at(NAME)
    if (name) {
      const after = /^\s*\(/.test(t.slice(i + name.length))
      out.push({ kind: FUNCTIONS.has(name) && after ? 'function' : 'name', text: name, span: { start: e.start + i, end: e.start + i + name.length } })
      i += name.length
      continue
    }
    const c = t[i]
    const kind: ExprTokenKind = '+-*/^−·×⋅²³'.includes(c) ? 'operator' : '()[]'.includes(c) ? 'punctuation' : 'other'
    // Keep a surrogate pair together.
    const width = c.charCodeAt(0) >= 0xd800 && c.charCodeAt(0) <= 0xdbff && i + 1 < t.length ? 2 : 1
    out.push({ kind, text: t.slice(i, i + width), span: { start: e.start + i, end: e.start + i + width } })
    i += width
  }
  return out
}

/**
 * A name that is a unit in an expression (`wt` of `wt%` included, `%` is a unit too; `µA` is
 * `uA`, as the expression reader takes it).
 */
export function isUnitName(tok: ExprToken, next?: ExprToken): boolean {
  if (tok.kind === 'other' && tok.text === '%') return true
  if (tok.kind !== 'name') return false
  if (tok.text === 'wt' && next?.text === '%') return true
  return isUnitSymbol(tok.text.replace(/^[µμ]/, 'u'))
}

/** The names of the `let` values a document defines (a name of a unit defines nothing). */
export function letNames(lines: readonly LineNode[]): Set<string> {
  const out = new Set<string>()
  for (const n of lines) if (n.kind === 'let' && !isUnitSymbol(n.name.text)) out.add(n.name.text)
  return out
}

/** Every place an expression uses one of `names`, by name. */
export function valueUses(lines: readonly LineNode[], names: ReadonlySet<string>): { name: string; span: Span; line: number }[] {
  const out: { name: string; span: Span; line: number }[] = []
  for (const n of lines) {
    for (const e of expressionsOf(n)) {
      const toks = scanExpression(e)
      toks.forEach((t, i) => {
        if (t.kind === 'name' && names.has(t.text) && !isUnitName(t, toks[i + 1])) out.push({ name: t.text, span: t.span, line: n.line })
      })
    }
  }
  return out
}

/** Where a compartment is mentioned by name on a line (not where it is declared). */
export function compartmentMentions(n: LineNode): Tok[] {
  switch (n.kind) {
    case 'charge':
      return [n.compartment]
    case 'separator':
      return [n.between[0], n.between[1]]
    case 'electrode':
      return [n.compartment]
    case 'expect':
    case 'observe':
      return n.compartment ? [n.compartment] : []
    default:
      return []
  }
}

/**
 * The span of a standalone `word` in `text` between two offsets (the first one, or the last with
 * `last`), or undefined. Used for the connecting words the tree does not keep.
 */
export function wordBetween(text: string, from: number, to: number, word: string, last = false): Span | undefined {
  const slice = text.slice(from, to)
  const re = new RegExp(`(?<![\\w-])${word}(?![\\w-])`, 'g')
  let found: number | undefined
  for (let m = re.exec(slice); m; m = re.exec(slice)) {
    found = m.index
    if (!last) break
  }
  return found === undefined ? undefined : { start: from + found, end: from + found + word.length }
}

/** The connecting words of a line (`between`, `and`, `in`, `area`, `drag`, `solution`, `at`, `on`). */
export function connectives(text: string, n: LineNode): Span[] {
  const out: (Span | undefined)[] = []
  switch (n.kind) {
    case 'separator':
      out.push(wordBetween(text, n.type.end, n.between[0].start, 'between', true))
      out.push(wordBetween(text, n.between[0].end, n.between[1].start, 'and'))
      if (n.area) out.push(wordBetween(text, n.between[1].end, n.area.start, 'area', true))
      if (n.drag) out.push(wordBetween(text, n.between[1].end, n.drag.start, 'drag', true))
      break
    case 'electrode':
      out.push(wordBetween(text, n.material.end, n.compartment.start, 'in', true))
      if (n.area) out.push(wordBetween(text, n.compartment.end, n.area.start, 'area', true))
      break
    case 'charge':
      for (const item of n.items) {
        if (item.concentration) {
          out.push(wordBetween(text, item.formula.end, item.quantity.start, 'solution'))
          out.push(wordBetween(text, item.quantity.end, item.concentration.start, 'at', true))
        }
      }
      break
    case 'step':
      for (const c of n.clauses) if (c.on) out.push(wordBetween(text, c.expr.end, c.on.start, 'on', true))
      break
    case 'expect':
    case 'observe':
      if (n.compartment) out.push(wordBetween(text, (n.alternate ?? n.quantity).end, n.compartment.start, 'in', true))
      break
  }
  return out.filter((s): s is Span => s !== undefined)
}
