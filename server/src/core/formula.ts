// Chemical formula parser. It never throws: every problem becomes a FormulaIssue with an offset
// range inside the formula text, and a formula with an error-severity issue has molarMass NaN.
//
// Grammar (informal):
//   formula  := part ( SEP coef? part )* charge?
//   part     := unit+
//   unit     := SYMBOL count? | '(' part ')' count? | '[' part ']' count?
//   SEP      := '·' (U+00B7) | '•' (U+2022) | '*' | '.'          hydrates: CuSO4·5H2O, Na2CO3.10H2O
//   charge   := '^' digits? ('+'|'-')  |  ('+'+ | '-'+)           SO4^2-, Cu^2+, OH-, SO4--
// A count immediately followed by a single final sign (Cu2+, SO42-) is read as a charge and flagged
// 'ambiguous-charge'; see readCount.
//
// Molar masses use ATOMIC_WEIGHTS (elements.ts) and ignore the electron mass of ions (the usual
// convention: the molar mass of SO4^2- is that of SO4).
import { ATOMIC_WEIGHTS, ELEMENT_NAMES, isElementSymbol } from './elements'
import { GenerationalCache } from './memo'

export interface FormulaIssue {
  code: 'unknown-element' | 'zero-for-oxygen' | 'formula-syntax' | 'ambiguous-charge'
  severity: 'error' | 'warning'
  message: string
  start: number // offset within the formula text (UTF-16), inclusive
  end: number // exclusive
  replacement?: string // suggested full replacement for the WHOLE formula text, when one is obvious
}

export interface Formula {
  text: string
  counts: ReadonlyMap<string, number> // element -> count, including hydrate water and parentheses multipliers
  charge: number // ionic charge, 0 for neutral
  molarMass: number // g/mol; NaN if any element unknown or syntax error
  hydrateWater: number // number of H2O in a hydrate (CuSO4·5H2O -> 5), else 0
  issues: FormulaIssue[]
  ok: boolean // no error-severity issues
}

const SEPARATORS = new Set(['·', '•', '*', '.'])

/** Species a '0' typed for 'O' is checked against when the count itself is a valid number (H20). */
const ZERO_FOR_O_SPECIES = new Set(['H2O', 'CO2', 'NaOH', 'KOH', 'LiOH', 'H2O2', 'SO2', 'NO2', 'O2'])

type Role = 'plain' | 'sub' | 'sep'

interface SymbolToken {
  symbol: string
  start: number
  end: number
}

interface Frame {
  open: '(' | '[' | null
  start: number
  counts: Map<string, number>
  units: number
}

interface Part {
  coef: number
  counts: Map<string, number>
}

interface Internal {
  formula: Formula
  roles: Role[]
  /** Where the charge notation starts (text.length when there is none or it was not understood). */
  chargeStart: number
}

const isUpper = (c: string): boolean => c >= 'A' && c <= 'Z'
const isLower = (c: string): boolean => c >= 'a' && c <= 'z'
const isLetter = (c: string): boolean => isUpper(c) || isLower(c)
const isDigit = (c: string): boolean => c >= '0' && c <= '9'
const isSign = (c: string): boolean => c === '+' || c === '-'

function replaceAt(text: string, index: number, by: string): string {
  return text.slice(0, index) + by + text.slice(index + 1)
}

function addCount(into: Map<string, number>, symbol: string, n: number): void {
  into.set(symbol, (into.get(symbol) ?? 0) + n)
}

function describeChar(text: string, at: number): { shown: string; length: number } {
  const cp = text.codePointAt(at)
  if (cp === undefined) return { shown: '', length: 0 }
  const length = cp > 0xffff ? 2 : 1
  const ch = text.slice(at, at + length)
  const shown = cp < 0x20 || cp === 0x7f ? `U+${cp.toString(16).toUpperCase().padStart(4, '0')}` : `'${ch}'`
  return { shown, length }
}

class FormulaParser {
  readonly issues: FormulaIssue[] = []
  readonly roles: Role[]
  readonly symbols: SymbolToken[] = []
  /** Offsets of '0' characters read as the letter O. */
  readonly zeroAsO: number[] = []
  pos = 0
  failed = false
  charge = 0
  chargeStart: number
  private pendingCharge: { value: number; start: number } | null = null
  private readonly parts: Part[] = []

  constructor(
    readonly text: string,
    readonly suggest: boolean,
  ) {
    this.roles = new Array<Role>(text.length).fill('plain')
    this.chargeStart = text.length
  }

  private error(code: FormulaIssue['code'], message: string, start: number, end: number, replacement?: string): void {
    this.push('error', code, message, start, end, replacement)
  }

  private push(
    severity: FormulaIssue['severity'],
    code: FormulaIssue['code'],
    message: string,
    start: number,
    end: number,
    replacement?: string,
  ): void {
    const len = this.text.length
    const s = Math.max(0, Math.min(start, len))
    const e = Math.max(s, Math.min(end, len))
    const issue: FormulaIssue = { code, severity, message, start: s, end: e }
    if (replacement !== undefined && replacement !== this.text) issue.replacement = replacement
    this.issues.push(issue)
  }

  private syntax(message: string, start: number, end: number, replacement?: string): void {
    this.error('formula-syntax', message, start, end, replacement)
    this.failed = true
  }

  /** `candidate` as a replacement only when it parses without errors. */
  private ifClean(candidate: string): string | undefined {
    if (!this.suggest || candidate.length === 0) return undefined
    return parseInternal(candidate, false).formula.ok ? candidate : undefined
  }

  run(): void {
    const { text } = this
    if (text.length === 0) {
      this.syntax('The formula is empty: expected an element symbol such as Na or a group such as (NH4)', 0, 0)
      return
    }
    const ws = /\s/.exec(text)
    if (ws) {
      this.syntax(
        'Spaces are not allowed inside a formula',
        ws.index,
        ws.index + 1,
        this.ifClean(text.replace(/\s+/g, '')),
      )
      return
    }
    if (isDigit(text.charAt(0)) && text.charAt(0) !== '0') {
      let end = 0
      while (end < text.length && isDigit(text.charAt(end))) end++
      if (end === text.length) {
        this.syntax(`'${text}' is a number, not a formula: a formula starts with an element symbol or '('`, 0, end)
      } else {
        this.syntax(
          `A formula cannot start with a number ('${text.slice(0, end)}'); give the amount as a quantity instead`,
          0,
          end,
          this.ifClean(text.slice(end)),
        )
      }
      return
    }

    let coef = 1
    for (;;) {
      const partStart = this.pos
      const counts = this.parsePart()
      if (this.failed) return
      if (counts === null) {
        const { shown, length } = describeChar(text, partStart)
        this.syntax(
          `Unexpected character ${shown}: expected an element symbol (e.g. Na) or '('`,
          partStart,
          partStart + Math.max(1, length),
        )
        return
      }
      this.parts.push({ coef, counts })
      if (this.pendingCharge) {
        this.charge = this.pendingCharge.value
        this.chargeStart = this.pendingCharge.start
        return
      }
      if (this.pos >= text.length) return
      const c = text.charAt(this.pos)
      if (SEPARATORS.has(c)) {
        const sepPos = this.pos
        this.roles[sepPos] = 'sep'
        this.pos++
        const coefStart = this.pos
        while (this.pos < text.length && isDigit(text.charAt(this.pos))) this.pos++
        const digits = text.slice(coefStart, this.pos)
        if (digits.length > 0 && digits.charAt(0) === '0') {
          this.syntax(`A hydrate coefficient cannot start with 0 ('${digits}')`, coefStart, this.pos)
          return
        }
        coef = digits.length > 0 ? Number(digits) : 1
        const next = this.pos < text.length ? text.charAt(this.pos) : ''
        if (!(isLetter(next) || next === '(' || next === '[' || next === '0')) {
          if (digits.length > 0) {
            this.syntax(`Expected a formula after the coefficient '${digits}' (e.g. ${digits}H2O)`, coefStart, this.pos)
          } else {
            this.syntax(`'${c}' must be followed by a formula, e.g. 5H2O`, sepPos, sepPos + 1)
          }
          return
        }
        continue
      }
      if (c === '^') {
        this.parseCaretCharge()
        return
      }
      if (isSign(c)) {
        this.parseSignRun()
        return
      }
      const { shown, length } = describeChar(text, this.pos)
      this.syntax(`Unexpected character ${shown} in the formula`, this.pos, this.pos + length)
      return
    }
  }

  /**
   * Units up to a separator, a charge, a stray character or the end. Returns the element counts,
   * or null when not a single unit was read (the caller reports that).
   */
  private parsePart(): Map<string, number> | null {
    const { text } = this
    const stack: Frame[] = [{ open: null, start: this.pos, counts: new Map(), units: 0 }]
    const partIndex = this.parts.length
    while (this.pos < text.length && !this.pendingCharge) {
      const c = text.charAt(this.pos)
      const top = stack[stack.length - 1]
      if (top === undefined) return null
      if (isLetter(c)) {
        const start = this.pos
        let symbol = c
        if (isUpper(c) && this.pos + 1 < text.length && isLower(text.charAt(this.pos + 1))) symbol += text.charAt(this.pos + 1)
        this.pos += symbol.length
        this.symbols.push({ symbol, start, end: this.pos })
        const monatomic = partIndex === 0 && stack.length === 1 && top.units === 0 && start === 0
        const n = this.readCount(monatomic ? symbol : null)
        addCount(top.counts, symbol, n)
        top.units++
      } else if (c === '0') {
        // A zero where an element symbol must be: almost certainly the letter O (C02, Na0H, 02).
        this.zeroAsO.push(this.pos)
        this.pos++
        const n = this.readCount(null)
        addCount(top.counts, 'O', n)
        top.units++
      } else if (c === '(' || c === '[') {
        stack.push({ open: c, start: this.pos, counts: new Map(), units: 0 })
        this.pos++
      } else if (c === ')' || c === ']') {
        if (stack.length === 1) {
          this.syntax(
            `Unmatched '${c}': no group is open here`,
            this.pos,
            this.pos + 1,
            this.ifClean(text.slice(0, this.pos) + text.slice(this.pos + 1)),
          )
          return null
        }
        const expected = top.open === '(' ? ')' : ']'
        if (c !== expected) {
          this.syntax(
            `'${c}' does not match the '${top.open ?? ''}' at offset ${top.start}; expected '${expected}'`,
            this.pos,
            this.pos + 1,
            this.ifClean(replaceAt(text, this.pos, expected)),
          )
          return null
        }
        if (top.units === 0) {
          this.syntax('Empty group: put element symbols inside the brackets', top.start, this.pos + 1)
          return null
        }
        this.pos++
        stack.pop()
        const n = this.readCount(null)
        const outer = stack[stack.length - 1]
        if (outer === undefined) return null
        for (const [el, k] of top.counts) addCount(outer.counts, el, k * n)
        outer.units++
      } else if (isDigit(c)) {
        let end = this.pos
        while (end < text.length && isDigit(text.charAt(end))) end++
        this.syntax(
          `Unexpected number '${text.slice(this.pos, end)}': a count goes right after an element symbol or a closing bracket`,
          this.pos,
          end,
        )
        return null
      } else {
        break
      }
    }
    const open = stack[1]
    if (open !== undefined) {
      this.syntax(
        `'${open.open ?? ''}' is never closed (expected '${open.open === '(' ? ')' : ']'}')`,
        open.start,
        open.start + 1,
      )
      return null
    }
    const base = stack[0]
    return base !== undefined && base.units > 0 ? base.counts : null
  }

  /**
   * The count after a symbol or a closing bracket (1 when none). `monatomicSymbol` is set when the
   * symbol just read is the first and only unit so far of the whole formula.
   *
   * A count followed by exactly one final sign is ambiguous (`Cu2+` = Cu^2+ or Cu2^+?):
   * - a count of 2+ digits whose last digit is not 0: the last digit is the charge (SO42- = SO4^2-);
   * - a single digit after a lone element symbol: the digit is the charge (Cu2+ = Cu^2+);
   * both flagged 'ambiguous-charge' with the caret form as replacement. Otherwise (NO3-, NH4+) the
   * digits are the count and the sign a charge of 1, the usual reading, not flagged.
   */
  private readCount(monatomicSymbol: string | null): number {
    const { text } = this
    const start = this.pos
    let end = start
    while (end < text.length && isDigit(text.charAt(end))) end++
    if (end === start) return 1
    const digits = text.slice(start, end)
    // A leading zero is left for parsePart, which reads it as the letter O (C02 -> C, O2).
    if (digits.charAt(0) === '0') return 1

    const rest = text.slice(end)
    if (rest.length === 1 && isSign(rest)) {
      const sign = rest === '+' ? 1 : -1
      const last = digits.charAt(digits.length - 1)
      let chargeDigitAt = -1
      if (digits.length >= 2 && last !== '0') chargeDigitAt = end - 1
      else if (digits.length === 1 && monatomicSymbol !== null) chargeDigitAt = start
      if (chargeDigitAt >= 0) {
        const magnitude = Number(text.charAt(chargeDigitAt))
        const body = text.slice(0, chargeDigitAt)
        const explicit = `${body}^${text.charAt(chargeDigitAt)}${rest}`
        this.push(
          'warning',
          'ambiguous-charge',
          `Ambiguous charge '${text.slice(chargeDigitAt)}': read as ${explicit}; write '${explicit}' ` +
            `(charge after '^') to make it explicit`,
          chargeDigitAt,
          text.length,
          explicit,
        )
        for (let i = start; i < chargeDigitAt; i++) this.roles[i] = 'sub'
        this.pendingCharge = { value: sign * magnitude, start: chargeDigitAt }
        this.pos = text.length
        return chargeDigitAt > start ? Number(text.slice(start, chargeDigitAt)) : 1
      }
    }

    for (let i = start; i < end; i++) this.roles[i] = 'sub'
    this.pos = end
    if (this.suggest) this.checkZeroInCount(start, end)
    return Number(digits)
  }

  /** H20, H202, CuSO4·5H20: a valid count with a 0 that, read as O, gives a common species. */
  private checkZeroInCount(start: number, end: number): void {
    const { text } = this
    for (let i = start + 1; i < end; i++) {
      if (text.charAt(i) !== '0') continue
      const candidate = replaceAt(text, i, 'O')
      let segStart = i
      while (segStart > 0 && !SEPARATORS.has(candidate.charAt(segStart - 1))) segStart--
      let segEnd = i
      while (segEnd < candidate.length && !SEPARATORS.has(candidate.charAt(segEnd)) && candidate.charAt(segEnd) !== '^') segEnd++
      const segment = candidate.slice(segStart, segEnd).replace(/^[0-9]+/, '')
      if (ZERO_FOR_O_SPECIES.has(segment)) {
        this.push(
          'warning',
          'zero-for-oxygen',
          `'${text.slice(start, end)}' contains a zero where the letter O is likely meant: did you mean ${segment}?`,
          i,
          i + 1,
          candidate,
        )
        return
      }
    }
  }

  private parseCaretCharge(): void {
    const { text } = this
    const caret = this.pos
    let p = caret + 1
    const digitsStart = p
    while (p < text.length && isDigit(text.charAt(p))) p++
    const digits = text.slice(digitsStart, p)
    const sign = p < text.length ? text.charAt(p) : ''
    const swappedForm = /^\^([+-])([1-9][0-9]*)$/.exec(text.slice(caret))
    if (swappedForm) {
      // Fe^-3 / Fe^+3: sign before the magnitude.
      const swapped = `^${swappedForm[2] ?? ''}${swappedForm[1] ?? ''}`
      this.syntax(
        `Write the charge as magnitude then sign: '${swapped}'`,
        caret,
        text.length,
        this.ifClean(text.slice(0, caret) + swapped),
      )
      return
    }
    if (!isSign(sign)) {
      this.syntax(`A charge after '^' needs a sign, e.g. ^2- or ^+`, caret, text.length)
      return
    }
    if (digits.length > 0 && digits.charAt(0) === '0') {
      this.syntax(`Invalid charge magnitude '${digits}'`, digitsStart, p)
      return
    }
    if (p + 1 < text.length) {
      this.syntax('Unexpected text after the charge: the charge must end the formula', p + 1, text.length)
      return
    }
    this.charge = (sign === '+' ? 1 : -1) * (digits.length > 0 ? Number(digits) : 1)
    this.chargeStart = caret
  }

  private parseSignRun(): void {
    const { text } = this
    const start = this.pos
    let p = start
    while (p < text.length && isSign(text.charAt(p))) p++
    if (p < text.length) {
      this.syntax(
        `A charge sign must end the formula (found '${text.slice(start, p)}' before more text)`,
        start,
        p,
      )
      return
    }
    const run = text.slice(start)
    if (/^\++$/.test(run)) this.charge = run.length
    else if (/^-+$/.test(run)) this.charge = -run.length
    else {
      this.syntax(`Mixed charge signs '${run}'`, start, text.length)
      return
    }
    this.chargeStart = start
  }

  /** Issues for '0' read as O, and for symbols that are not elements (or lack an atomic weight). */
  finishElements(): void {
    const { text } = this
    if (this.zeroAsO.length > 0) {
      let fixed = text
      for (const i of this.zeroAsO) fixed = replaceAt(fixed, i, 'O')
      for (const i of this.zeroAsO) {
        this.error(
          'zero-for-oxygen',
          `Zero '0' where an element symbol is expected: the letter O is probably meant (${fixed})`,
          i,
          i + 1,
          fixed,
        )
      }
    }

    const unknown = this.symbols.filter((t) => !(t.symbol in ATOMIC_WEIGHTS))
    if (unknown.length === 0) return
    // Real elements without a standard atomic weight.
    const fake: SymbolToken[] = []
    for (const t of unknown) {
      if (isElementSymbol(t.symbol)) {
        this.error(
          'unknown-element',
          `${t.symbol} (${ELEMENT_NAMES[t.symbol]}) has no standard atomic weight, so no molar mass can be computed`,
          t.start,
          t.end,
        )
      } else {
        fake.push(t)
      }
    }
    if (fake.length === 0) return

    // Group the non-element symbols by the run of letters they sit in, and try a case fix per run.
    const runs = new Map<number, { start: number; end: number; tokens: SymbolToken[] }>()
    for (const t of fake) {
      let s = t.start
      while (s > 0 && isLetter(text.charAt(s - 1))) s--
      let e = t.end
      while (e < text.length && isLetter(text.charAt(e))) e++
      const run = runs.get(s) ?? { start: s, end: e, tokens: [] }
      run.tokens.push(t)
      runs.set(s, run)
    }
    const fixes: { start: number; end: number; tokens: SymbolToken[]; fix: CaseFix | null }[] = []
    for (const run of runs.values()) {
      fixes.push({ ...run, fix: this.suggest ? caseFix(text.slice(run.start, run.end)) : null })
    }
    let replacement: string | undefined
    if (this.suggest && fixes.every((f) => f.fix !== null)) {
      let candidate = text
      for (const f of fixes) candidate = candidate.slice(0, f.start) + f.fix!.text + candidate.slice(f.end)
      const check = parseInternal(candidate, false).formula
      if (!check.issues.some((i) => i.code === 'unknown-element')) replacement = candidate
    }
    for (const f of fixes) {
      if (f.fix && replacement !== undefined) {
        let s = Math.min(...f.tokens.map((t) => t.start))
        let e = Math.max(...f.tokens.map((t) => t.end))
        for (const [a, b] of f.fix.changed) {
          s = Math.min(s, f.start + a)
          e = Math.max(e, f.start + b)
        }
        const was = text.slice(s, e)
        const now = replacement.slice(s, e)
        const names = f.tokens.map((t) => `'${t.symbol}'`).join(', ')
        this.error(
          'unknown-element',
          `${names} ${f.tokens.length > 1 ? 'are not element symbols' : 'is not an element symbol'}: did you mean '${now}' instead of '${was}'?`,
          s,
          e,
          replacement,
        )
      } else {
        for (const t of f.tokens) {
          this.error('unknown-element', `Unknown element symbol '${t.symbol}'`, t.start, t.end)
        }
      }
    }
  }

  result(): Internal {
    const counts = new Map<string, number>()
    let hydrateWater = 0
    this.parts.forEach((part, index) => {
      for (const [el, n] of part.counts) addCount(counts, el, n * part.coef)
      if (index > 0 && part.counts.size === 2 && part.counts.get('H') === 2 && part.counts.get('O') === 1) {
        hydrateWater += part.coef
      }
    })
    this.issues.sort((a, b) => a.start - b.start || a.end - b.end)
    const ok = !this.issues.some((i) => i.severity === 'error')
    let molarMass = NaN
    if (ok && counts.size > 0) {
      let m = 0
      for (const [el, n] of counts) m += (ATOMIC_WEIGHTS[el] ?? NaN) * n
      molarMass = Number.isFinite(m) ? m : NaN
    }
    if (this.failed) this.chargeStart = this.text.length
    return {
      formula: {
        text: this.text,
        counts,
        charge: this.charge,
        molarMass,
        hydrateWater: ok ? hydrateWater : 0,
        issues: this.issues,
        ok,
      },
      roles: this.roles,
      chargeStart: this.chargeStart,
    }
  }
}

interface CaseFix {
  text: string
  /** [start, end) within the run of the symbols whose letter case was changed. */
  changed: [number, number][]
}

/**
 * Re-case a run of letters so that it splits into element symbols (with atomic weights), changing
 * as few letters as possible. Null when impossible or when two splits tie (not obvious).
 */
function caseFix(run: string): CaseFix | null {
  const n = run.length
  // For each suffix run.slice(i): cheapest cost, number of cheapest splits (capped at 2), and the
  // length of the first symbol in the cheapest split.
  const cost: number[] = new Array<number>(n + 1).fill(Infinity)
  const ways: number[] = new Array<number>(n + 1).fill(0)
  const first: number[] = new Array<number>(n + 1).fill(0)
  cost[n] = 0
  ways[n] = 1
  const recase = (s: string): string => s.charAt(0).toUpperCase() + s.slice(1).toLowerCase()
  for (let i = n - 1; i >= 0; i--) {
    for (const len of [1, 2]) {
      const restWays = ways[i + len] ?? 0
      if (i + len > n || restWays === 0) continue
      const orig = run.slice(i, i + len)
      const sym = recase(orig)
      if (!(sym in ATOMIC_WEIGHTS)) continue
      let c = cost[i + len] ?? Infinity
      for (let k = 0; k < len; k++) if (orig.charAt(k) !== sym.charAt(k)) c++
      const here = cost[i] ?? Infinity
      if (c < here) {
        cost[i] = c
        ways[i] = restWays
        first[i] = len
      } else if (c === here) {
        ways[i] = Math.min(2, (ways[i] ?? 0) + restWays)
      }
    }
  }
  if (ways[0] !== 1) return null
  let out = ''
  const changed: [number, number][] = []
  for (let i = 0; i < n; ) {
    const len = first[i] ?? 0
    if (len === 0) return null
    const orig = run.slice(i, i + len)
    const sym = recase(orig)
    if (sym !== orig) changed.push([i, i + len])
    out += sym
    i += len
  }
  return { text: out, changed }
}

function parseInternal(text: string, suggest: boolean): Internal {
  const p = new FormulaParser(text, suggest)
  p.run()
  p.finishElements()
  return p.result()
}

/** The longest formula read (the largest in common use are well under 100 characters). */
export const MAX_FORMULA_LENGTH = 200

/**
 * Parsed formulas by text: the same few formulas are read over and over (by the model for every
 * line that names one, by the simulation on every time step). The results are never changed by
 * their users (counts is a ReadonlyMap), so one object can serve every caller.
 */
const parsedCache = new GenerationalCache<string, Internal>(4096)

/** Forget parsed formulas (for benchmarks that measure a first analysis). */
export function clearFormulaCache(): void {
  parsedCache.clear()
  prettyCache.clear()
}

/** Pretty forms by formula text (hint labels ask for the same few formulas on every step). */
const prettyCache = new Map<string, string>()

function safeParse(text: string): Internal {
  const t = typeof text === 'string' ? text : ''
  // Refused at once and not kept (a pasted megabyte must not stay in memory).
  if (t.length > MAX_FORMULA_LENGTH) return failed(t, `a formula longer than ${MAX_FORMULA_LENGTH} characters is not read`)
  return parsedCache.get(t, safeParseUncached)
}

function safeParseUncached(t: string): Internal {
  try {
    return parseInternal(t, true)
  } catch (e) {
    // Defensive: a bug here must not take the caller down.
    return failed(t, `Internal error while reading the formula: ${e instanceof Error ? e.message : String(e)}`)
  }
}

function failed(t: string, message: string): Internal {
  return {
    formula: {
      text: t,
      counts: new Map(),
      charge: 0,
      molarMass: NaN,
      hydrateWater: 0,
      issues: [{ code: 'formula-syntax', severity: 'error', message, start: 0, end: t.length }],
      ok: false,
    },
    // No roles: prettyFormula shows every character as written (`plain` is what a missing role reads as).
    roles: [],
    chargeStart: t.length,
  }
}

/** Parse a chemical formula. Never throws. */
export function parseFormula(text: string): Formula {
  return safeParse(text).formula
}

/** Molar mass in g/mol, NaN when the formula has an error. */
export function formulaMass(text: string): number {
  const f = parseFormula(text)
  return f.ok ? f.molarMass : NaN
}

const SUBSCRIPT = '₀₁₂₃₄₅₆₇₈₉'
const SUPERSCRIPT = '⁰¹²³⁴⁵⁶⁷⁸⁹'

/**
 * Display form with Unicode subscripts and superscripts: CuSO4·5H2O -> CuSO₄·5H₂O,
 * SO4^2- -> SO₄²⁻, Cu2+ -> Cu²⁺. Hydrate separators become '·'. Text that does not parse is
 * converted as far as it was understood and otherwise left as it is.
 */
export function prettyFormula(text: string): string {
  let pretty = prettyCache.get(text)
  if (pretty === undefined) {
    pretty = prettyUncached(text)
    // Formulas over the length cap are not parsed (and not kept); the cache stays small.
    if (prettyCache.size >= 4096) prettyCache.clear()
    if (typeof text === 'string' && text.length <= MAX_FORMULA_LENGTH) prettyCache.set(text, pretty)
  }
  return pretty
}

function prettyUncached(text: string): string {
  const { formula, roles, chargeStart } = safeParse(text)
  const t = formula.text
  let out = ''
  for (let i = 0; i < chargeStart && i < t.length; i++) {
    const c = t.charAt(i)
    const role = roles[i]
    if (role === 'sub' && isDigit(c)) out += SUBSCRIPT[c.charCodeAt(0) - 48]
    else if (role === 'sep') out += '·'
    else out += c
  }
  if (chargeStart < t.length) {
    const mag = Math.abs(formula.charge)
    const digits = mag === 1 ? '' : [...String(mag)].map((d) => SUPERSCRIPT[d.charCodeAt(0) - 48]).join('')
    out += digits + (formula.charge > 0 ? '⁺' : '⁻')
  }
  return out
}
