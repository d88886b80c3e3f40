// Checks the TextMate grammar without extra dependencies: the JSON is well formed, every regex is
// valid in JavaScript and avoids Oniguruma-only syntax, and a small hand-written tokenizer (match
// rules only, which is all the grammar uses) gives the expected scopes on sample lines.
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'

interface Capture { name?: string }
interface Rule {
  name?: string
  match?: string
  begin?: string
  end?: string
  while?: string
  include?: string
  captures?: Record<string, Capture>
  patterns?: Rule[]
}
interface Grammar {
  scopeName: string
  patterns: Rule[]
  repository: Record<string, Rule>
}

const grammarPath = fileURLToPath(new URL('../syntaxes/cellrun.tmLanguage.json', import.meta.url))
const grammarText = readFileSync(grammarPath, 'utf8')
const grammar = JSON.parse(grammarText) as Grammar

/** Every rule reachable anywhere in the grammar (top level and repository). */
function allRules(): Rule[] {
  const out: Rule[] = []
  const walk = (r: Rule) => {
    out.push(r)
    r.patterns?.forEach(walk)
  }
  grammar.patterns.forEach(walk)
  Object.values(grammar.repository).forEach(walk)
  return out
}

/** Oniguruma features JavaScript lacks or reads differently (some compile in JS with another meaning). */
function onigurumaOnly(src: string): string | undefined {
  let inClass = false
  for (let i = 0; i < src.length; i++) {
    const c = src[i]
    if (c === '\\') {
      const n = src[i + 1] ?? ''
      if ('AzZGhHK'.includes(n)) return `\\${n}`
      if (n === 'p' && src[i + 2] === '{') return '\\p{...}'
      i++
      continue
    }
    if (inClass) {
      if (c === ']') inClass = false
      else if (c === '[' && src[i + 1] === ':') return 'POSIX bracket'
      continue
    }
    if (c === '[') {
      inClass = true
      if (src[i + 1] === ']') i++ // literal ']' first in class
      continue
    }
    if (c === '(' && src[i + 1] === '?') {
      const n = src[i + 2]
      if (n === '>') return 'atomic group'
      if (n !== undefined && /[imx-]/.test(n)) return 'inline flags'
      if (n === '~') return 'absent operator'
    }
    if ('*+?}'.includes(c) && src[i + 1] === '+') return 'possessive quantifier'
  }
  return undefined
}

function compile(src: string): RegExp {
  return new RegExp(src, 'dg')
}

interface MatchRule { name?: string; re: RegExp; captures: Record<string, Capture> }

/** Flatten the top-level patterns (following includes) into match rules, in priority order. */
function topLevelMatchRules(): MatchRule[] {
  const out: MatchRule[] = []
  const expand = (r: Rule, seen: Set<string>) => {
    if (r.include) {
      const key = r.include.replace(/^#/, '')
      if (seen.has(key)) return
      const target = grammar.repository[key]
      if (!target) throw new Error(`missing repository entry ${r.include}`)
      expand(target, new Set([...seen, key]))
      return
    }
    if (r.match !== undefined) out.push({ name: r.name, re: compile(r.match), captures: r.captures ?? {} })
    r.patterns?.forEach((p) => expand(p, seen))
  }
  grammar.patterns.forEach((p) => expand(p, new Set()))
  return out
}

/** Scopes of each character of `line`: the earliest match wins, ties go to the earlier rule. */
function tokenize(line: string): string[][] {
  const rules = topLevelMatchRules()
  const scopes: string[][] = Array.from(line, () => [grammar.scopeName])
  let pos = 0
  while (pos < line.length) {
    let best: { m: RegExpExecArray; rule: MatchRule } | undefined
    for (const rule of rules) {
      rule.re.lastIndex = pos
      const m = rule.re.exec(line)
      if (m && (!best || m.index < best.m.index)) best = { m, rule }
    }
    if (!best) break
    const { m, rule } = best
    const start = m.index
    const end = start + m[0].length
    for (let i = start; i < end; i++) if (rule.name) scopes[i]!.push(rule.name)
    for (const [k, cap] of Object.entries(rule.captures)) {
      const span = m.indices?.[Number(k)]
      if (!span || !cap.name) continue
      for (let i = span[0]; i < span[1]; i++) scopes[i]!.push(cap.name)
    }
    pos = end > start ? end : start + 1
  }
  return scopes
}

/** The scopes shared by every character of the `nth` occurrence of `text` in `line`. */
function scopesOf(line: string, text: string, nth = 0): string[] {
  let at = -1
  for (let k = 0; k <= nth; k++) {
    at = line.indexOf(text, at + 1)
    if (at < 0) throw new Error(`"${text}" not found in "${line}"`)
  }
  const perChar = tokenize(line).slice(at, at + text.length)
  return perChar.reduce((acc, s) => acc.filter((x) => s.includes(x)))
}

const has = (line: string, text: string, prefix: string, nth = 0) =>
  scopesOf(line, text, nth).some((s) => s.startsWith(prefix))

describe('cellrun.tmLanguage.json', () => {
  it('is a valid grammar document', () => {
    expect(grammar.scopeName).toBe('source.cellrun')
    expect(Array.isArray(grammar.patterns)).toBe(true)
    for (const r of allRules()) {
      if (r.include) {
        expect(r.include.startsWith('#'), r.include).toBe(true)
        expect(grammar.repository[r.include.slice(1)], r.include).toBeDefined()
      }
      // Only single-line match rules are used, so the tokenizer below covers the whole grammar.
      expect(r.begin ?? r.end ?? r.while).toBeUndefined()
      for (const n of [r.name, ...Object.values(r.captures ?? {}).map((c) => c.name)]) {
        if (n) expect(n.endsWith('.cellrun'), n).toBe(true)
      }
    }
  })

  it('has regexes that compile in JavaScript without Oniguruma-only syntax', () => {
    const sources = allRules().flatMap((r) => [r.match, r.begin, r.end, r.while].filter((s): s is string => s !== undefined))
    expect(sources.length).toBeGreaterThan(10)
    for (const src of sources) {
      expect(() => compile(src), src).not.toThrow()
      expect(onigurumaOnly(src), src).toBeUndefined()
    }
  })

  it('scopes keywords, numbers, units and comments', () => {
    const step = 'step 1: current 40 mA/cm^2 * area for 5 h  # first hour'
    expect(has(step, 'step', 'keyword.control.statement')).toBe(true)
    expect(has(step, 'current', 'keyword.other.clause')).toBe(true)
    expect(has(step, 'for', 'keyword.other.clause')).toBe(true)
    expect(has(step, '40', 'constant.numeric')).toBe(true)
    expect(has(step, 'mA/cm^2', 'keyword.other.unit')).toBe(true)
    expect(has(step, 'h', 'keyword.other.unit')).toBe(true) // the 'h' of '5 h'
    expect(has(step, 'hour', 'keyword')).toBe(false)
    expect(has(step, '*', 'keyword.operator')).toBe(true)
    expect(has(step, '# first hour', 'comment.line.number-sign')).toBe(true)
    expect(has(step, 'area', 'keyword')).toBe(false)

    const cond = 'conditions 22 °C, 101.325 kPa'
    expect(has(cond, '101.325', 'constant.numeric')).toBe(true)
    expect(has(cond, '°C', 'keyword.other.unit')).toBe(true)
    expect(has(cond, 'kPa', 'keyword.other.unit')).toBe(true)
  })

  it('scopes names, materials, formulas and free text', () => {
    const charge = 'charge bath: CuSO4·5H2O 0.35 mol, NaOH solution 400 g at 25 wt%'
    expect(has(charge, 'bath', 'variable.other')).toBe(true)
    expect(has(charge, 'CuSO4·5H2O', 'support.type.formula')).toBe(true)
    expect(has(charge, '4', 'constant.numeric')).toBe(false)
    expect(has(charge, 'solution', 'keyword.other.clause')).toBe(true)
    expect(has(charge, 'wt%', 'keyword.other.unit')).toBe(true)

    const anode = '  anode mmo-titanium in feed, area area'
    expect(has(anode, 'mmo-titanium', 'entity.name.type')).toBe(true)
    expect(has(anode, 'feed', 'variable.other')).toBe(true)
    expect(has(anode, 'area', 'keyword.other.clause', 0)).toBe(true)
    expect(has(anode, 'area', 'keyword', 1)).toBe(false)

    const sep = '  separator cation-exchange between feed and product, area 36 cm^2'
    expect(has(sep, 'cation-exchange', 'entity.name.type')).toBe(true)
    expect(has(sep, 'product', 'variable.other')).toBe(true)

    const let_ = 'let area = 36 cm^2'
    expect(has(let_, 'area', 'variable.other')).toBe(true)
    expect(has(let_, '=', 'keyword.operator')).toBe(true)
    expect(has(let_, '^', 'keyword.other.unit')).toBe(true)

    const note = 'note Feed is technical-grade K2CO3, 99 %. # supplier lot 4'
    expect(has(note, 'Feed is technical-grade K2CO3, 99 %.', 'string.unquoted')).toBe(true)
    expect(has(note, '# supplier lot 4', 'comment.line')).toBe(true)

    const run = 'run "KOH # batch 7"'
    expect(has(run, '"KOH # batch 7"', 'string.quoted.double')).toBe(true)
    expect(has(run, '#', 'comment')).toBe(false)

    expect(has('expect SO4^2- 2 mol in feed', 'SO4^2-', 'support.type.formula')).toBe(true)
    expect(has('handling vent: hydrogen piped outdoors', 'vent', 'support.constant')).toBe(true)
  })
})
