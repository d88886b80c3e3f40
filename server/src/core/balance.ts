// Reaction equations: parsing, balance checking and balancing, in exact rational arithmetic.
//
//   parseReaction('2 Cl- -> Cl2 + 2 e-')   terms with coefficients, formulas and offsets
//   checkBalance(parsed)                  residuals right minus left per element and for charge
//   balance(parsed)                       smallest positive integer coefficients, or a reason
//
// Balancing computes the nullspace of the composition matrix (one row per element plus one for
// the charge, one column per species, right-hand columns negated) by Gauss-Jordan elimination over
// BigInt rationals: no floating point is involved. A one-dimensional nullspace whose basis vector
// has all entries of one sign gives the balanced equation; anything else is reported, not guessed.
//
// Pure: no Node, LSP or editor imports. The public functions never throw; all offsets are UTF-16
// offsets into the reaction text.
import { isElementSymbol } from './elements'
import { parseFormula } from './formula'

// ------------------------------------------------------------------------------------------------
// Exact rationals

/** A normalised fraction: den > 0, gcd(|num|, den) = 1, zero is 0/1. */
export interface Rational {
  readonly num: bigint
  readonly den: bigint
}

const abs = (a: bigint): bigint => (a < 0n ? -a : a)

/** Greatest common divisor, always >= 0; gcd(0, 0) = 0. */
export function gcd(a: bigint, b: bigint): bigint {
  let x = abs(a)
  let y = abs(b)
  while (y !== 0n) {
    const t = x % y
    x = y
    y = t
  }
  return x
}

/** Least common multiple, always >= 0; 0 when either argument is 0. */
export function lcm(a: bigint, b: bigint): bigint {
  if (a === 0n || b === 0n) return 0n
  return abs((a / gcd(a, b)) * b)
}

function toBigInt(n: bigint | number, what: string): bigint {
  if (typeof n === 'bigint') return n
  if (!Number.isSafeInteger(n)) throw new RangeError(`${what} must be a safe integer, got ${n}`)
  return BigInt(n)
}

/** num/den, normalised. Throws RangeError for a zero denominator or a non-integer number. */
export function rational(num: bigint | number, den: bigint | number = 1n): Rational {
  let n = toBigInt(num, 'numerator')
  let d = toBigInt(den, 'denominator')
  if (d === 0n) throw new RangeError('Rational with a zero denominator')
  if (d < 0n) {
    n = -n
    d = -d
  }
  if (n === 0n) return { num: 0n, den: 1n }
  const g = gcd(n, d)
  return { num: n / g, den: d / g }
}

export const ZERO: Rational = { num: 0n, den: 1n }
export const ONE: Rational = { num: 1n, den: 1n }

export const add = (a: Rational, b: Rational): Rational => rational(a.num * b.den + b.num * a.den, a.den * b.den)
export const sub = (a: Rational, b: Rational): Rational => rational(a.num * b.den - b.num * a.den, a.den * b.den)
export const mul = (a: Rational, b: Rational): Rational => rational(a.num * b.num, a.den * b.den)
/** Throws RangeError when b is zero. */
export const div = (a: Rational, b: Rational): Rational => {
  if (b.num === 0n) throw new RangeError('Division by zero')
  return rational(a.num * b.den, a.den * b.num)
}
export const neg = (a: Rational): Rational => ({ num: -a.num, den: a.den })
export const isZero = (a: Rational): boolean => a.num === 0n
export const ratEquals = (a: Rational, b: Rational): boolean => a.num === b.num && a.den === b.den
/** -1, 0 or 1. */
export const ratCompare = (a: Rational, b: Rational): number => {
  const d = a.num * b.den - b.num * a.den
  return d < 0n ? -1 : d > 0n ? 1 : 0
}
/** "3", "-1/2". */
export const ratToString = (a: Rational): string => (a.den === 1n ? `${a.num}` : `${a.num}/${a.den}`)
/** Nearest double (for display and residual reporting only). */
export function ratToNumber(a: Rational): number {
  const n = Number(a.num)
  const d = Number(a.den)
  if (Number.isFinite(n) && Number.isFinite(d)) return n / d
  // Very large parts: scale down without losing the ratio's magnitude.
  const shift = BigInt(Math.max(a.num.toString().length, a.den.toString().length) - 300)
  const k = 10n ** (shift > 0n ? shift : 0n)
  return Number(a.num / k) / Number(a.den / k || 1n)
}

/** "3", "0.25", ".5", "1/2" -> exact rational; null when not such a number or the denominator is 0. */
export function parseRational(text: string): Rational | null {
  if (typeof text !== 'string') return null
  let m = /^(\d+)\/(\d+)$/.exec(text)
  if (m) {
    const d = BigInt(m[2] ?? '0')
    return d === 0n ? null : rational(BigInt(m[1] ?? '0'), d)
  }
  m = /^(\d*)\.(\d+)$/.exec(text)
  if (m) {
    const frac = m[2] ?? ''
    return rational(BigInt((m[1] ?? '') + frac || '0'), 10n ** BigInt(frac.length))
  }
  if (/^\d+$/.test(text)) return rational(BigInt(text))
  return null
}

// ------------------------------------------------------------------------------------------------
// Parsing

export interface ReactionTerm {
  /** The term as written, coefficient and state symbol included. */
  text: string
  /** The formula handed to parseFormula: state symbol dropped, Unicode sub/superscripts made ASCII
   *  (Cu²⁺ -> Cu^2+); 'e-' for an electron. */
  formula: string
  /** The written coefficient, null when none was written (read as 1). */
  coefficient: Rational | null
  start: number // offset in the reaction text, inclusive
  end: number // exclusive
  isElectron: boolean
  /** The species as written after the coefficient (state symbol included), e.g. 'H2O(l)', 'e⁻'. */
  species: string
  speciesStart: number
}

export interface ReactionIssue {
  message: string
  start: number
  end: number
}

export interface ParsedReaction {
  /** No errors (warnings allowed). */
  ok: boolean
  left: ReactionTerm[]
  right: ReactionTerm[]
  errors: ReactionIssue[]
  /** Non-fatal remarks, e.g. an ambiguous charge such as Fe3+ (read as Fe^3+). */
  warnings: ReactionIssue[]
  /** The arrow used (the first one when several were written), null when there is none. */
  arrow: { text: string; start: number; end: number } | null
}

/** Arrows in the order tried at one position (longer forms first). */
const ARROW_RE = /<=>|<-->|<->|==>|=>|⇌|⇄|↔|⟶|→|(?<=^|\s)-->|->|=/g
const TERM_SEPARATOR_RE = /\s+\+\s+/g
const COEFFICIENT_RE = /^(?:\d+\/\d+|\d+\.\d+|\.\d+|[1-9]\d*|0(?!\d))/
const STATE_RE = /\s*\((?:aq|s|l|g)\)$/
const ELECTRONS = new Set(['e', 'e-', 'e^-'])
const SUBSCRIPTS = '₀₁₂₃₄₅₆₇₈₉'
const SUPERSCRIPTS = '⁰¹²³⁴⁵⁶⁷⁸⁹'
const isSuperscript = (c: string): boolean => SUPERSCRIPTS.includes(c) || c === '⁺' || c === '⁻'

const ARROW_HELP = "write the arrow as '->', '→', '=', '<=>' or '⇌'"

/**
 * ASCII form of a species for parseFormula, with, for each character of it, the offset in the
 * reaction text it came from (plus one entry for the end).
 */
function normaliseSpecies(written: string, offset: number): { text: string; map: number[] } {
  let trailing = written.length
  while (trailing > 0 && isSuperscript(written.charAt(trailing - 1))) trailing--
  let text = ''
  const map: number[] = []
  for (let i = 0; i < written.length; i++) {
    const c = written.charAt(i)
    if (i === trailing) {
      // Trailing superscript charge: Cu²⁺ -> Cu^2+.
      text += '^'
      map.push(offset + i)
    }
    let out = c
    const sub = SUBSCRIPTS.indexOf(c)
    const sup = SUPERSCRIPTS.indexOf(c)
    if (sub >= 0) out = String(sub)
    else if (sup >= 0) out = String(sup)
    else if (c === '⁺') out = '+'
    else if (c === '⁻' || c === '−') out = '-'
    text += out
    map.push(offset + i)
  }
  map.push(offset + written.length)
  return { text, map }
}

class ReactionParser {
  readonly errors: ReactionIssue[] = []
  readonly warnings: ReactionIssue[] = []

  constructor(readonly text: string) {}

  private issue(into: ReactionIssue[], message: string, start: number, end: number): void {
    const len = this.text.length
    const s = Math.max(0, Math.min(start, len))
    const e = Math.max(s, Math.min(end, len))
    into.push({ message, start: s, end: e })
  }

  error(message: string, start: number, end: number): void {
    this.issue(this.errors, message, start, end)
  }

  run(): ParsedReaction {
    const { text } = this
    const result = (left: ReactionTerm[], right: ReactionTerm[], arrow: ParsedReaction['arrow']): ParsedReaction => ({
      ok: this.errors.length === 0,
      left,
      right,
      errors: this.errors,
      warnings: this.warnings,
      arrow,
    })
    if (text.trim() === '') {
      this.error('The reaction is empty: write one such as 2 H2O -> 2 H2 + O2', 0, text.length)
      return result([], [], null)
    }
    const arrows = [...text.matchAll(ARROW_RE)].map((m) => ({ text: m[0], start: m.index, end: m.index + m[0].length }))
    const first = arrows[0]
    if (first === undefined) {
      this.error(`No reaction arrow: ${ARROW_HELP} between the reactants and the products`, 0, text.length)
      return result(this.side(0, text.length, null), [], null)
    }
    for (const extra of arrows.slice(1)) {
      this.error(`More than one arrow: a reaction has one arrow ('${first.text}' at offset ${first.start})`, extra.start, extra.end)
    }
    const left = this.side(0, first.start, { name: 'left', arrow: first })
    // After a second arrow nothing more is read (that arrow is already an error).
    const right = this.side(first.end, arrows[1]?.start ?? text.length, { name: 'right', arrow: first })
    return result(left, right, first)
  }

  /** The terms of text[from, to). `side` is null when there is no arrow (the whole text is read). */
  private side(from: number, to: number, side: { name: string; arrow: { start: number; end: number } } | null): ReactionTerm[] {
    const seg = this.text.slice(from, to)
    if (seg.trim() === '') {
      if (side) {
        this.error(`Nothing on the ${side.name} of the arrow: the reaction needs species on both sides`, side.arrow.start, side.arrow.end)
      }
      return []
    }
    const terms: ReactionTerm[] = []
    // Pieces between ' + ' separators, each with the separators around it (for empty-term errors).
    const pieces: { start: number; end: number; before: [number, number] | null; after: [number, number] | null }[] = []
    let pieceStart = 0
    let before: [number, number] | null = null
    for (const m of seg.matchAll(TERM_SEPARATOR_RE)) {
      const plus = m.index + m[0].indexOf('+')
      const sep: [number, number] = [from + plus, from + plus + 1]
      pieces.push({ start: pieceStart, end: m.index, before, after: sep })
      pieceStart = m.index + m[0].length
      before = sep
    }
    pieces.push({ start: pieceStart, end: seg.length, before, after: null })
    for (const p of pieces) {
      const raw = seg.slice(p.start, p.end)
      const lead = raw.length - raw.trimStart().length
      const piece = raw.trim()
      const at = from + p.start + lead
      if (piece === '') {
        const [s, e] = p.after ?? p.before ?? [from, to]
        this.error("Empty term: a '+' needs a species on each side", s, e)
        continue
      }
      const term = this.term(piece, at)
      if (term) terms.push(term)
    }
    return terms
  }

  private term(piece: string, start: number): ReactionTerm | null {
    const end = start + piece.length
    let coefficient: Rational | null = null
    let speciesOffset = 0
    const m = COEFFICIENT_RE.exec(piece)
    if (m) {
      const coefText = m[0]
      const value = parseRational(coefText)
      if (value === null) {
        this.error(`Invalid coefficient '${coefText}': a fraction cannot have a zero denominator`, start, start + coefText.length)
        return null
      }
      if (isZero(value)) {
        this.error(`A coefficient of ${coefText} removes the species: leave the term out instead`, start, start + coefText.length)
        return null
      }
      coefficient = value
      speciesOffset = coefText.length
      while (speciesOffset < piece.length && /\s/.test(piece.charAt(speciesOffset))) speciesOffset++
      if (speciesOffset === piece.length) {
        this.error(`Expected a species after the coefficient '${coefText}', e.g. ${coefText} H2O`, start, end)
        return null
      }
    }
    const species = piece.slice(speciesOffset)
    const speciesStart = start + speciesOffset
    const state = STATE_RE.exec(species)
    const body = state ? species.slice(0, state.index) : species
    if (body === '') {
      this.error(`A state symbol '${species.trim()}' needs a species before it, e.g. H2O(l)`, speciesStart, end)
      return null
    }
    const ws = /\s/.exec(body)
    if (ws) {
      this.error(
        `'${body}' is not one species: separate terms with ' + ' (a plus with a space on each side) ` +
          `and write a formula without spaces`,
        speciesStart,
        speciesStart + body.length,
      )
      return null
    }
    const norm = normaliseSpecies(body, speciesStart)
    const base = { text: piece, coefficient, start, end, species, speciesStart }
    if (ELECTRONS.has(norm.text)) return { ...base, formula: 'e-', isElectron: true }

    const f = parseFormula(norm.text)
    const mapOffset = (i: number): number => norm.map[Math.max(0, Math.min(i, norm.map.length - 1))] ?? speciesStart
    let bad = false
    for (const issue of f.issues) {
      if (issue.code === 'unknown-element' && isElementSymbol(norm.text.slice(issue.start, issue.end))) {
        continue // a real element without a standard atomic weight (Tc, Pm...): fine for balancing
      }
      const s = mapOffset(issue.start)
      const e = issue.end > issue.start ? mapOffset(issue.end - 1) + 1 : s
      if (issue.severity === 'error') {
        bad = true
        this.error(issue.message, s, e)
      } else {
        this.issue(this.warnings, issue.message, s, e)
      }
    }
    if (!bad && f.counts.size === 0) {
      this.error(`'${body}' has no elements`, speciesStart, speciesStart + body.length)
    }
    return { ...base, formula: norm.text, isElectron: false }
  }
}

/** Parse a reaction equation such as `2H2O + 2e- → H2 + 2OH-`. Never throws. */
export function parseReaction(text: string): ParsedReaction {
  const t = typeof text === 'string' ? text : ''
  try {
    return new ReactionParser(t).run()
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e)
    return {
      ok: false,
      left: [],
      right: [],
      errors: [{ message: `Internal error while reading the reaction: ${message}`, start: 0, end: t.length }],
      warnings: [],
      arrow: null,
    }
  }
}

// ------------------------------------------------------------------------------------------------
// Composition

interface Composition {
  counts: Map<string, bigint>
  charge: bigint
}

/** Element counts and charge of a term, null when its formula does not read cleanly. */
function compositionOf(term: ReactionTerm): Composition | null {
  if (term.isElectron) return { counts: new Map(), charge: -1n }
  const f = parseFormula(term.formula)
  const fatal = f.issues.some(
    (i) => i.severity === 'error' && !(i.code === 'unknown-element' && isElementSymbol(term.formula.slice(i.start, i.end))),
  )
  if (fatal || f.counts.size === 0 || !Number.isSafeInteger(f.charge)) return null
  const counts = new Map<string, bigint>()
  for (const [el, n] of f.counts) {
    if (!Number.isSafeInteger(n)) return null
    counts.set(el, BigInt(n))
  }
  return { counts, charge: BigInt(f.charge) }
}

export interface BalanceCheck {
  /** True when the reaction parsed without errors and every residual is zero. */
  balanced: boolean
  /** Right minus left, per element (every element that appears, zeros included). */
  elements: Record<string, number>
  /** Right minus left, in elementary charges. */
  charge: number
}

/** Residuals of the reaction as written (unwritten coefficients are 1). Never throws. */
export function checkBalance(r: ParsedReaction): BalanceCheck {
  try {
    const acc = new Map<string, Rational>()
    let charge = ZERO
    let complete = r.ok && r.left.length > 0 && r.right.length > 0
    const sides: [ReactionTerm[], Rational][] = [
      [r.left, neg(ONE)],
      [r.right, ONE],
    ]
    for (const [terms, sign] of sides) {
      for (const term of terms) {
        const comp = compositionOf(term)
        if (comp === null) {
          complete = false
          continue
        }
        const k = mul(sign, term.coefficient ?? ONE)
        for (const [el, n] of comp.counts) acc.set(el, add(acc.get(el) ?? ZERO, mul(k, rational(n))))
        charge = add(charge, mul(k, rational(comp.charge)))
      }
    }
    const elements: Record<string, number> = {}
    let zero = isZero(charge)
    for (const [el, v] of acc) {
      elements[el] = ratToNumber(v)
      if (!isZero(v)) zero = false
    }
    return { balanced: complete && zero, elements, charge: ratToNumber(charge) }
  } catch {
    return { balanced: false, elements: {}, charge: 0 }
  }
}

// ------------------------------------------------------------------------------------------------
// Balancing

export type BalanceResult =
  | { ok: true; coefficients: { left: bigint[]; right: bigint[] }; text: string }
  | { ok: false; reason: string }

/** Basis of the nullspace of the m×n matrix `a`, by exact Gauss-Jordan elimination. */
export function nullspace(a: readonly (readonly Rational[])[], n: number): Rational[][] {
  const m = a.map((row) => row.slice())
  const pivots: number[] = []
  let r = 0
  for (let c = 0; c < n && r < m.length; c++) {
    let p = r
    while (p < m.length && isZero(m[p]?.[c] ?? ZERO)) p++
    if (p === m.length) continue
    const tmp = m[p]!
    m[p] = m[r]!
    m[r] = tmp
    const pivotRow = m[r]!
    const pv = pivotRow[c]!
    for (let j = 0; j < n; j++) pivotRow[j] = div(pivotRow[j] ?? ZERO, pv)
    for (let i = 0; i < m.length; i++) {
      const row = m[i]!
      const f = row[c] ?? ZERO
      if (i === r || isZero(f)) continue
      for (let j = 0; j < n; j++) row[j] = sub(row[j] ?? ZERO, mul(f, pivotRow[j] ?? ZERO))
    }
    pivots.push(c)
    r++
  }
  const basis: Rational[][] = []
  for (let free = 0; free < n; free++) {
    if (pivots.includes(free)) continue
    const v = new Array<Rational>(n).fill(ZERO)
    v[free] = ONE
    pivots.forEach((pc, k) => {
      v[pc] = neg(m[k]?.[free] ?? ZERO)
    })
    basis.push(v)
  }
  return basis
}

/** The smallest integer vector along a rational vector (sign kept; all-zero stays zero). */
function toIntegers(v: readonly Rational[]): bigint[] {
  let den = 1n
  for (const x of v) den = lcm(den, x.den)
  const ints = v.map((x) => x.num * (den / x.den))
  let g = 0n
  for (const x of ints) g = gcd(g, x)
  return g === 0n ? ints : ints.map((x) => x / g)
}

/** Coefficient separator of the user's style: ' ' for `2 H2O`, '' for `2H2O` (first written one). */
function coefficientGap(r: ParsedReaction): string {
  for (const t of [...r.left, ...r.right]) {
    if (t.coefficient === null) continue
    return /\s$/.test(t.text.slice(0, t.speciesStart - t.start)) ? ' ' : ''
  }
  return ' '
}

function renderSide(terms: { term: ReactionTerm; k: bigint }[], gap: string): string {
  return terms.map(({ term, k }) => (k === 1n ? term.species : `${k}${gap}${term.species}`)).join(' + ')
}

function render(r: ParsedReaction, left: { term: ReactionTerm; k: bigint }[], right: { term: ReactionTerm; k: bigint }[]): string {
  const gap = coefficientGap(r)
  return `${renderSide(left, gap)} ${r.arrow?.text ?? '->'} ${renderSide(right, gap)}`
}

function compositionKey(c: Composition): string {
  return [...c.counts.entries()]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([el, n]) => `${el}${n}`)
    .join('') + `|${c.charge}`
}

/** Keeps the elimination cheap on pathological input (a real equation has a handful of species). */
const MAX_SPECIES = 100

function balanceImpl(r: ParsedReaction): BalanceResult {
  const fail = (reason: string): BalanceResult => ({ ok: false, reason })
  if (!r.ok) return fail(`The reaction has errors: ${r.errors[0]?.message ?? 'it could not be read'}`)
  if (r.left.length === 0 || r.right.length === 0) return fail('The reaction needs species on both sides of the arrow')
  const terms = [...r.left, ...r.right]
  if (terms.length > MAX_SPECIES) return fail(`Too many species to balance (${terms.length}; at most ${MAX_SPECIES})`)
  const comps: Composition[] = []
  for (const t of terms) {
    const c = compositionOf(t)
    if (c === null) return fail(`'${t.species}' is not a formula that can be balanced`)
    comps.push(c)
  }
  const nLeft = r.left.length
  for (const [side, from, to] of [
    ['left', 0, nLeft],
    ['right', nLeft, terms.length],
  ] as const) {
    const seen = new Map<string, string>()
    for (let j = from; j < to; j++) {
      const key = compositionKey(comps[j]!)
      const before = seen.get(key)
      if (before !== undefined) {
        return fail(`'${terms[j]!.species}' and '${before}' are the same species, written twice on the ${side}: write it once`)
      }
      seen.set(key, terms[j]!.species)
    }
  }

  const elements: string[] = []
  for (const c of comps) for (const el of c.counts.keys()) if (!elements.includes(el)) elements.push(el)
  const sign = (j: number): bigint => (j < nLeft ? 1n : -1n)
  const rows: Rational[][] = elements.map((el) => comps.map((c, j) => rational(sign(j) * (c.counts.get(el) ?? 0n))))
  rows.push(comps.map((c, j) => rational(sign(j) * c.charge)))

  const basis = nullspace(rows, terms.length)
  if (basis.length === 0) {
    const leftEls = new Set(comps.slice(0, nLeft).flatMap((c) => [...c.counts.keys()]))
    const rightEls = new Set(comps.slice(nLeft).flatMap((c) => [...c.counts.keys()]))
    const onlyLeft = elements.filter((el) => leftEls.has(el) && !rightEls.has(el))
    const onlyRight = elements.filter((el) => rightEls.has(el) && !leftEls.has(el))
    const hints: string[] = []
    if (onlyLeft.length > 0) hints.push(`${onlyLeft.join(', ')} appear${onlyLeft.length === 1 ? 's' : ''} only on the left`)
    if (onlyRight.length > 0) hints.push(`${onlyRight.join(', ')} appear${onlyRight.length === 1 ? 's' : ''} only on the right`)
    return fail(
      'The reaction cannot be balanced with these species: no coefficients conserve every element and the charge' +
        (hints.length > 0 ? ` (${hints.join('; ')})` : ''),
    )
  }
  if (basis.length > 1) {
    return fail(
      `These species allow ${basis.length} independent reactions (more than one independent reaction is mixed ` +
        'in), so conservation alone does not fix the coefficients: write them yourself or split the equation',
    )
  }
  let v = toIntegers(basis[0]!)
  const positives = v.filter((x) => x > 0n).length
  const negatives = v.filter((x) => x < 0n).length
  if (negatives > positives || (negatives === positives && (v.find((x) => x !== 0n) ?? 0n) < 0n)) v = v.map((x) => -x)
  const zeros = terms.filter((_, j) => v[j] === 0n)
  if (zeros.length > 0) {
    const names = zeros.map((t) => `'${t.species}'`).join(', ')
    return fail(
      `${names} ${zeros.length === 1 ? 'takes' : 'take'} no part: the other species balance only without ` +
        `${zeros.length === 1 ? 'it' : 'them'} (coefficient 0)`,
    )
  }
  const misplaced = terms.filter((_, j) => v[j]! < 0n)
  if (misplaced.length > 0) {
    const newLeft: { term: ReactionTerm; k: bigint }[] = []
    const newRight: { term: ReactionTerm; k: bigint }[] = []
    terms.forEach((term, j) => {
      const k = v[j]!
      const onLeft = j < nLeft ? k > 0n : k < 0n
      ;(onLeft ? newLeft : newRight).push({ term, k: abs(k) })
    })
    const names = misplaced.map((t) => `'${t.species}'`).join(', ')
    return fail(
      `No positive coefficients balance the reaction as written: ${names} would have to be on the other ` +
        `side (${render(r, newLeft, newRight)})`,
    )
  }
  const left = v.slice(0, nLeft)
  const right = v.slice(nLeft)
  const text = render(
    r,
    r.left.map((term, j) => ({ term, k: left[j]! })),
    r.right.map((term, j) => ({ term, k: right[j]! })),
  )
  return { ok: true, coefficients: { left, right }, text }
}

/**
 * The smallest positive integer coefficients that conserve every element and the charge, ignoring
 * the coefficients written. Never throws.
 */
export function balance(r: ParsedReaction): BalanceResult {
  try {
    return balanceImpl(r)
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e)
    return { ok: false, reason: `Internal error while balancing: ${message}` }
  }
}
