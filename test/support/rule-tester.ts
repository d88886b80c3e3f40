// Helpers for rule tests, shared by test/rules.test.ts and test/safety-*.test.ts:
//   at(src, code, severity)        the diagnostics of `code` are exactly at the ⟦marked⟧ ranges
//   silent(text, code)             the rule stays silent
//   fixClears(text, d, expected)   the first fix gives `expected` and clears the finding (from its
//                                  line, or from the whole document with { scope: 'document' })
import { expect } from 'vitest'
import { analyze, type Analysis } from '../../server/src/core/analyze'
import type { Diagnostic, Fix, Severity } from '../../server/src/core/diagnostics'
import { marked } from './markers'

export interface RuleTesterHooks {
  /** Called with every analysis made (e.g. for registry-wide checks at the end of a file). */
  onAnalysis?: (a: Analysis) => void
  /** Called with the code each `at()` pins down. */
  onPinned?: (code: string) => void
}

export function applyFix(text: string, f: Fix): string {
  let out = text
  for (const e of [...f.edits].sort((x, y) => y.span.start - x.span.start)) {
    out = out.slice(0, e.span.start) + e.newText + out.slice(e.span.end)
  }
  return out
}

export function ruleTester(hooks: RuleTesterHooks = {}) {
  const an = (text: string): Analysis => {
    const a = analyze(text)
    hooks.onAnalysis?.(a)
    return a
  }

  /** Analyse a document with ⟦markers⟧: the diagnostics of `code` are at the marked ranges, in order, with the severities given (one for all, or one per range). */
  const at = (src: string, code: string, severity: Severity | Severity[]) => {
    const m = marked(src)
    const a = an(m.text)
    const ds = a.diagnostics.filter((d) => d.code === code)
    expect(
      ds.map((d) => ({ start: d.span.start, end: d.span.end, text: m.text.slice(d.span.start, d.span.end) })),
      `diagnostics [${code}]: ${ds.map((d) => d.message).join(' | ')}`,
    ).toEqual(m.ranges.map((r) => ({ ...r, text: m.text.slice(r.start, r.end) })))
    const sev = Array.isArray(severity) ? severity : ds.map(() => severity)
    expect(ds.map((d) => d.severity)).toEqual(sev)
    hooks.onPinned?.(code)
    return { text: m.text, a, ds }
  }

  /** The rule stays silent on this text. */
  const silent = (text: string, code: string): Analysis => {
    const a = an(text)
    expect(a.diagnostics.filter((d) => d.code === code).map((d) => d.message)).toEqual([])
    return a
  }

  /** Apply the diagnostic's first fix: the text must become `expected`, and the finding must be gone from its line (or the whole document). */
  const fixClears = (text: string, d: Diagnostic, expected: string, options: { scope?: 'line' | 'document' } = {}): Analysis => {
    expect(d.fixes.length, `no fix offered for [${d.code}] ${d.message}`).toBeGreaterThan(0)
    const fixed = applyFix(text, d.fixes[0])
    expect(fixed).toBe(expected)
    const line = an(text).index.lineOf(d.span.start)
    const after = an(fixed)
    const left = after.diagnostics.filter((x) => x.code === d.code && (options.scope === 'document' || after.index.lineOf(x.span.start) === line))
    expect(left.map((x) => x.message), `[${d.code}] still there after the fix`).toEqual([])
    return after
  }

  return { an, at, silent, fixClears, applyFix }
}
