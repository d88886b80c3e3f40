// The line parser. It never throws: each line becomes exactly one node; a line it cannot read
// becomes an `error` node with a message, and parsing goes on with the next line.
import { spanOf, LineIndex, type Span } from './positions'
import {
  CELL_KEYWORDS,
  STATEMENT_KEYWORDS,
  STEP_CLAUSES,
  type ChargeItem,
  type Clause,
  type LineNode,
  type SyntaxTree,
  type Tok,
} from './syntax'
import { closest, isWhiteSpace } from './text'

export function parse(text: string, index = new LineIndex(text)): SyntaxTree {
  const lines: LineNode[] = []
  let inCell = false
  for (let line = 0; line < index.lineCount; line++) {
    const node = parseOne(index, line, inCell)
    inCell = cellStateAfter(node, inCell)
    lines.push(node)
  }
  return { text, lines }
}

function parseOne(index: LineIndex, line: number, inCell: boolean): LineNode {
  try {
    return parseLine(index.lineText(line), index.lineStart(line), line, inCell)
  } catch (e) {
    // Defensive: a bug in a line parser must not take the document down.
    const start = index.lineStart(line)
    const end = index.lineEnd(line)
    return {
      kind: 'error',
      line,
      indent: 0,
      span: { start, end },
      message: `internal parser error: ${e instanceof Error ? e.message : String(e)}`,
      errorSpan: { start, end },
    }
  }
}

/** Whether the next line is inside a `cell` block: the only state carried from line to line. */
function cellStateAfter(node: LineNode, inCell: boolean): boolean {
  if (node.kind === 'cell') return true
  if (node.kind !== 'blank' && node.indent === 0) return false
  return inCell
}

/**
 * Parse `text`, an edited version of `prev.text`, reusing the nodes of the lines the edit did not
 * touch: lines before the edit are taken as they are, lines after it are moved to their new
 * offsets and line numbers. The result is the same as `parse(text)` (a property test checks it
 * over random edit sequences); only the changed lines, and a line either side, are read again.
 */
export function reparse(prev: { text: string; tree: SyntaxTree; index: LineIndex }, text: string, index = new LineIndex(text)): SyntaxTree {
  const old = prev.text
  if (old === text) return { text, lines: prev.tree.lines }
  if (prev.tree.lines.length !== prev.index.lineCount) return parse(text, index)
  // The common prefix and suffix (not overlapping) of the two texts, in UTF-16 units.
  const max = Math.min(old.length, text.length)
  // Whole blocks compared natively first, then character by character in the block that differs.
  const BLOCK = 1024
  let p = 0
  while (p + BLOCK <= max && old.slice(p, p + BLOCK) === text.slice(p, p + BLOCK)) p += BLOCK
  while (p < max && old.charCodeAt(p) === text.charCodeAt(p)) p++
  let q = 0
  while (q + BLOCK <= max - p && old.slice(old.length - q - BLOCK, old.length - q) === text.slice(text.length - q - BLOCK, text.length - q)) q += BLOCK
  while (q < max - p && old.charCodeAt(old.length - 1 - q) === text.charCodeAt(text.length - 1 - q)) q++
  // Lines wholly before the change keep their nodes. One line of margin: a line break may be half of
  // a changed "\r\n", and a line's end depends on its break.
  const firstDirty = Math.max(0, index.lineOf(p) - 1)
  const lines: LineNode[] = prev.tree.lines.slice(0, firstDirty)
  let inCell = false
  for (const n of lines) inCell = cellStateAfter(n, inCell)
  // Old lines wholly inside the common suffix (again with a line of margin) may be moved.
  const shift = text.length - old.length
  const oldSuffixStart = old.length - q
  let firstKept = prev.index.lineCount
  for (let j = prev.index.lineOf(oldSuffixStart) + 2; j < prev.index.lineCount; j++) {
    if (prev.index.lineStart(j) >= oldSuffixStart + 1) {
      firstKept = j
      break
    }
  }
  const lineShift = index.lineCount - prev.index.lineCount
  // The cell state entering each old line, to know when the new parse has caught up with the old.
  const oldStates: boolean[] = []
  let st = false
  for (const n of prev.tree.lines) {
    oldStates.push(st)
    st = cellStateAfter(n, st)
  }
  let line = firstDirty
  for (; line < index.lineCount; line++) {
    const j = line - lineShift
    if (j >= firstKept && j < prev.tree.lines.length && oldStates[j] === inCell) break
    const node = parseOne(index, line, inCell)
    inCell = cellStateAfter(node, inCell)
    lines.push(node)
  }
  for (; line < index.lineCount; line++) {
    const n = prev.tree.lines[line - lineShift]
    lines.push(shift === 0 && lineShift === 0 ? n : moved(n, shift, lineShift))
  }
  return { text, lines }
}

/** A copy of a node with every offset moved by `shift` and its line by `lineShift`. */
function moved<T>(v: T, shift: number, lineShift: number): T {
  if (Array.isArray(v)) return v.map((x) => moved(x, shift, lineShift)) as T
  if (typeof v !== 'object' || v === null) return v
  const o = v as Record<string, unknown>
  if (typeof o.start === 'number' && typeof o.end === 'number' && Object.keys(o).length === 2) {
    return { start: o.start + shift, end: o.end + shift } as T
  }
  // Any other object: a node, a clause, or a token (whose `start` and `end` are offsets too).
  const out: Record<string, unknown> = {}
  for (const k in o) {
    const x = o[k]
    out[k] =
      typeof x === 'number' && k === 'line' ? x + lineShift : typeof x === 'number' && (k === 'start' || k === 'end') ? x + shift : typeof x === 'object' ? moved(x, shift, lineShift) : x
  }
  return out as T
}

/** The longest statement (comment excluded) that is read; see parseLine. */
export const MAX_STATEMENT_LENGTH = 32_768
/** Statements whose text is not evaluated, so any length is cheap. */
const FREE_TEXT: ReadonlySet<string> = new Set(['note', 'run', 'handling', 'material'])
const STATEMENT_SET: ReadonlySet<string> = new Set(STATEMENT_KEYWORDS)
const CELL_SET: ReadonlySet<string> = new Set(CELL_KEYWORDS)
// Tokens are read in place, by index from the cursor: no copy of the rest of the line and no match
// array per token, so a megabyte line is read in time proportional to its length. Each reader is
// checked by a test against the pattern it stands for (IDENT_AT, WORD_AT, LETTERS_AT).
export const IDENT_AT = /[A-Za-z_][A-Za-z0-9_-]*/y
export const WORD_AT = /[^\s,:]+/y
export const LETTERS_AT = /[A-Za-z-]+/y
const SPACE_OR_STOP_RE = /[\s,:]/g

const isLetter = (c: number) => (c >= 65 && c <= 90) || (c >= 97 && c <= 122)
/** A character of a name after its first (`[A-Za-z0-9_-]`, the `[\w-]` of the patterns). */
const isNameRest = (c: number) => isLetter(c) || (c >= 48 && c <= 57) || c === 95 || c === 45

/** Where a name as IDENT_AT reads it, starting at `i`, ends; `i` when none starts there. */
export function identEnd(s: string, i: number): number {
  const first = s.charCodeAt(i)
  if (!(isLetter(first) || first === 95)) return i
  let j = i + 1
  while (j < s.length && isNameRest(s.charCodeAt(j))) j++
  return j
}

/** Where a word as WORD_AT reads it (up to white space, a comma or a colon), starting at `i`, ends. */
export function wordEnd(s: string, i: number): number {
  let j = i
  for (; j < s.length; j++) {
    const c = s.charCodeAt(j)
    if (c === 44 /* , */ || c === 58 /* : */ || isWhiteSpace(c)) break
  }
  return j
}

/** Where letters and hyphens as LETTERS_AT reads them, starting at `i`, end. */
export function lettersEnd(s: string, i: number): number {
  let j = i
  for (; j < s.length; j++) {
    const c = s.charCodeAt(j)
    if (!(isLetter(c) || c === 45)) break
  }
  return j
}

/** Where a keyword (`[A-Za-z][A-Za-z-]*`) that starts at `from` ends; `from` when none starts there. */
function keywordEnd(s: string, from: number): number {
  return isLetter(s.charCodeAt(from)) ? lettersEnd(s, from + 1) : from
}

/** The statement keyword written at [from, to), as the one shared string (no copy per line), or undefined. */
function knownKeyword(s: string, from: number, to: number): string | undefined {
  for (const k of STATEMENT_KEYWORDS) if (k.length === to - from && s.startsWith(k, from)) return k
  return undefined
}

/** White space at `i`, as `\s` in a pattern reads it. */
function isSpace(s: string, i: number): boolean {
  return isWhiteSpace(s.charCodeAt(i))
}

const standaloneWords = new Map<string, RegExp>()
/** `\s+WORD` followed by white space or the end, searched from lastIndex (flag g). */
function standaloneWord(word: string): RegExp {
  let re = standaloneWords.get(word)
  if (!re) standaloneWords.set(word, (re = new RegExp(`\\s+${word}(?=\\s|$)`, 'g')))
  return re
}

/** Where the comment starts (`#` outside double quotes), or -1. */
export function commentStart(s: string): number {
  // Most lines have no `#`, or none after a quote: found by two native searches.
  const hash = s.indexOf('#')
  if (hash < 0) return -1
  const quote = s.indexOf('"')
  if (quote < 0 || quote > hash) return hash
  let quoted = false
  for (let i = 0; i < s.length; i++) {
    const c = s[i]
    if (c === '"') quoted = !quoted
    else if (c === '#' && !quoted) return i
  }
  return -1
}

class LineError extends Error {
  constructor(
    message: string,
    readonly at: number,
    readonly end?: number,
    readonly fix?: { start: number; end: number; newText: string; title: string },
  ) {
    super(message)
  }
}

function parseLine(raw: string, base: number, line: number, inCell: boolean): LineNode {
  const hash = commentStart(raw)
  const comment: Span | undefined = hash >= 0 ? { start: base + hash, end: base + raw.length } : undefined
  // The statement is raw[indent, end): white space (as `\s` reads it) trimmed on both sides, the
  // comment cut off. Scanned by index rather than with trim(): no copies of the line.
  const bodyEnd = hash >= 0 ? hash : raw.length
  let indent = 0
  while (indent < bodyEnd && isSpace(raw, indent)) indent++
  let end = bodyEnd
  while (end > indent && isSpace(raw, end - 1)) end--
  const blank = indent === bodyEnd
  const content = blank ? '' : end === raw.length ? raw : raw.slice(0, end)
  const span: Span = { start: base + Math.min(indent, content.length), end: base + content.length }
  // Nodes are written out field by field (no spreads): each kind then has one fixed layout, built in
  // one allocation, and an absent comment is an undefined field.
  if (blank) return { kind: 'blank', line, indent, span, comment }

  const kwEnd = keywordEnd(content, indent)
  const kwMatch = kwEnd > indent
  const kwText = kwMatch ? knownKeyword(content, indent, kwEnd) ?? content.slice(indent, kwEnd) : ''
  // One cursor serves every line (parsing is not re-entrant): no object per line.
  const s = CURSOR.reset(content, base, indent + kwText.length)
  try {
    // Cost bound: a statement that is evaluated (amounts, charges, steps, reactions), or one whose
    // keyword is not known, is read only up to this length; free text (a note, a title, a handling
    // line) and comments may be longer.
    if (content.length - indent > MAX_STATEMENT_LENGTH && !(kwMatch && FREE_TEXT.has(kwText))) {
      const what = kwMatch && STATEMENT_SET.has(kwText) ? `this \`${kwText}\` line` : 'this line'
      throw new LineError(
        `${what} is longer than ${MAX_STATEMENT_LENGTH} characters and is not read; split it over several lines (or into named values with \`let\`)`,
        indent,
        content.length,
      )
    }
    if (!kwMatch || !STATEMENT_SET.has(kwText)) {
      const word = content.slice(indent).split(/[\s:]/)[0]
      const guess = closest(word, STATEMENT_KEYWORDS)
      throw new LineError(
        kwText ? `unknown statement \`${word.length > 40 ? word.slice(0, 40) + '…' : word}\`` : 'a statement must start with a keyword',
        indent,
        indent + word.length,
        guess ? { start: indent, end: indent + word.length, newText: guess, title: `Change to \`${guess}\`` } : undefined,
      )
    }
    const isCellChild = CELL_SET.has(kwText)
    const childOfCell = isCellChild && inCell && indent > 0
    switch (kwText) {
      case 'run': {
        s.ws()
        const title = s.quoted() ?? s.restTok('a title, e.g. `run "KOH batch 7"`')
        s.end()
        return { kind: 'run', line, indent, span, comment, title }
      }
      case 'note': {
        s.ws()
        return { kind: 'note', line, indent, span, comment, text: s.restTok('the note text') }
      }
      case 'conditions': {
        s.ws()
        const items = s.commaItems().map((t) => s.needExpr(t, 'a temperature or pressure'))
        return { kind: 'conditions', line, indent, span, comment, items }
      }
      case 'let': {
        s.ws1('a name')
        const name = s.ident('a name, e.g. `let area = 36 cm^2`')
        s.ws()
        s.lit('=', '`=` after the name')
        s.ws()
        return { kind: 'let', line, indent, span, comment, name, expr: s.restTok('a value after `=`') }
      }
      case 'cell':
        s.ws()
        s.end('`cell` stands alone on its line; its parts follow, indented')
        return { kind: 'cell',  line, indent, span, comment }
      case 'vessel': {
        s.ws1('a material')
        const material = s.restTok('a vessel material, e.g. `vessel polypropylene`')
        return { kind: 'vessel', line, indent, span, comment, material, inCell: childOfCell }
      }
      case 'compartment': {
        s.ws1('a name')
        const name = s.ident('a compartment name, e.g. `compartment anolyte 500 mL`')
        s.ws1('a volume')
        const volume = s.restTok('the liquid volume, e.g. `500 mL`')
        return { kind: 'compartment', line, indent, span, comment, name, volume, inCell: childOfCell }
      }
      case 'separator': {
        s.ws1('a separator kind')
        const type = s.upTo('between', 'a separator kind: cation-exchange, anion-exchange, diaphragm or none')
        s.kw('between')
        s.ws1('a compartment')
        const a = s.ident('a compartment name')
        s.ws1('`and`')
        s.kw('and')
        s.ws1('a compartment')
        const b = s.ident('a compartment name')
        const opts = s.optionalClauses(['area', 'drag'])
        return {
          kind: 'separator',
          line, indent, span, comment,
          type,
          between: [a, b],
          ...(opts.area ? { area: opts.area } : {}),
          ...(opts.drag ? { drag: opts.drag } : {}),
          inCell: childOfCell,
        }
      }
      case 'anode':
      case 'cathode': {
        s.ws1('a material')
        const material = s.upTo('in', `an electrode material, e.g. \`${kwText} nickel in catholyte\``)
        s.kw('in')
        s.ws1('a compartment')
        const compartment = s.ident('a compartment name')
        const area = s.optionalArea()
        return {
          kind: 'electrode',
          line, indent, span, comment,
          role: kwText as 'anode' | 'cathode',
          material,
          compartment,
          ...(area ? { area } : {}),
          inCell: childOfCell,
        }
      }
      case 'charge': {
        s.ws1('a compartment')
        const compartment = s.ident('a compartment name, e.g. `charge anolyte: NaCl 300 g`')
        s.ws()
        s.lit(':', '`:` after the compartment name')
        s.ws()
        const items = s.commaItems().map((t) => parseChargeItem(s, t))
        if (items.length === 0) throw new LineError('expected what is charged, e.g. `NaCl 300 g, water 1 L`', s.pos)
        return { kind: 'charge', line, indent, span, comment, compartment, items }
      }
      case 'step': {
        s.ws1('a step label')
        const label = s.word('a step label, e.g. `step 1:`')
        s.ws()
        s.lit(':', '`:` after the step label')
        s.ws()
        const clauses = parseClauses(s)
        return { kind: 'step', line, indent, span, comment, label, clauses }
      }
      case 'expect':
      case 'observe': {
        s.ws1('a substance')
        const formula = s.word(`a substance and amount, e.g. \`${kwText} KOH 25 g in catholyte\``)
        s.ws1('an amount')
        const restTok = s.restTok('an amount, e.g. `25 g`')
        const inAt = trailingIn(restTok.text)
        const qEnd = inAt ? inAt.from : restTok.text.length
        const { main, alternate } = splitAlternate(qEnd === restTok.text.length ? restTok : { text: restTok.text.slice(0, qEnd), start: restTok.start, end: restTok.start + qEnd })
        let compartment: Tok | undefined
        if (inAt) {
          const nameStart = restTok.start + inAt.nameStart
          compartment = { text: restTok.text.slice(inAt.nameStart, inAt.nameEnd), start: nameStart, end: restTok.start + inAt.nameEnd }
        }
        return { kind: kwText === 'expect' ? 'expect' : 'observe', line, indent, span, comment, formula, quantity: main, alternate, compartment }
      }
      case 'reaction': {
        s.ws1('`anode` or `cathode`')
        const role = s.word('`anode` or `cathode`, e.g. `reaction anode: 2 Cl- -> Cl2 + 2 e-`')
        if (role.text !== 'anode' && role.text !== 'cathode') {
          const guess = closest(role.text, ['anode', 'cathode'])
          throw new LineError(
            `expected \`anode\` or \`cathode\`, found \`${role.text}\``,
            role.start - base,
            role.end - base,
            guess ? { start: role.start - base, end: role.end - base, newText: guess, title: `Change to \`${guess}\`` } : undefined,
          )
        }
        s.ws()
        s.lit(':', '`:` after the electrode')
        s.ws()
        const equation = s.restTok('the half-reaction, e.g. `2 Cl- -> Cl2 + 2 e-`')
        return { kind: 'reaction', line, indent, span, comment, role, equation }
      }
      case 'material': {
        s.ws1('a material name')
        const name = s.word('a material name, e.g. `material house-mmo: Ti mesh with RuO2/IrO2 coating`')
        s.ws()
        if (s.pos >= content.length) return { kind: 'material', line, indent, span, comment, name }
        s.lit(':', '`:` before the description')
        s.ws()
        const description = s.restTok('a description after `:`')
        return { kind: 'material', line, indent, span, comment, name, description }
      }
      case 'include': {
        s.ws()
        const path = s.quoted()
        if (!path || path.text.trim() === '') throw new LineError('expected a quoted path, e.g. `include "house/cell.cellrun"`', s.pos)
        s.end()
        return { kind: 'include', line, indent, span, comment, path }
      }
      case 'handling': {
        s.ws1('a kind')
        const type = s.word('a handling kind, e.g. `handling vent: ...`')
        s.ws()
        s.lit(':', '`:` after the handling kind')
        s.ws()
        return { kind: 'handling', line, indent, span, comment, type, text: s.restTok('what is arranged, e.g. `handling vent: H2 piped outdoors`') }
      }
    }
    throw new LineError(`unknown statement \`${kwText}\``, indent, indent + kwText.length)
  } catch (e) {
    if (!(e instanceof LineError)) throw e
    const at = Math.min(e.at, content.length)
    const end = Math.max(at, Math.min(e.end ?? content.length, content.length))
    return {
      kind: 'error',
      line,
      indent,
      span,
      comment,
      keyword: kwMatch ? { text: kwText, start: base + indent, end: base + indent + kwText.length } : undefined,
      message: e.message,
      errorSpan: { start: base + at, end: base + (end === at && at < content.length ? at + 1 : end) },
      ...(e.fix
        ? { fix: { span: { start: base + e.fix.start, end: base + e.fix.end }, newText: e.fix.newText, title: e.fix.title } }
        : {}),
    }
  }
}

/**
 * A trailing `in NAME` (`25 g in catholyte`), as the pattern `\s+in\s+([A-Za-z_][\w-]*)\s*$` finds it:
 * where the match starts (`from`) and where the name stands. Read backwards from the end by index
 * (a test checks it against the pattern).
 */
export function trailingIn(t: string): { from: number; nameStart: number; nameEnd: number } | undefined {
  let e = t.length
  while (e > 0 && isWhiteSpace(t.charCodeAt(e - 1))) e--
  let n = e
  while (n > 0 && isNameRest(t.charCodeAt(n - 1))) n--
  // The name starts with a letter or `_`, right after white space.
  if (n === e || !(isLetter(t.charCodeAt(n)) || t.charCodeAt(n) === 95)) return undefined
  let w = n
  while (w > 0 && isWhiteSpace(t.charCodeAt(w - 1))) w--
  if (w === n || w < 2 || t.charCodeAt(w - 1) !== 110 /* n */ || t.charCodeAt(w - 2) !== 105 /* i */) return undefined
  let from = w - 2
  if (from === 0 || !isWhiteSpace(t.charCodeAt(from - 1))) return undefined
  while (from > 0 && isWhiteSpace(t.charCodeAt(from - 1))) from--
  return { from, nameStart: n, nameEnd: e }
}

function parseChargeItem(s: Cursor, t: Tok): ChargeItem {
  const m = /^(\S+)(\s+)(.*)$/s.exec(t.text)
  if (!m) {
    throw new LineError(
      `expected a substance and its amount, e.g. \`NaCl 300 g\`; found \`${t.text}\``,
      t.start - s.base,
      t.end - s.base,
    )
  }
  const formula: Tok = { text: m[1], start: t.start, end: t.start + m[1].length }
  const restStart = t.start + m[1].length + m[2].length
  const rest = m[3]
  const sol = /^solution(\s+)(.*?)\s+at\s+(.+)$/s.exec(rest)
  if (sol) {
    const qStart = restStart + 'solution'.length + sol[1].length
    const cStart = restStart + rest.length - sol[3].length
    return {
      span: spanOf(t),
      formula,
      quantity: { text: sol[2], start: qStart, end: qStart + sol[2].length },
      concentration: { text: sol[3], start: cStart, end: cStart + sol[3].length },
    }
  }
  if (/^solution\b/.test(rest)) {
    throw new LineError(
      'a solution needs its amount and concentration: `FORMULA solution 1 L at 0.5 mol/L`',
      restStart - s.base,
      t.end - s.base,
    )
  }
  const { main, alternate } = splitAlternate({ text: rest, start: restStart, end: restStart + rest.length })
  return { span: spanOf(t), formula, quantity: main, ...(alternate ? { alternate } : {}) }
}

/**
 * `260 g (1.88 mol)`: a trailing parenthesised amount after a complete one is the same amount
 * stated a second way. `2 * (3 g)` is not: the text before the parenthesis ends in an operator.
 */
export function splitAlternate(t: Tok): { main: Tok; alternate?: Tok } {
  const text = t.text.trimEnd()
  if (!text.endsWith(')')) return { main: t }
  let depth = 0
  let open = -1
  for (let i = text.length - 1; i >= 0; i--) {
    if (text[i] === ')') depth++
    else if (text[i] === '(') {
      depth--
      if (depth === 0) {
        open = i
        break
      }
    }
  }
  if (open <= 0 || !/\s/.test(text[open - 1])) return { main: t }
  const before = text.slice(0, open).trimEnd()
  if (before === '' || /[-+*/^(,]$/.test(before)) return { main: t }
  const inner = text.slice(open + 1, -1)
  const innerLead = inner.length - inner.trimStart().length
  const innerText = inner.trim()
  if (innerText === '') return { main: t }
  const altStart = t.start + open + 1 + innerLead
  return {
    main: { text: before, start: t.start, end: t.start + before.length },
    alternate: { text: innerText, start: altStart, end: altStart + innerText.length },
  }
}

// Where the comma pieces of a line (splitAtCommas) and the clause parts of a step piece
// (splitClauseWords) stand: [start, end) pairs of offsets in the line, so that splitting a line
// makes no tokens. Not re-entrant, like the cursor: each user reads them before splitting again.
// The arrays keep their room from line to line; the counts say how much of them is in use.
const pieces: number[] = []
let pieceCount = 0
const parts: number[] = []
let partCount = 0

/**
 * A step's clauses: the text after `step LABEL:` split at commas outside parentheses, each piece
 * split again before each standalone clause word (`current 2 A for 3 h`), every part trimmed.
 * Read by offsets in the line: only the clauses' own tokens are made.
 */
function parseClauses(s: Cursor): Clause[] {
  const clauses: Clause[] = []
  const line = s.s
  const from = s.pos
  const to = line.length
  s.pos = to
  if (isBlank(line, from, to)) throw new LineError('expected what the step does, e.g. `current 2 A for 3 h`', to)
  try {
    splitAtCommas(line, from, to)
    for (let k = 0; k < pieceCount; k += 2) {
      splitClauseWords(line, pieces[k], pieces[k + 1])
      for (let p = 0; p < partCount; p += 2) clauses.push(clauseAt(s, line, parts[p], parts[p + 1]))
    }
  } finally {
    // A line of thousands of commas does not leave its room behind, read or refused.
    if (pieces.length > 256) pieces.length = 0
    if (parts.length > 256) parts.length = 0
  }
  // A copy at its size: the list grown by push keeps room for 16 more clauses (130 bytes per step).
  return clauses.slice()
}

/**
 * Split line[from, to) at the commas outside parentheses and brackets into `pieces` (pieceCount
 * offsets, a trimmed [start, end) pair per piece); an empty piece is an error. The one comma
 * splitter of the parser (step clauses, charge items, conditions, optional clauses).
 */
function splitAtCommas(line: string, from: number, to: number): void {
  pieceCount = 0
  let depth = 0
  let at = from
  for (let i = from; i < to; i++) {
    const c = line.charCodeAt(i)
    if (c === 40 /* ( */ || c === 91 /* [ */) depth++
    else if (c === 41 /* ) */ || c === 93 /* ] */) depth--
    else if (c === 44 /* , */ && depth <= 0) {
      pieceCount = putTrimmed(pieces, pieceCount, line, at, i)
      at = i + 1
    }
  }
  pieceCount = putTrimmed(pieces, pieceCount, line, at, to)
  for (let k = 0; k < pieceCount; k += 2) {
    if (pieces[k] === pieces[k + 1]) throw new LineError('an empty item between `,`', pieces[k], pieces[k] + 1)
  }
}

/** Whether line[from, to) is white space only (or empty). */
function isBlank(line: string, from: number, to: number): boolean {
  for (let i = from; i < to; i++) if (!isWhiteSpace(line.charCodeAt(i))) return false
  return true
}

/** [a, b) trimmed of white space, written as a pair of offsets at `count` in `out`; the new count. */
function putTrimmed(out: number[], count: number, line: string, a: number, b: number): number {
  while (a < b && isWhiteSpace(line.charCodeAt(a))) a++
  while (b > a && isWhiteSpace(line.charCodeAt(b - 1))) b--
  out[count] = a
  out[count + 1] = b
  return count + 2
}

/** Split [a, b) before each standalone clause word outside parentheses into `parts` (trimmed, none empty). */
function splitClauseWords(line: string, a: number, b: number): void {
  partCount = 0
  let depth = 0
  let from = a
  for (let i = a; i < b; i++) {
    const c = line.charCodeAt(i)
    if (c === 40 /* ( */ || c === 91 /* [ */) depth++
    else if (c === 41 /* ) */ || c === 93 /* ] */) depth--
    else if (depth === 0 && i > from && isSpace(line, i - 1) && wordAt(line, i, STEP_CLAUSES, b)) {
      partCount = putTrimmed(parts, partCount, line, from, i)
      if (parts[partCount - 2] === parts[partCount - 1]) partCount -= 2
      from = i
    }
  }
  partCount = putTrimmed(parts, partCount, line, from, b)
  if (parts[partCount - 2] === parts[partCount - 1]) partCount -= 2
}

/** One clause, `WORD VALUE`, standing at [a, b) of the line. */
function clauseAt(s: Cursor, line: string, a: number, b: number): Clause {
  // The word as `[A-Za-z][A-Za-z-]*`, then white space, then the value, read by index.
  const kwEnd = Math.min(keywordEnd(line, a), b)
  // The clause word as the one shared string (the model compares it on every step).
  let known: (typeof STEP_CLAUSES)[number] | undefined
  if (kwEnd > a) for (const c of STEP_CLAUSES) if (c.length === kwEnd - a && line.startsWith(c, a)) known = c
  if (!known) {
    const word = kwEnd > a ? line.slice(a, kwEnd) : line.slice(a, b).split(/\s/)[0]
    const guess = closest(word, STEP_CLAUSES)
    throw new LineError(
      `unknown step clause \`${word}\`; expected ${STEP_CLAUSES.map((c) => `\`${c}\``).join(', ')}`,
      a,
      a + word.length,
      guess ? { start: a, end: a + word.length, newText: guess, title: `Change to \`${guess}\`` } : undefined,
    )
  }
  const base = s.base
  const kwTok: Tok = { text: known, start: base + a, end: base + a + known.length }
  let valueAt = kwEnd
  while (valueAt < b && isSpace(line, valueAt)) valueAt++
  if (valueAt === b) throw new LineError(`\`${known}\` needs a value`, a, a + known.length)
  const value = line.slice(valueAt, b)
  const exprStart = base + valueAt
  const on = known === 'current' ? /\s+on\s+(anode|cathode|separator)$/.exec(value) : null
  const exprText = on ? value.slice(0, on.index) : value
  const clause: Clause = { span: { start: base + a, end: base + b }, keyword: kwTok, expr: { text: exprText, start: exprStart, end: exprStart + exprText.length } }
  if (on) {
    const onStart = exprStart + value.length - on[1].length
    clause.on = { text: on[1], start: onStart, end: onStart + on[1].length }
  }
  return clause
}

/**
 * Whether one of `words` stands whole at `i` (`(?:w1|w2|...)(?![\w-])` matched there): read by
 * comparing in place, without running a pattern for every space of a step line. A test checks it
 * against that pattern.
 */
export function wordAt(s: string, i: number, words: readonly string[], end = s.length): boolean {
  for (const w of words) {
    if (i + w.length > end || !s.startsWith(w, i)) continue
    // What follows the word, within [0, end): past `end` reads as nothing.
    const c = i + w.length < end ? s.charCodeAt(i + w.length) : NaN
    if (!isNameRest(c)) return true
  }
  return false
}

/** A reading position in one line's content. Offsets in errors are relative to the line start. */
class Cursor {
  constructor(
    public s: string,
    public base: number,
    public pos: number,
  ) {}

  reset(s: string, base: number, pos: number): this {
    this.s = s
    this.base = base
    this.pos = pos
    return this
  }

  tok(from: number, to: number): Tok {
    return { text: this.s.slice(from, to), start: this.base + from, end: this.base + to }
  }

  ws(): void {
    while (this.pos < this.s.length && isSpace(this.s, this.pos)) this.pos++
  }

  /** At least one space, or the line is incomplete. */
  ws1(what: string): void {
    if (this.pos >= this.s.length) throw new LineError(`expected ${what}`, this.pos)
    if (!isSpace(this.s, this.pos)) throw new LineError(`expected a space before ${what}`, this.pos)
    this.ws()
  }

  ident(what: string): Tok {
    const end = identEnd(this.s, this.pos)
    if (end === this.pos) throw new LineError(`expected ${what}`, this.pos, this.nextSpace())
    const t = this.tok(this.pos, end)
    this.pos = end
    return t
  }

  /** A word: anything up to white space, a comma or a colon. */
  word(what: string): Tok {
    const end = wordEnd(this.s, this.pos)
    if (end === this.pos) throw new LineError(`expected ${what}`, this.pos, this.nextSpace())
    const t = this.tok(this.pos, end)
    this.pos = end
    return t
  }

  /**
   * Text up to a standalone keyword (which stays unread), trimmed: a material or kind may have
   * several words (`platinum mesh`). Without the keyword, the first word is taken and `kw` reports.
   */
  upTo(word: string, what: string): Tok {
    const re = standaloneWord(word)
    re.lastIndex = this.pos
    const m = re.exec(this.s)
    if (!m || m.index === this.pos) {
      const t = this.word(what)
      this.ws()
      return t
    }
    const t = this.tok(this.pos, m.index)
    this.pos = m.index
    this.ws()
    return t
  }

  kw(word: string): void {
    const end = lettersEnd(this.s, this.pos)
    if (end - this.pos === word.length && this.s.startsWith(word, this.pos)) {
      this.pos = end
      return
    }
    const m = end > this.pos ? this.s.slice(this.pos, end) : null
    // Offer the keyword only for a near miss (`betwen`), not for any word that happens to stand there.
    const near = m && closest(m, [word])
    throw new LineError(
      `expected \`${word}\`${m ? `, found \`${m}\`` : ''}`,
      this.pos,
      this.pos + (m?.length ?? 1),
      near ? { start: this.pos, end: this.pos + m.length, newText: word, title: `Change to \`${word}\`` } : undefined,
    )
  }

  lit(ch: string, what: string): void {
    if (this.s[this.pos] !== ch) throw new LineError(`expected ${what}`, this.pos, this.pos + 1)
    this.pos++
  }

  quoted(): Tok | null {
    if (this.s[this.pos] !== '"') return null
    const close = this.s.indexOf('"', this.pos + 1)
    if (close < 0) throw new LineError('the closing `"` is missing', this.pos, this.s.length)
    const t = this.tok(this.pos + 1, close)
    this.pos = close + 1
    return t
  }

  rest(): Tok {
    const t = this.tok(this.pos, this.s.length)
    this.pos = this.s.length
    return t
  }

  restTok(what: string): Tok {
    if (this.pos >= this.s.length) throw new LineError(`expected ${what}`, this.pos)
    return this.rest()
  }

  end(message?: string): void {
    this.ws()
    if (this.pos < this.s.length) throw new LineError(message ?? `unexpected \`${this.s.slice(this.pos)}\` at the end of the line`, this.pos)
  }

  nextSpace(): number {
    SPACE_OR_STOP_RE.lastIndex = this.pos
    const m = SPACE_OR_STOP_RE.exec(this.s)
    return m ? m.index : this.s.length
  }

  /** `, KEY EXPR` clauses at the end of a line, each key at most once, in any order. */
  optionalClauses(keys: readonly string[]): Record<string, Tok | undefined> {
    const out: Record<string, Tok | undefined> = {}
    this.ws()
    if (this.pos >= this.s.length) return out
    this.lit(',', `\`, ${keys[0]} ...\` or the end of the line`)
    this.ws()
    for (const part of this.commaItems()) {
      const m = /^([A-Za-z-]+)(\s+)(.+)$/s.exec(part.text)
      const word = m ? m[1] : part.text.split(/\s/)[0]
      const at = part.start - this.base
      if (!m || !keys.includes(m[1])) {
        const guess = closest(word, keys)
        throw new LineError(
          `expected ${keys.map((k) => `\`${k}\``).join(' or ')}, found \`${word}\``,
          at,
          at + word.length,
          guess ? { start: at, end: at + word.length, newText: guess, title: `Change to \`${guess}\`` } : undefined,
        )
      }
      if (out[m[1]]) throw new LineError(`\`${m[1]}\` is given twice`, at, at + m[1].length)
      const start = part.start + m[1].length + m[2].length
      out[m[1]] = { text: m[3], start, end: start + m[3].length }
    }
    return out
  }

  /** `, area EXPR` at the end of a cell line. */
  optionalArea(): Tok | undefined {
    this.ws()
    if (this.pos >= this.s.length) return undefined
    this.lit(',', '`, area ...` or the end of the line')
    this.ws()
    this.kw('area')
    this.ws1('an area')
    return this.restTok('an area, e.g. `36 cm^2`')
  }

  needExpr(t: Tok, what: string): Tok {
    if (t.text === '') throw new LineError(`expected ${what}`, t.start - this.base)
    return t
  }

  /**
   * The rest of the line from the cursor, split at commas outside parentheses and brackets (parts
   * trimmed; none when the rest is blank); the cursor moves to the end of the line.
   */
  commaItems(): Tok[] {
    const from = this.pos
    this.pos = this.s.length
    if (isBlank(this.s, from, this.s.length)) return []
    try {
      splitAtCommas(this.s, from, this.s.length)
      const out: Tok[] = new Array(pieceCount / 2)
      for (let k = 0; k < pieceCount; k += 2) out[k / 2] = this.tok(pieces[k], pieces[k + 1])
      return out
    } finally {
      if (pieces.length > 256) pieces.length = 0
    }
  }
}

const CURSOR = new Cursor('', 0, 0)
