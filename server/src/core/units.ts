// Units and expressions: the one sandboxed mathjs instance of Cellrun.
//
// Following the mathjs security guidance: we create a private instance, add our units, keep a
// private reference to `parse`, then disable import, createUnit, evaluate, parse, simplify,
// derivative, resolve and reviver on the instance. Every expression is parsed once (cached by
// text), its syntax tree is checked against a short allow-list of node types, operators and
// functions, and its length and nesting are capped before it is compiled. Names resolve only to
// the document's own `let` values or to units; nothing else in the mathjs namespace is reachable.

import { all, create } from 'mathjs'
import type { MathNode, Unit } from 'mathjs'
import { GenerationalCache } from './memo'

const math = create(all, { number: 'number', precision: 64 })

// Units chemists use that mathjs lacks. (mathjs already has Ah, Wh, degC, bar, atm, psi, torr...)
math.createUnit('M', { definition: '1 mol/L', prefixes: 'short' }) // molar: M, mM, uM
math.createUnit('molar', { definition: '1 mol/L' })
math.createUnit('wtpct', { aliases: [] }) // mass fraction in percent: its own base dimension
math.createUnit('ppmw', { definition: '0.0001 wtpct' }) // mass parts per million

const privateParse = math.parse.bind(math)
const UnitClass = math.Unit
// Simplification in a fixed unit system (SI), whatever units were parsed before: see formatValue.
UnitClass.setUnitSystem('si')

function disabled(name: string) {
  return function () {
    throw new Error(`Function ${name} is disabled`)
  }
}
math.import(
  {
    import: disabled('import'),
    createUnit: disabled('createUnit'),
    evaluate: disabled('evaluate'),
    parse: disabled('parse'),
    simplify: disabled('simplify'),
    derivative: disabled('derivative'),
    resolve: disabled('resolve'),
    reviver: disabled('reviver'),
  },
  { override: true },
)

/** A value of an expression: a plain number (dimensionless) or a mathjs Unit. */
export type Value = number | Unit

export const MAX_EXPRESSION_LENGTH = 400
export const MAX_NESTING = 32
/** The largest power of a unit (or base dimension) a value may carry: `(1 A)^1e9` is refused, `cm^-2` and `m^3` pass. */
export const MAX_UNIT_POWER = 12

const ALLOWED_OPERATORS = new Set(['add', 'subtract', 'multiply', 'divide', 'pow', 'unaryMinus', 'unaryPlus'])
const ALLOWED_FUNCTIONS = new Set(['sqrt', 'abs'])
const CONSTANTS = new Set(['pi'])

export type ExprFailureReason = 'syntax' | 'refused' | 'too-long' | 'unknown-name' | 'math'

export interface ExprFailure {
  reason: ExprFailureReason
  message: string
  /** Offsets within the expression text as the user wrote it. */
  start: number
  end: number
  /** For unknown-name: the name. */
  name?: string
}

interface Compiled {
  ok: true
  /** The checked tree, evaluated by evalNode. */
  tree: MathNode
  /** Symbols: `let` names come from the scope; a unit name is a unit unless a `let` value shadows it. */
  names: { name: string; start: number; end: number; isUnit: boolean }[]
  /** Unit symbols used, which must be placed in the scope as units (so `min` is minutes, not a function). */
  unitSymbols: string[]
  /**
   * The last evaluation: the scope values it read (by identity) and its result. A line that did not
   * change, with named values that did not change, is not evaluated again on the next analysis.
   */
  lastInputs?: (Value | undefined)[]
  lastResult?: EvalResult
}

type CompileResult = Compiled | { ok: false; failure: ExprFailure }

/** Compiled expressions by text, in two generations (see GenerationalCache): at most 2 × 20,000. */
const CACHE_LIMIT = 20_000
const cache = new GenerationalCache<string, CompileResult>(CACHE_LIMIT)

/** Replace the typographic forms we accept with mathjs syntax, keeping a map back to the original offsets. */
export function normalise(text: string): { text: string; map: number[] } {
  if (isPlain(text)) {
    const map = new Array<number>(text.length + 1)
    for (let i = 0; i <= text.length; i++) map[i] = i
    return { text, map }
  }
  return normaliseByCharacter(text)
}

function normaliseByCharacter(text: string): { text: string; map: number[] } {
  const out: string[] = []
  const map: number[] = []
  const push = (s: string, at: number) => {
    for (const ch of s) {
      out.push(ch)
      map.push(at)
    }
  }
  for (let i = 0; i < text.length; i++) {
    const c = text[i]
    const wt = c === 'w' && !/[\p{L}_]/u.test(text[i - 1] ?? ' ') ? /^wt\s*%/.exec(text.slice(i)) : null
    if (c === '°' && text[i + 1] === 'C') {
      push('degC', i)
      i++
    } else if (c === '°' && text[i + 1] === 'F') {
      push('degF', i)
      i++
    } else if (c === '℃') {
      push('degC', i)
    } else if (wt) {
      // `wt%`, also written `10wt%` or `10 wt %`
      push(/\s/.test(text[i - 1] ?? ' ') ? 'wtpct' : ' wtpct', i)
      i += wt[0].length - 1
    } else if (c === '·' || c === '×' || c === '⋅') {
      push('*', i)
    } else if (c === '−') {
      push('-', i)
    } else if (c === 'µ' || c === 'μ') {
      push('u', i)
    } else if (c === '²') {
      push('^2', i)
    } else if (c === '³') {
      push('^3', i)
    } else if (c === '\u00a0' || c === '\u202f' || c === '\u2009' || c === '\t') {
      push(' ', i) // no-break and thin spaces pasted between a number and its unit
    } else {
      push(c, i)
    }
  }
  // `1 h 30 min`: a duration written as hours then minutes (or minutes then seconds) is their sum.
  const joined = out.join('')
  const re = /(?<![\p{L}\p{N}_])(h|min)(\s+)(?=\d[\d.]*\s*(min|s)(?![\p{L}\p{N}_]))/gu
  let m: RegExpExecArray | null
  const inserts: number[] = []
  while ((m = re.exec(joined))) inserts.push(m.index + m[1].length)
  if (inserts.length) {
    // `out` holds one UTF-16 code unit per entry, aligned with `map`: insert ' +' before each place.
    const text2: string[] = []
    const map2: number[] = []
    let k = 0
    for (let j = 0; j < out.length; j++) {
      if (inserts[k] === j) {
        text2.push(' ', '+')
        map2.push(map[j], map[j])
        k++
      }
      text2.push(out[j])
      map2.push(map[j])
    }
    map2.push(text.length)
    return { text: text2.join(''), map: map2 }
  }
  map.push(text.length)
  return { text: out.join(''), map }
}

const DURATION_PAIR = /(?<![\p{L}\p{N}_])(h|min)(\s+)(?=\d[\d.]*\s*(min|s)(?![\p{L}\p{N}_]))/u

/**
 * Text normalise() would leave as it is: printable ASCII other than `w` (which may start `wt%`),
 * and no `1 h 30 min` pair. Most expressions are; they skip the character-by-character copy.
 */
function isPlain(text: string): boolean {
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i)
    if (c < 32 || c > 126 || c === 119 /* w */) return false
  }
  return !DURATION_PAIR.test(text)
}

const unitNames = new Map<string, boolean>()
function isUnitName(name: string): boolean {
  let known = unitNames.get(name)
  if (known === undefined) {
    known = isValuelessUnitFast(name)
    if (unitNames.size >= CACHE_LIMIT) unitNames.clear()
    unitNames.set(name, known)
  }
  return known
}

type UnitTable = Record<string, { prefixes: Record<string, unknown> }>
const hasOwn = (o: object, k: string) => Object.prototype.hasOwnProperty.call(o, k)

/**
 * The same answer as mathjs's `Unit.isValuelessUnit(name)` (a unit name, or a prefix allowed for
 * that unit followed by its name), found by trying each split of the name instead of testing every
 * unit mathjs knows: a name that is not a unit (`j12`, `area`) costs a few look-ups, not hundreds.
 * A test checks both agree over all unit names, prefixed names and random strings.
 */
export function isValuelessUnitFast(name: string): boolean {
  const units = (UnitClass as unknown as { UNITS: UnitTable }).UNITS
  // Every unit name (prefixed or not) ends as some unit's name ends: a name whose last character
  // ends none (`j12`) is not a unit, found without a look-up or a copy.
  if (!unitEndings(units).has(name.charCodeAt(name.length - 1))) return false
  if (hasOwn(units, name)) return true
  for (let i = 1; i < name.length; i++) {
    const unitName = name.slice(i)
    if (!hasOwn(units, unitName)) continue
    const prefixes = units[unitName].prefixes
    const prefix = name.slice(0, i)
    if (hasOwn(prefixes, prefix) && prefixes[prefix] !== undefined) return true
  }
  return false
}

/**
 * The last characters of the unit names, read from the table when first asked (after this module
 * has added its own units; expressions cannot create units: createUnit is disabled).
 */
let endings: { table: UnitTable; codes: Set<number> } | undefined
function unitEndings(units: UnitTable): Set<number> {
  if (!endings || endings.table !== units) {
    const codes = new Set<number>()
    for (const u in units) if (hasOwn(units, u)) codes.add(u.charCodeAt(u.length - 1))
    endings = { table: units, codes }
  }
  return endings.codes
}

interface NodeInfo {
  start: number
  end: number
}

const NAME_CHAR = /[\p{L}\p{N}_$]/u

/** Whether the character at `i` (or the one just before it when `before`) belongs to a name; surrogate pairs are read whole. */
function isNameChar(t: string, i: number, before: boolean): boolean {
  if (i < 0 || i >= t.length) return false
  // Before a name: a low surrogate that ends a pair is read with its high half; a lone one as itself.
  const pair = before && i > 0 && /[\udc00-\udfff]/.test(t[i]) && /[\ud800-\udbff]/.test(t[i - 1])
  const cp = pair ? t.codePointAt(i - 1) : t.codePointAt(i)
  return cp !== undefined && NAME_CHAR.test(String.fromCodePoint(cp))
}

function compile(text: string, shortcut = true): CompileResult {
  if (text.trim() === '') {
    return { ok: false, failure: { reason: 'syntax', message: 'a value is missing here', start: 0, end: 0 } }
  }
  if (text.length > MAX_EXPRESSION_LENGTH) {
    return {
      ok: false,
      failure: {
        reason: 'too-long',
        message: `expression is longer than ${MAX_EXPRESSION_LENGTH} characters; split it into named values with \`let\``,
        start: 0,
        end: text.length,
      },
    }
  }
  // Cheap nesting cap before handing the text to the parser (its recursion depth follows the nesting).
  let depth = 0
  let maxDepth = 0
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i)
    if (c === 40 || c === 91 || c === 123) maxDepth = Math.max(maxDepth, ++depth)
    else if (c === 41 || c === 93 || c === 125) depth--
  }
  if (maxDepth > MAX_NESTING) {
    return {
      ok: false,
      failure: { reason: 'too-long', message: `expression nests deeper than ${MAX_NESTING} levels`, start: 0, end: text.length },
    }
  }
  // The commonest expressions (plain text, a shape simpleTree reads) are checked and located as
  // they are read: their names and places come from the scan, not from walking the tree and
  // searching the text again. A test checks both ways give the same names, places and units.
  if (shortcut && isPlain(text)) {
    const simple = simpleTree(text, true)
    if (simple) {
      const names: Compiled['names'] = []
      let unitSymbols: string[] = NO_UNITS
      for (let i = 0; i < symbolCount; i++) {
        const name = symbolNames[i]
        const at = symbolAts[i]
        if (CONSTANTS.has(name)) continue
        const isUnit = isUnitName(name)
        names.push({ name, start: at, end: at + name.length, isUnit })
        if (isUnit && !unitSymbols.includes(name)) unitSymbols = unitSymbols === NO_UNITS ? oneUnit(name) : [...unitSymbols, name]
      }
      // A copy at its size: the list grown by push keeps room for 16 more names (130 bytes per
      // expression, kept with the compiled expression).
      return { ok: true, tree: simple, names: names.slice(), unitSymbols, lastInputs: undefined, lastResult: undefined }
    }
  }
  const norm = normalise(text)
  const back = (i: number) => norm.map[Math.max(0, Math.min(i, norm.map.length - 1))]
  let root: MathNode
  try {
    root = simpleTree(norm.text) ?? (privateParse(norm.text) as MathNode)
  } catch (e) {
    const msg = e instanceof Error ? e.message : String(e)
    const m = /\(char (\d+)\)/.exec(msg)
    // mathjs counts from 1 and reports an error at the end of the input as length + 1:
    // keep the position on the last character so the span stays inside the expression.
    const at = m ? Math.min(back(Math.max(0, Number(m[1]) - 1)), Math.max(0, text.length - 1)) : 0
    return {
      ok: false,
      failure: {
        reason: 'syntax',
        message: `cannot read this expression: ${msg.replace(/\s*\(char \d+\)/, '')}`,
        start: at,
        end: text.length,
      },
    }
  }
  const names: Compiled['names'] = []
  const unitSymbols = new Set<string>()
  let failure: ExprFailure | null = null
  const whole: NodeInfo = { start: 0, end: text.length }
  // Locate a symbol in the normalised text, scanning forward so repeated names map to successive places.
  let searchFrom = 0
  const locate = (name: string): NodeInfo => {
    const t = norm.text
    let at = t.indexOf(name, searchFrom)
    // A whole name only: not part of a longer name on either side.
    while (at >= 0 && (isNameChar(t, at - 1, true) || isNameChar(t, at + name.length, false))) at = t.indexOf(name, at + 1)
    if (at < 0) return whole
    searchFrom = at + name.length
    const start = back(at)
    return { start, end: Math.min(text.length, Math.max(start + 1, back(at + name.length - 1) + 1)) }
  }
  const visit = (node: MathNode, level: number): void => {
    if (failure) return
    if (level > MAX_NESTING) {
      failure = { reason: 'too-long', message: `expression nests deeper than ${MAX_NESTING} levels`, ...whole }
      return
    }
    const n = node as MathNode & { fn?: unknown; name?: string; args?: MathNode[]; content?: MathNode; value?: unknown }
    switch (node.type) {
      case 'ConstantNode':
        if (typeof n.value !== 'number') failure = { reason: 'refused', message: 'only numbers are allowed as constants', ...whole }
        return
      case 'SymbolNode': {
        const name = n.name as string
        if (CONSTANTS.has(name)) return
        if (isUnitName(name)) {
          unitSymbols.add(name)
          // A name may be both a unit and a `let` value; record it so the scope can win.
          const at = locate(name)
          names.push({ name, start: at.start, end: at.end, isUnit: true })
          return
        }
        const at = locate(name)
        names.push({ name, start: at.start, end: at.end, isUnit: false })
        return
      }
      case 'ParenthesisNode':
        visit(n.content as MathNode, level + 1)
        return
      case 'OperatorNode': {
        const fn = n.fn as string
        if (!ALLOWED_OPERATORS.has(fn)) {
          failure = {
            reason: 'refused',
            message: `the operator \`${(node as unknown as { op: string }).op}\` is not allowed here`,
            ...whole,
          }
          return
        }
        // A chain of + - * / is read by a loop and its depth is bounded by the length cap, so it does
        // not count as nesting; unary signs and powers are read recursively, so they do.
        const deeper = fn === 'pow' || (n.args ?? []).length === 1
        for (const a of n.args ?? []) visit(a, deeper ? level + 1 : level)
        return
      }
      case 'FunctionNode': {
        const fnNode = n.fn as MathNode & { name?: string }
        const fname = fnNode?.type === 'SymbolNode' ? fnNode.name ?? '' : ''
        if (!ALLOWED_FUNCTIONS.has(fname)) {
          failure = {
            reason: 'refused',
            message: fname
              ? `the function \`${fname}\` is not allowed; allowed: ${[...ALLOWED_FUNCTIONS].join(', ')}`
              : 'this kind of function call is not allowed',
            ...(fname ? locate(fname) : whole),
          }
          return
        }
        for (const a of n.args ?? []) visit(a, level + 1)
        return
      }
      default:
        failure = { reason: 'refused', message: `${describeNode(node.type)} is not allowed in a Cellrun expression`, ...whole }
    }
  }
  visit(root, 0)
  if (failure) return { ok: false, failure }
  // The checked tree is evaluated by walking it (evalNode), not by mathjs's compile(): the tree holds
  // only the node types, operators and functions allowed above, each of which maps to one function
  // of the sandboxed instance. (mathjs's compile also looks every name up among its units, which
  // cost more than the rest of a first analysis.) A unit raised to a huge power (`1 m^1e9`, `(1 A)^x`
  // with a large `x`) has a finite value but no meaning: refused here, whatever the exponent came
  // from (the caller reports what this throws).
  return { ok: true, tree: root, names: names.slice(), unitSymbols: unitSymbols.size === 0 ? NO_UNITS : [...unitSymbols], lastInputs: undefined, lastResult: undefined }
}

const NO_UNITS: string[] = []
const NO_INPUTS: (Value | undefined)[] = []

/** The value of a compiled expression with `scope` (named values and units), huge powers refused. */
function run(c: Compiled, scope: Lookup): unknown {
  return refuseHugePowers(evalNode(c.tree, scope))
}

/**
 * The tree mathjs's parser would build for the commonest expressions, built directly (the parser
 * is most of the cost of a first analysis). The shapes read here:
 *
 *   NUMBER                       `2.5`
 *   NUMBER %                     `93 %` (a percentage: 93 / 100)
 *   FIRST ((* | /) OPERAND)*     `200 g`, `95 mA/cm^2`, `j * area`, `1 mol / L / s`
 *
 * where FIRST is NUMBER, NAME, NAME^EXP or `NUMBER NAME[^EXP]` (an implicit multiplication, which
 * mathjs reads before the explicit operators), OPERAND is NUMBER, NAME or NAME^EXP, and EXP is an
 * integer with an optional sign. An implicit multiplication is read only at the start: after an
 * operator mathjs has special rules for it (`2 / 3 kg` is `(2/3) kg`), left to the parser. Anything
 * else, and any name the parser reads as a keyword or operator, goes to the parser. White space is
 * what the parser skips (space, tab, no-break space); any other goes to the parser, which refuses
 * it. A property test checks that the result equals the parser's for generated expressions of
 * these shapes and near misses.
 */
// The token patterns simpleTree reads (scanned by numberEnd, nameEnd and digitsEnd, which a test
// checks against these).
export const NUMBER_AT = /\d+(?:\.\d+)?(?:[eE][+-]?\d+)?/y
export const NAME_AT = /[A-Za-z_][A-Za-z0-9_]*/y
export const INTEGER_AT = /\d+/y
/** Words mathjs's parser reads as constants or operators, not as names. */
const PARSER_WORDS = new Set(['true', 'false', 'null', 'undefined', 'NaN', 'Infinity', 'mod', 'to', 'in', 'and', 'or', 'xor', 'not', 'end'])
/**
 * The nodes simpleTree builds: plain objects with the fields of mathjs's ConstantNode, SymbolNode
 * and OperatorNode that Cellrun reads (evalNode and the checks in compile), made without mathjs's
 * node classes, whose constructors check their arguments (most of the cost of building a tree).
 * They are never handed to mathjs. The test compares them field by field with the parser's nodes.
 */
function constNode(value: number): MathNode {
  return { type: 'ConstantNode', value } as unknown as MathNode
}
/** Symbol nodes are shared by name (frozen: trees are only read), like unit-name lists below. */
const symbolNodes = new Map<string, MathNode>()
function symbolNode(name: string): MathNode {
  let n = symbolNodes.get(name)
  if (!n) {
    if (symbolNodes.size >= CACHE_LIMIT) symbolNodes.clear()
    symbolNodes.set(name, (n = Object.freeze({ type: 'SymbolNode', name }) as unknown as MathNode))
  }
  return n
}
/** The list of one unit name, shared by every expression that uses just that unit (`200 g`). */
const oneUnitLists = new Map<string, string[]>()
function oneUnit(name: string): string[] {
  let l = oneUnitLists.get(name)
  if (!l) {
    if (oneUnitLists.size >= CACHE_LIMIT) oneUnitLists.clear()
    oneUnitLists.set(name, (l = Object.freeze([name]) as unknown as string[]))
  }
  return l
}
function operatorNode(op: string, fn: string, args: MathNode[], implicit = false, isPercentage = false): MathNode {
  return { type: 'OperatorNode', op, fn, args, implicit, isPercentage } as unknown as MathNode
}

/**
 * `record`: also note each name and where it stands, in the order a walk of the tree meets them,
 * in symbolNames and symbolAts (symbolCount of them), read by the caller before the next call.
 */
export function simpleTree(t: string, record = false): MathNode | undefined {
  // The reader's state is kept at module level (reset here; simpleTree never calls itself), so that
  // reading an expression makes no closures, and the names it records make no objects.
  rt = t
  ri = 0
  recording = record
  symbolCount = 0
  try {
    return readSimple()
  } finally {
    rt = ''
    recording = false
  }
}

let rt = ''
let ri = 0
let recording = false
// At most one name per two characters of an expression (400 at most, MAX_EXPRESSION_LENGTH): small.
const symbolNames: string[] = []
const symbolAts: number[] = []
let symbolCount = 0

/** White space the parser skips, from `ri`; how much. */
function rSkip(): number {
  const from = ri
  for (let c = rt.charCodeAt(ri); c === 32 || c === 9 || c === 0xa0; c = rt.charCodeAt(++ri));
  return ri - from
}

/** The token at `ri` as the pattern reads it, found by a scan (no match array per token). */
function rAt(re: RegExp): string | undefined {
  const end = re === NAME_AT ? nameEnd(rt, ri) : re === INTEGER_AT ? digitsEnd(rt, ri) : numberEnd(rt, ri)
  if (end === ri) return undefined
  const token = rt.slice(ri, end)
  ri = end
  return token
}

/** A name at `ri`; null for a word the parser reads as a keyword or operator. */
function rName(): string | null | undefined {
  const w = rAt(NAME_AT)
  return w === undefined ? undefined : PARSER_WORDS.has(w) ? null : w
}

/** The name just read, then an optional `^ EXP`. */
function rPowered(w: string): MathNode | undefined {
  const sym = symbolNode(w)
  // Each name where it stands (the name was just read), in the order a walk of the tree meets them.
  if (recording) {
    symbolNames[symbolCount] = w
    symbolAts[symbolCount] = ri - w.length
    symbolCount++
  }
  const back = ri
  rSkip()
  if (rt.charCodeAt(ri) !== 94 /* ^ */) {
    ri = back
    return sym
  }
  ri++
  rSkip()
  const sign = rt.charCodeAt(ri) === 45 /* - */ ? '-' : rt.charCodeAt(ri) === 43 /* + */ ? '+' : ''
  if (sign) ri++
  const digits = rAt(INTEGER_AT)
  if (digits === undefined) return undefined
  // A number that goes on (`2.5`, `2e3`) or a second power (`cm^2^2`) is the parser's.
  const c = rt.charCodeAt(ri)
  if (c === 46 || c === 101 || c === 69 || (c >= 48 && c <= 57) || c === 95 || (c >= 65 && c <= 90) || (c >= 97 && c <= 122)) return undefined
  const save = ri
  rSkip()
  if (rt.charCodeAt(ri) === 94) return undefined
  ri = save
  const exp: MathNode = constNode(Number(digits))
  const e = sign === '' ? exp : operatorNode(sign, sign === '-' ? 'unaryMinus' : 'unaryPlus', [exp], false)
  return operatorNode('^', 'pow', [sym, e], false)
}

/** An operand after an operator: NUMBER, NAME or NAME^EXP. */
function rOperand(): MathNode | undefined {
  const num = rAt(NUMBER_AT)
  if (num !== undefined) return nameStartsAt(rt, ri) ? undefined : constNode(Number(num))
  const w = rName()
  return w ? rPowered(w) : undefined
}

function readSimple(): MathNode | undefined {
  const n = rt.length
  rSkip()
  let left: MathNode | undefined
  const num = rAt(NUMBER_AT)
  if (num !== undefined) {
    // A number may not run into a name (`2e`, `3kg`): the parser reads those its own way.
    if (nameStartsAt(rt, ri)) return undefined
    const value = constNode(Number(num))
    const gap = rSkip()
    if (rt.charCodeAt(ri) === 37 /* % */) {
      ri++
      rSkip()
      return ri === n ? operatorNode('/', 'divide', [value, constNode(100)], false, true) : undefined
    }
    if (gap > 0 && nameStartsAt(rt, ri)) {
      const w = rName()
      if (!w) return undefined
      const unit = rPowered(w)
      if (!unit) return undefined
      left = operatorNode('*', 'multiply', [value, unit], true)
    } else left = value
  } else {
    const w = rName()
    if (!w) return undefined
    left = rPowered(w)
    if (!left) return undefined
  }
  for (;;) {
    rSkip()
    if (ri === n) return left
    const c = rt.charCodeAt(ri)
    if (c !== 42 /* * */ && c !== 47 /* / */) return undefined
    ri++
    rSkip()
    const right = rOperand()
    if (!right) return undefined
    left = c === 42 ? operatorNode('*', 'multiply', [left, right], false) : operatorNode('/', 'divide', [left, right], false)
  }
}

/** Where the digits from `i` end (`i` when there are none). */
function digitsEnd(t: string, i: number): number {
  while (i < t.length && t.charCodeAt(i) >= 48 && t.charCodeAt(i) <= 57) i++
  return i
}

/** Where a number as NUMBER_AT reads it (`12`, `1.5`, `2e-3`, `2.5E3`) starting at `i` ends; `i` when none starts there. */
function numberEnd(t: string, i: number): number {
  let j = digitsEnd(t, i)
  if (j === i) return i
  if (t.charCodeAt(j) === 46 /* . */) {
    const k = digitsEnd(t, j + 1)
    if (k > j + 1) j = k
  }
  const e = t.charCodeAt(j)
  if (e === 101 || e === 69) {
    let k = j + 1
    const sign = t.charCodeAt(k)
    if (sign === 43 || sign === 45) k++
    const m = digitsEnd(t, k)
    if (m > k) j = m
  }
  return j
}

/** Where a name as NAME_AT reads it starting at `i` ends; `i` when none starts there. */
function nameEnd(t: string, i: number): number {
  if (!nameStartsAt(t, i)) return i
  let j = i + 1
  for (; j < t.length; j++) {
    const c = t.charCodeAt(j)
    if (!(c === 95 || (c >= 48 && c <= 57) || (c >= 65 && c <= 90) || (c >= 97 && c <= 122))) break
  }
  return j
}

/** Whether a name (as NAME_AT reads one) starts at `i`. */
function nameStartsAt(t: string, i: number): boolean {
  const c = t.charCodeAt(i)
  return c === 95 || (c >= 65 && c <= 90) || (c >= 97 && c <= 122)
}

type MathFn = (...args: unknown[]) => unknown
const mathFns = math as unknown as Record<string, MathFn | number>

/**
 * Evaluate a tree that compile() has checked (allowed nodes only), as mathjs's compiled code would:
 * a name from the scope (named values, and units put there by the caller), else a constant (`pi`);
 * an operator or function by the instance's function of that name.
 */
function evalNode(node: MathNode, scope: Lookup): unknown {
  const n = node as MathNode & { fn?: string | MathNode; name?: string; args?: MathNode[]; content?: MathNode; value?: unknown }
  switch (node.type) {
    case 'ConstantNode':
      return n.value
    case 'SymbolNode': {
      const name = n.name!
      if (scope.has(name)) return scope.get(name)
      if (CONSTANTS.has(name)) return mathFns[name]
      throw new Error(`Undefined symbol ${name}`)
    }
    case 'ParenthesisNode':
      return evalNode(n.content!, scope)
    case 'OperatorNode': {
      const fn = mathFns[n.fn as string] as MathFn
      const args = n.args!
      if (args.length === 2) {
        const a = evalNode(args[0], scope)
        const b = evalNode(args[1], scope)
        const direct = binary(n.fn as string, a, b)
        return direct !== UNDISPATCHED ? direct : fn(a, b)
      }
      return args.length === 1 ? fn(evalNode(args[0], scope)) : fn(...args.map((a) => evalNode(a, scope)))
    }
    case 'FunctionNode': {
      const name = (n.fn as MathNode & { name: string }).name
      if (scope.has(name)) throw new TypeError(`\`${name}\` is a named value here, not a function`)
      return (mathFns[name] as MathFn)(...n.args!.map((a) => evalNode(a, scope)))
    }
    default:
      // Not reachable: compile() refuses every other node type.
      throw new Error(`${node.type} is not allowed`)
  }
}

const UNDISPATCHED = Symbol('undispatched')
/** The Unit methods mathjs's scalar signatures call, with the operand types they accept. */
interface UnitOps {
  multiply(other: Unit | number): unknown
  divide(other: Unit | number): unknown
  divideInto(numerator: number): unknown
  pow(p: number): unknown
}

/**
 * The binary operations an expression here is made of, done as mathjs's typed functions end up
 * doing them, without the two layers of typed-function dispatch (operator, then its scalar form):
 * two numbers by plain arithmetic (mathjs's number functions are exactly that); a unit times or by
 * a number or unit by the Unit method mathjs's signature calls; `200 g` by scaledUnit. Anything
 * else (complex numbers, sums of units, powers of numbers) is UNDISPATCHED: the caller goes the
 * mathjs way. A property test compares the results field by field with mathjs's compiled code.
 */
function binary(fn: string, a: unknown, b: unknown): unknown {
  if (typeof a === 'number') {
    if (typeof b === 'number') {
      switch (fn) {
        case 'multiply':
          return a * b
        case 'divide':
          return a / b
        case 'add':
          return a + b
        case 'subtract':
          return a - b
      }
      return UNDISPATCHED
    }
    if (!(b instanceof UnitClass)) return UNDISPATCHED
    if (fn === 'multiply') {
      // `200 g`: a number times a unit name, the commonest product.
      if (b.value === null) {
        const scaled = scaledUnit(b, a)
        if (scaled) return scaled
      }
      return (b as unknown as UnitOps).multiply(a)
    }
    return fn === 'divide' ? (b as unknown as UnitOps).divideInto(a) : UNDISPATCHED
  }
  if (!(a instanceof UnitClass) || !(typeof b === 'number' || b instanceof UnitClass)) return UNDISPATCHED
  switch (fn) {
    case 'multiply':
      return unitProduct(a, b, false) ?? (a as unknown as UnitOps).multiply(b)
    case 'divide':
      return unitProduct(a, b, true) ?? (a as unknown as UnitOps).divide(b)
    case 'pow':
      return typeof b === 'number' ? (a as unknown as UnitOps).pow(b) : UNDISPATCHED
  }
  return UNDISPATCHED
}

/** A unit's parts as mathjs keeps them (the unit list, the exponent of each base dimension, the value and flags). */
interface UnitParts {
  value: number | null
  units: { unit: { value: number; offset: number }; prefix: { value: number }; power: number }[]
  dimensions: number[]
  fixPrefix: boolean
  skipAutomaticSimplification: boolean
}
const PREDICTABLE = (math.config as unknown as () => { predictable?: boolean })().predictable === true
/** A new unit as mathjs's clone() starts one: no value, no units, a fresh array of zero dimensions. */
const BlankUnit = UnitClass as unknown as new () => UnitParts

/**
 * `a × b` or `a ÷ b` for a unit with a number value and a number or a unit with a number value, as
 * Unit.multiply and Unit.divide make it, field by field and in their order: a copy of `a` (unit
 * list and dimensions), `b`'s dimensions added or subtracted, `b`'s unit list appended (powers
 * negated when dividing), the values multiplied or divided; a product of a unit and a unit is
 * simplified later (mathjs clears skipAutomaticSimplification), and a result with no dimension is
 * its number. Without mathjs's generic copies (a for-in per unit, an object spread per appended
 * unit). Undefined where a value is not a plain number (a unit name, `cm^2`): the caller goes the
 * mathjs way. A property test compares the results with mathjs's methods field by field.
 */
function unitProduct(a: Unit, b: Unit | number, divide: boolean): unknown {
  const x = a as unknown as UnitParts
  const av = x.value
  if (typeof av !== 'number' || PREDICTABLE) return undefined
  const y = typeof b === 'number' ? undefined : (b as unknown as UnitParts)
  const bv = y ? y.value : b
  if (typeof bv !== 'number') return undefined
  const res = new BlankUnit()
  res.fixPrefix = x.fixPrefix
  res.skipAutomaticSimplification = y ? false : x.skipAutomaticSimplification
  // The list made at its size (a list grown by push keeps room for 16 more parts: 130 bytes per
  // value, kept as long as the value is), filled by index (the lists read may be frozen: see scaledUnit).
  const nx = x.units.length
  const units: UnitParts['units'] = new Array(nx + (y ? y.units.length : 0))
  for (let i = 0; i < nx; i++) {
    const u = x.units[i]
    units[i] = { unit: u.unit, prefix: u.prefix, power: u.power }
  }
  if (y) {
    for (let i = 0; i < y.units.length; i++) {
      const u = y.units[i]
      units[nx + i] = { unit: u.unit, prefix: u.prefix, power: divide ? -u.power : u.power }
    }
  }
  res.units = units
  // The constructor's dimensions are a fresh array of zeros, one per base dimension.
  const dims = res.dimensions
  let dimensionless = true
  for (let i = 0; i < BASE_DIMENSIONS.length; i++) {
    const other = y ? y.dimensions[i] || 0 : 0
    const d = divide ? (x.dimensions[i] || 0) - other : (x.dimensions[i] || 0) + other
    dims[i] = d
    if (Math.abs(d) > 1e-12) dimensionless = false
  }
  const value = divide ? av / bv : av * bv
  res.value = value
  return dimensionless ? value : res
}

const BASE_DIMENSIONS = (UnitClass as unknown as { BASE_DIMENSIONS: unknown[] }).BASE_DIMENSIONS

/**
 * `x` times a valueless unit (a unit name: `g`, `mA`), as mathjs's multiply(x, unit) makes it, with
 * its arithmetic in its order (Unit.multiply: a copy of the unit, dimensions summed with those of a
 * plain number, value = the unit's normalised 1 times x) without dispatching through typed-function
 * or wrapping x in a Unit. Undefined for a dimensionless unit (mathjs then returns a plain number)
 * or one whose definition is not a plain number: the caller goes the mathjs way. A test compares
 * the results field by field over every unit.
 */
function scaledUnit(unit: Unit, x: number): Unit | undefined {
  const u = unit as unknown as UnitParts
  // Indexed loops: the lists may be frozen (shared), and a for-of over a frozen array makes an
  // iterator result per element even when optimized (measured).
  let dimensional = false
  for (let i = 0; i < u.dimensions.length; i++) if (u.dimensions[i] !== 0) dimensional = true
  if (!dimensional) return undefined
  // Units defined by other than plain numbers (VAR is complex) go the mathjs way.
  for (let i = 0; i < u.units.length; i++) {
    const part = u.units[i]
    if (typeof part.unit.value !== 'number' || typeof part.prefix.value !== 'number' || typeof part.power !== 'number') return undefined
  }
  // Unit.clone's copy, with the fields in the constructor's order. Its unit list and dimensions are
  // the same for every number times this unit: made once per unit name, frozen, and shared. mathjs
  // copies a unit before it changes one, except Unit.toBest (which changes the first part's prefix
  // in place and is not used here); a frozen part stays as it is whatever is done with the value.
  // A test runs mathjs's operations on such values against mathjs's own product.
  const shared = sharedParts(unit)
  const res = Object.create(UnitClass.prototype) as UnitParts
  res.fixPrefix = u.fixPrefix
  res.skipAutomaticSimplification = u.skipAutomaticSimplification
  res.units = shared.units
  res.dimensions = shared.dimensions
  res.value = shared.one * x
  return res as unknown as Unit
}

/** What every number times a unit name shares: its unit list and dimensions as clone() copies them, and the unit's normalised 1. */
interface SharedParts {
  units: UnitParts['units']
  dimensions: number[]
  one: number
}
const sharedPartsOf = new WeakMap<Unit, SharedParts>()
function sharedParts(unit: Unit): SharedParts {
  let p = sharedPartsOf.get(unit)
  if (!p) {
    // Only a unit name's value (kept by unitSymbolValue) is worth sharing parts for; a unit made
    // on the way (`cm^2` in `200 cm^2`) gets its own copy, as clone() would make it.
    const share = symbolValues.has(unit)
    const u = unit as unknown as UnitParts
    const units = u.units.map((part) => {
      const copy = { unit: part.unit, prefix: part.prefix, power: part.power }
      return share ? Object.freeze(copy) : copy
    })
    const dimensions: number[] = []
    for (let i = 0; i < BASE_DIMENSIONS.length; i++) dimensions[i] = (u.dimensions[i] || 0) + 0
    let one = 1
    for (const part of u.units) one = one * Math.pow(part.unit.value * part.prefix.value, part.power)
    if (!share) return { units, dimensions, one }
    p = { units: Object.freeze(units) as unknown as UnitParts['units'], dimensions: Object.freeze(dimensions) as unknown as number[], one }
    sharedPartsOf.set(unit, p)
  }
  return p
}

/** A power beyond the cap, or not a number (NaN). */
function tooBigPower(p: number): boolean {
  return !(Math.abs(p) <= MAX_UNIT_POWER)
}

function refuseHugePowers(v: unknown): unknown {
  if (!isUnit(v)) return v
  // Loops, not some() with a closure: this runs for every value of every analysis.
  let huge = false
  for (let i = 0; i < v.units.length && !huge; i++) huge = tooBigPower(v.units[i].power)
  for (let i = 0; i < v.dimensions.length && !huge; i++) huge = tooBigPower(v.dimensions[i])
  if (huge) {
    let units = v.formatUnits()
    if (units.length > 40) units = `${units.slice(0, 40)}…`
    throw new Error(`a unit raised to a power beyond ${MAX_UNIT_POWER} (${units}) is not allowed`)
  }
  return v
}

function describeNode(type: string): string {
  switch (type) {
    case 'AssignmentNode':
    case 'FunctionAssignmentNode':
      return 'assignment (use a `let` line)'
    case 'AccessorNode':
    case 'IndexNode':
      return 'property or index access'
    case 'ArrayNode':
    case 'RangeNode':
      return 'a matrix or range'
    case 'ObjectNode':
      return 'an object'
    case 'BlockNode':
      return 'a block of several expressions'
    case 'ConditionalNode':
      return 'a conditional'
    case 'RelationalNode':
      return 'a comparison'
    default:
      return `a ${type}`
  }
}

/** Forget compiled expressions and their last results (for benchmarks that measure a first analysis). */
export function clearExpressionCache(): void {
  cache.clear()
  unitNames.clear()
  unitValues.clear()
  symbolNodes.clear()
  oneUnitLists.clear()
}

function compiled(text: string): CompileResult {
  // Refused at once, and not kept: a pasted megabyte must not stay in memory as a cache key.
  if (text.length > MAX_EXPRESSION_LENGTH) return compile(text)
  return cache.get(text, compile)
}

/**
 * A value, with its kind and its number in the kind's stored unit (undefined for the kind 'other'):
 * worked out once with the value, which later analyses share while the line and its names are
 * unchanged.
 */
export type EvalResult = { ok: true; value: Value; kind: Kind | 'other'; number: number | undefined } | { ok: false; failure: ExprFailure }

function valueResult(value: Value): EvalResult {
  // Not through kindOf and inKindUnit: their tables (weak maps) are for values from elsewhere.
  const kind = typeof value === 'number' ? 'dimensionless' : kindOfUncached(value)
  let number: number | undefined
  if (kind !== 'other') {
    try {
      number = typeof value === 'number' ? value : kind === 'dimensionless' ? value.toNumber('') : numberIn(value, kindUnitRefs.get(kind)!)
    } catch {
      // a unit mathjs cannot convert (should not happen for a matched kind)
    }
  }
  return { ok: true, value, kind, number }
}

const unitValues = new Map<string, Unit>()
/** The values unitSymbolValue made (the units whose parts scaledUnit shares). */
const symbolValues = new WeakSet<Unit>()
function unitSymbolValue(name: string): Unit {
  let u = unitValues.get(name)
  if (!u) {
    u = math.unit(name)
    unitValues.set(name, u)
    symbolValues.add(u)
  }
  return u
}

/**
 * Evaluate an expression with the document's named values. Never throws.
 * `scope` maps `let` names to values; names not in it must be units.
 */
export function evaluateExpression(text: string, scope: ReadonlyMap<string, Value>): EvalResult {
  const c = compiled(text)
  if (!c.ok) return c
  const lastResult = c.lastResult
  if (lastResult) {
    const lastInputs = c.lastInputs!
    let same = true
    for (let i = 0; i < c.names.length && same; i++) same = scope.get(c.names[i].name) === lastInputs[i]
    if (same) return lastResult
  }
  // The values the names had, compared by identity next time. An expression of units only (`200 g`)
  // reads none: NO_INPUTS then stands for all of them (an index past its end reads undefined too).
  let inputs = NO_INPUTS
  for (let i = 0; i < c.names.length; i++) {
    const v = scope.get(c.names[i].name)
    if (v === undefined) continue
    if (inputs === NO_INPUTS) inputs = new Array<Value | undefined>(c.names.length).fill(undefined)
    inputs[i] = v
  }
  const result = evaluateCompiled(text, c, scope)
  c.lastInputs = inputs
  c.lastResult = result
  return result
}

/** What evalNode reads names from: a Map, or NamesIn. */
interface Lookup {
  has(name: string): boolean
  get(name: string): unknown
}

/**
 * The names an expression reads, as a Map of them would hold them (the expression's named values
 * with a value, else its units as units) without making the Map on every evaluation.
 */
class NamesIn implements Lookup {
  constructor(
    private readonly c: Compiled,
    private readonly values: ReadonlyMap<string, Value>,
  ) {}

  private value(name: string): Value | undefined {
    for (const n of this.c.names) if (n.name === name) return this.values.get(name)
    return undefined
  }

  has(name: string): boolean {
    return this.value(name) !== undefined || this.c.unitSymbols.includes(name)
  }

  get(name: string): unknown {
    const v = this.value(name)
    if (v !== undefined) return v
    return this.c.unitSymbols.includes(name) ? unitSymbolValue(name) : undefined
  }
}

function evaluateCompiled(text: string, c: Compiled, scope: ReadonlyMap<string, Value>): EvalResult {
  const s = new NamesIn(c, scope)
  for (const n of c.names) {
    const v = scope.get(n.name)
    if (v === undefined && !n.isUnit) {
      return {
        ok: false,
        failure: { reason: 'unknown-name', message: `unknown name \`${n.name}\``, start: n.start, end: n.end, name: n.name },
      }
    }
  }
  try {
    const v = run(c, s)
    if (typeof v === 'number') {
      if (!Number.isFinite(v)) return { ok: false, failure: { reason: 'math', message: 'the value is not a finite number', start: 0, end: text.length } }
      return valueResult(v)
    }
    if (isUnit(v)) {
      const num = v.value
      if (num === null || num === undefined) return valueResult(math.unit(1, v.formatUnits()) as Unit)
      if (typeof num !== 'number' || !Number.isFinite(num)) {
        return { ok: false, failure: { reason: 'math', message: 'the value is not a finite number', start: 0, end: text.length } }
      }
      return valueResult(v)
    }
    return { ok: false, failure: { reason: 'refused', message: 'the expression does not give a number or a quantity', start: 0, end: text.length } }
  } catch (e) {
    const msg = e instanceof Error ? e.message : String(e)
    return { ok: false, failure: { reason: 'math', message: friendlyMathError(msg), start: 0, end: text.length } }
  }
}

function friendlyMathError(msg: string): string {
  if (/Units do not match|do not match/i.test(msg)) return 'cannot add or subtract quantities of different kinds'
  if (/function (add|subtract)(Scalar)?\b/.test(msg)) {
    return 'cannot add or subtract a plain number and a quantity with a unit (for a power of a unit write `cm^-2`, not `cm-2`)'
  }
  if (/Unit.*not.*allowed|exponent/i.test(msg)) return `cannot compute this: ${msg}`
  return `cannot compute this: ${msg}`
}

export function isUnit(v: unknown): v is Unit {
  return typeof v === 'object' && v !== null && (v as { type?: string }).type === 'Unit'
}

// ---------------------------------------------------------------------------------------------
// Kinds of quantity

export type Kind =
  | 'dimensionless'
  | 'mass'
  | 'amount'
  | 'volume'
  | 'area'
  | 'length'
  | 'current'
  | 'current-density'
  | 'voltage'
  | 'time'
  | 'charge'
  | 'temperature'
  | 'pressure'
  | 'molarity'
  | 'mass-concentration'
  | 'mass-fraction'
  | 'energy'
  | 'power'
  | 'molar-mass'

/** The SI (or customary) unit each kind is stored in. */
export const KIND_UNIT: Record<Exclude<Kind, 'dimensionless'>, string> = {
  mass: 'g',
  amount: 'mol',
  volume: 'L',
  area: 'cm^2',
  length: 'm',
  current: 'A',
  'current-density': 'A/m^2',
  voltage: 'V',
  time: 's',
  charge: 'C',
  temperature: 'K',
  pressure: 'Pa',
  molarity: 'mol/L',
  'mass-concentration': 'g/L',
  'mass-fraction': 'wtpct',
  energy: 'J',
  power: 'W',
  'molar-mass': 'g/mol',
}

export const KIND_LABEL: Record<Kind, string> = {
  dimensionless: 'a plain number',
  mass: 'a mass',
  amount: 'an amount of substance',
  volume: 'a volume',
  area: 'an area',
  length: 'a length',
  current: 'a current',
  'current-density': 'a current density',
  voltage: 'a voltage',
  time: 'a duration',
  charge: 'an electric charge',
  temperature: 'a temperature',
  pressure: 'a pressure',
  molarity: 'a molar concentration',
  'mass-concentration': 'a mass concentration',
  'mass-fraction': 'a mass fraction (wt%)',
  energy: 'an energy',
  power: 'a power',
  'molar-mass': 'a molar mass',
}

const kindRefs: [Kind, Unit][] = (Object.keys(KIND_UNIT) as Exclude<Kind, 'dimensionless'>[]).map((k) => [
  k,
  math.unit(KIND_UNIT[k]) as Unit,
])

/** The kind of a value, or 'other' when it matches none we know. */
export function kindOf(v: Value): Kind | 'other' {
  if (typeof v === 'number') return 'dimensionless'
  let k = kinds.get(v)
  if (k === undefined) {
    k = kindOfUncached(v)
    kinds.set(v, k)
  }
  return k
}

/** Values are immutable and shared between analyses (see `last` above): their kind is worked out once. */
const kinds = new WeakMap<Unit, Kind | 'other'>()

/**
 * Dimensions as one number, for whole powers from -15 to 15 (base 32, at most 2^50 for ten base
 * dimensions: exact); undefined for anything else (a fractional power from sqrt, a huge one).
 */
function dimensionsKey(dims: readonly number[]): number | undefined {
  let key = 0
  for (let i = dims.length - 1; i >= 0; i--) {
    const d = dims[i]
    if (!Number.isInteger(d) || d < -15 || d > 15) return undefined
    key = key * 32 + (d + 16)
  }
  return key
}

/** Kinds by their dimensions (dimensionsKey): one look-up for the usual whole powers. */
const kindByDimensions = new Map<number, Kind>()
for (const [k, ref] of kindRefs) {
  const key = dimensionsKey(ref.dimensions)
  if (key !== undefined && !kindByDimensions.has(key)) kindByDimensions.set(key, k)
}

function kindOfUncached(v: Unit): Kind | 'other' {
  const key = dimensionsKey(v.dimensions)
  const exact = key === undefined ? undefined : kindByDimensions.get(key)
  if (exact !== undefined) return exact
  // Powers that are not exact (from sqrt) are compared with mathjs's tolerance.
  for (const [k, ref] of kindRefs) if (sameBase(v as unknown as UnitParts, ref as unknown as UnitParts)) return k
  if (v.dimensions.every((d) => d === 0)) return 'dimensionless'
  return 'other'
}

/** Each kind's stored unit, parsed once (valueless): converting to a parsed unit skips mathjs's unit parser. */
const kindUnitRefs = new Map<Kind, Unit>(kindRefs)

/**
 * Value in the kind's stored unit. Values are immutable and shared between analyses (see `last`
 * above): the number in the value's own kind is worked out once.
 */
export function inKindUnit(v: Value, kind: Kind): number {
  if (typeof v === 'number') return v
  if (kind === 'dimensionless') return v.toNumber('')
  const own = kindOf(v) === kind
  if (own) {
    const n = numbers.get(v)
    if (n !== undefined) return n
  }
  const n = numberIn(v, kindUnitRefs.get(kind)!)
  if (own) numbers.set(v, n)
  return n
}

/**
 * `v.toNumber(ref)` for a valueless `ref` of the same dimensions, with mathjs's own steps and
 * arithmetic (Unit.to, then Unit.toNumeric: the offset adjustment, then one division per unit of
 * `ref`) but without the two copies of the unit that those make. A property test checks that both
 * give the same number, bit for bit, over values of every kind.
 */
function numberIn(v: Unit, ref: Unit): number {
  const u = v as unknown as UnitParts
  const r = ref as unknown as UnitParts
  if (typeof u.value !== 'number' || !sameBase(u, r)) return v.toNumber(ref as unknown as string)
  let x = u.value
  const derived = u.units.length > 1 || (u.units.length === 1 && Math.abs(u.units[0].power - 1.0) > 1e-15)
  if (!(derived || u.units.length === 0 || r.units.length === 0 || u.units[0].unit.offset === r.units[0].unit.offset)) {
    x = x + (u.units[0].unit.value * u.units[0].unit.offset - r.units[0].unit.value * r.units[0].unit.offset)
  }
  for (let i = 0; i < r.units.length; i++) {
    const part = r.units[i]
    x = x / Math.pow(part.unit.value * part.prefix.value, part.power)
  }
  return x
}

/** Unit.equalBase, as mathjs writes it (each base dimension within 1e-12), on the parts directly. */
function sameBase(a: UnitParts, b: UnitParts): boolean {
  for (let i = 0; i < BASE_DIMENSIONS.length; i++) {
    if (Math.abs((a.dimensions[i] || 0) - (b.dimensions[i] || 0)) > 1e-12) return false
  }
  return true
}

const numbers = new WeakMap<Unit, number>()

/** The number of `unit` in a value (e.g. toNumber(v, 'A')); plain numbers pass through. */
export function toNumber(v: Value, unit: string): number {
  return typeof v === 'number' ? v : v.toNumber(unit)
}

/** Human text of a value as written by the user's units, e.g. "1.44 A". */
export function formatValue(v: Value): string {
  if (typeof v === 'number') return fmt(v)
  // One unit (`440 g`, `2 A/dm^2` counts as two): shown in the unit it was written in. Several
  // (`2 A/dm^2 * panel`): simplified in SI units. Not mathjs's default "auto" system, which follows
  // the units it happened to parse last, so that the same value would read differently depending on
  // what was analysed before it (found by the incremental-analysis property test).
  const s = v.units.length <= 1 ? v : v.simplify()
  const units = s.formatUnits()
  return `${fmt(s.toNumber(units))} ${prettyUnit(units)}`
}

/** Is this name a unit (so a `let` of that name would change what the unit means)? */
export function isUnitSymbol(name: string): boolean {
  return isUnitName(name)
}

/** Is this name a built-in constant (`pi`), which always wins over a `let` of that name? */
export function isConstantName(name: string): boolean {
  return CONSTANTS.has(name)
}

/** Format rounding toward zero, for a limit that must not be exceeded once rounded. */
export function fmtDown(n: number, sig = 3): string {
  if (!Number.isFinite(n) || n === 0) return fmt(n, sig)
  const e = Math.floor(Math.log10(Math.abs(n))) - sig + 1
  const f = Math.pow(10, e)
  const down = Math.trunc(n / f) * f
  return fmt(Number(down.toPrecision(sig)), sig)
}

/** Make a quantity from a number and unit text (internal use only; `unit` is trusted). */
export function quantity(n: number, unit: string): Unit {
  return math.unit(n, unit) as Unit
}

/** Make a named unit value for scope use. */
export function unitValue(u: Unit): Value {
  return u
}

/** Pretty unit text: "A h" -> "A·h", "cm^2" -> "cm²", "wtpct" -> "wt%". */
export function prettyUnit(u: string): string {
  return u
    .replace(/wtpct/g, 'wt%')
    .replace(/\^2\b/g, '²')
    .replace(/\^3\b/g, '³')
    .replace(/\bdegC\b/g, '°C')
    .replace(/ \/ /g, '/')
    .replace(/(\w) (?=\w)/g, '$1·')
    .replace(/\bu(?=[A-Za-z])/g, 'µ')
}

let labelFigures = 3

/** Unit preference for gas volumes in hint labels. */
export type GasUnit = 'L' | 'mL' | 'm^3'
let gasUnit: GasUnit = 'L'

/** Run `f` with a unit preference for gas volumes in labels; restores it after. */
export function withGasUnit<T>(unit: GasUnit, f: () => T): T {
  const before = gasUnit
  gasUnit = unit
  try {
    return f()
  } finally {
    gasUnit = before
  }
}

/** A gas volume given in litres, in the preferred unit: "1.5 L", "1500 mL", "0.0015 m³". */
export function gasVolumeText(litres: number, sig = labelFigures): string {
  if (gasUnit === 'mL') return `${fmt(litres * 1000, sig)} mL`
  if (gasUnit === 'm^3') return `${fmt(litres / 1000, sig)} m³`
  return `${fmt(litres, sig)} L`
}

/**
 * The formatting settings in force (significant figures, gas unit), as one number, for text that is
 * written later (a hover's working, only read when someone looks) in the settings of now. Exact:
 * the figures are a whole number from 2 to 8 (see withSignificantFigures).
 */
export function formatSettings(): number {
  return labelFigures * 4 + GAS_UNITS.indexOf(gasUnit)
}

const GAS_UNITS: readonly GasUnit[] = ['L', 'mL', 'm^3']

/** Run `f` in formatting settings saved by formatSettings. */
export function withFormatSettings<T>(settings: number, f: () => T): T {
  return withSignificantFigures(Math.floor(settings / 4), () => withGasUnit(GAS_UNITS[settings % 4], f))
}

/** Run `f` with another number of significant figures for labels (fmt's default); restores it after. */
export function withSignificantFigures<T>(sig: number, f: () => T): T {
  const before = labelFigures
  // Always a whole number from 2 to 8 (3 for anything that is not a number): formatSettings packs it.
  labelFigures = Number.isFinite(sig) ? Math.max(2, Math.min(8, Math.round(sig))) : 3
  try {
    return f()
  } finally {
    labelFigures = before
  }
}

/** Format a number with `sig` significant figures (3 unless a setting says otherwise), no exponent between 1e-3 and 1e6. */
export function fmt(n: number, sig = labelFigures): string {
  if (!Number.isFinite(n)) return String(n)
  if (n === 0) return '0'
  const a = Math.abs(n)
  if (a >= 1e6 || a < 1e-3) {
    const [m, e] = n.toExponential(sig - 1).split('e')
    return `${stripZeros(m)}e${Number(e)}`
  }
  const digits = Math.max(0, sig - 1 - Math.floor(Math.log10(a)))
  let s = n.toFixed(Math.min(20, digits))
  if (s.includes('.')) s = stripZeros(s)
  return s
}

function stripZeros(s: string): string {
  if (!s.includes('.')) return s
  let end = s.length
  while (s.charCodeAt(end - 1) === 48 /* 0 */) end--
  if (s.charCodeAt(end - 1) === 46 /* . */) end--
  return s.slice(0, end)
}

/**
 * For tests only (no protocol text reaches these): the disabled functions, so tests can prove they
 * stay disabled, and mathjs's own parser, compile and unit tests, the oracles for our faster paths.
 */
export const sandbox = {
  /** normalise() without its shortcut for text it leaves as it is, to check the shortcut against. */
  normaliseByCharacter(text: string): { text: string; map: number[] } {
    return normaliseByCharacter(text)
  },
  /** The kind's stored unit, parsed (valueless), to check inKindUnit against mathjs's toNumber. */
  kindUnit(kind: Exclude<Kind, 'dimensionless'>): Unit {
    return kindUnitRefs.get(kind)!
  },
  /** The end of the token at `i` as simpleTree's scanners find it, to check against the patterns. */
  tokenEnd(re: RegExp, t: string, i: number): number {
    return re === NAME_AT ? nameEnd(t, i) : re === INTEGER_AT ? digitsEnd(t, i) : numberEnd(t, i)
  },
  /** sameBase, to check against mathjs's Unit.equalBase. */
  sameBase(a: Unit, b: Unit): boolean {
    return sameBase(a as unknown as UnitParts, b as unknown as UnitParts)
  },
  /** scaledUnit, to check against mathjs's multiply. */
  scaledUnit(unit: Unit, x: number): Unit | undefined {
    return scaledUnit(unit, x)
  },
  /** unitProduct, to check against mathjs's multiply and divide (undefined where it goes the mathjs way). */
  unitProduct(a: Unit, b: Unit | number, divide: boolean): unknown {
    return unitProduct(a, b, divide)
  },
  /** The sandboxed instance's multiply or divide, the oracle for unitProduct. */
  mathjsProduct(a: Unit, b: Unit | number, divide: boolean): unknown {
    return (mathFns[divide ? 'divide' : 'multiply'] as MathFn)(a, b)
  },
  /** The sandboxed instance's multiply, the oracle for scaledUnit. */
  mathjsMultiply(x: number, unit: Unit): unknown {
    return (mathFns.multiply as MathFn)(x, unit)
  },
  /** What compile() finds an expression reads, with and without its shortcut for the commonest shapes. */
  compiledNames(text: string): { shortcut: unknown; walked: unknown } {
    const view = (c: CompileResult) => (c.ok ? { names: c.names, unitSymbols: c.unitSymbols, tree: JSON.stringify(c.tree, (k, v) => (k === 'comment' ? undefined : v)) } : { failure: c.failure })
    return { shortcut: view(compile(text)), walked: view(compile(text, false)) }
  },
  /** mathjs's parser, to check simpleTree against. */
  mathjsParse(text: string): MathNode {
    return privateParse(text) as MathNode
  },
  /** mathjs's own compile and evaluate of a (normalised) expression, to check evalNode against. */
  mathjsEvaluate(text: string, scope: Map<string, unknown>): unknown {
    return (privateParse(normalise(text).text) as MathNode).compile().evaluate(scope)
  },
  /** Our evaluation of the same, with units placed in the scope as evaluateExpression does. */
  cellrunEvaluate(text: string, scope: Map<string, unknown>): unknown {
    const c = compiled(text)
    if (!c.ok) throw new Error(c.failure.message)
    return run(c, scope)
  },
  /** The unit value evaluateExpression puts in the scope for a unit name. */
  unitValue(name: string): Unit {
    return unitSymbolValue(name)
  },
  /** mathjs's own unit-name test, to check isValuelessUnitFast against. */
  mathjsIsValuelessUnit(name: string): boolean {
    return UnitClass.isValuelessUnit(name)
  },
  /** Every unit name and prefix mathjs knows here (ours included). */
  unitTable(): { name: string; prefixes: string[] }[] {
    const units = (UnitClass as unknown as { UNITS: UnitTable }).UNITS
    return Object.keys(units).map((name) => ({ name, prefixes: Object.keys(units[name].prefixes) }))
  },
  tryDisabled(name: 'import' | 'createUnit' | 'evaluate' | 'parse' | 'simplify' | 'derivative' | 'resolve' | 'reviver'): string {
    try {
      ;(math as unknown as Record<string, () => unknown>)[name]()
      return 'not disabled'
    } catch (e) {
      return e instanceof Error ? e.message : String(e)
    }
  },
}
