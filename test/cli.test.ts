// The command line, run in-process through `run(argv, out, err)` from server/src/cli/main.ts.
//
// Golden files: `annotate` output for each example is compared to test/golden/<name>.annotated.txt.
// To (re)write them after an intended change, run
//     UPDATE_GOLDEN=1 npx vitest run test/cli.test.ts
// then READ the diff: the numbers in a golden file must be checked by hand, not trusted because the
// code printed them. (The first line `== FILE` is normalised to the path relative to the repository.)
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, relative } from 'node:path'
import { fileURLToPath } from 'node:url'
import { afterAll, describe, expect, it } from 'vitest'
import { run } from '../server/src/cli/main'
import { analyze } from '../server/src/core/analyze'
import { diagnosticLines } from '../server/src/core/report'
import { marked } from './support/markers'

const repo = fileURLToPath(new URL('..', import.meta.url))
const examplesDir = join(repo, 'examples')
const goldenDir = join(repo, 'test', 'golden')
const examples = readdirSync(examplesDir)
  .filter((f) => f.endsWith('.cellrun'))
  .sort()
const UPDATE = process.env.UPDATE_GOLDEN === '1'

const tmp = mkdtempSync(join(tmpdir(), 'cellrun-cli-'))
afterAll(() => rmSync(tmp, { recursive: true, force: true }))

function cli(...argv: string[]): { code: number; out: string[]; err: string[] } {
  const out: string[] = []
  const err: string[] = []
  const code = run(argv, (s) => out.push(s), (s) => err.push(s))
  return { code, out, err }
}

function writeTmp(name: string, text: string): string {
  const p = join(tmp, name)
  writeFileSync(p, text)
  return p
}

/** 1-based line and column of a UTF-16 offset, counted here from the text itself ("\n" line ends). */
function lineCol(text: string, offset: number): { line: number; column: number } {
  const before = text.slice(0, offset)
  const lines = before.split('\n')
  return { line: lines.length, column: lines[lines.length - 1].length + 1 }
}

const GNU = /^(.*):(\d+):(\d+): (error|warning|note): (.*) \[([a-z0-9-]+)\]$/

// A protocol with two errors at known places (markers), and nothing else wrong.
const BAD = marked(
  [
    'run "cli check"',
    'let area = 50 cm^2',
    'cell',
    '  compartment feed 500 mL',
    '  anode platinum in feed, area ⟦aera⟧',
    '  cathode nickel in feed, area area',
    'step 1: current ⟦3 V⟧ for 1 h',
    '',
  ].join('\n'),
)

describe('cellrun check (text)', () => {
  it('prints file:line:col: error: message [code], 1-based, and exits 1', () => {
    const file = writeTmp('bad.cellrun', BAD.text)
    const r = cli('check', file)
    expect(r.code).toBe(1)
    expect(r.err).toEqual([])
    const errors = r.out.filter((l) => GNU.exec(l)?.[4] === 'error')
    expect(errors).toHaveLength(2)
    const expected = BAD.ranges.map((range) => lineCol(BAD.text, range.start))
    // by hand from the text: `  anode platinum in feed, area ` is 31 characters, so `aera` is on line 5
    // at column 32; `step 1: current ` is 16 characters, so `3 V` is on line 7 at column 17
    expect(expected).toEqual([
      { line: 5, column: 32 },
      { line: 7, column: 17 },
    ])
    const got = errors.map((l) => {
      const m = GNU.exec(l)!
      return { file: m[1], line: Number(m[2]), column: Number(m[3]), code: m[6] }
    })
    expect(got).toEqual([
      { file, ...expected[0], code: 'unknown-name' },
      { file, ...expected[1], code: 'wrong-unit' },
    ])
  })

  it('counts columns in UTF-16 units after a non-ASCII character and across CRLF line ends', () => {
    const m = marked('run "µ-cell · °C"\r\nlet x = ⟦sin⟧(2)\r\n')
    const file = writeTmp('crlf.cellrun', m.text)
    const r = cli('check', file)
    expect(r.code).toBe(1)
    // line 2; `let x = ` is 8 characters, so `sin` starts at column 9
    expect(r.out).toHaveLength(1)
    expect(r.out[0]).toMatch(new RegExp(`^.*:2:9: error: .* \\[bad-expression\\]$`))
  })

  it.each(examples)('%s: exit 0 (no errors)', (name) => {
    const r = cli('check', join(examplesDir, name))
    expect(r.code).toBe(0)
    expect(r.err).toEqual([])
    for (const l of r.out) expect(GNU.exec(l)?.[4]).not.toBe('error')
  })

  it('all examples at once: exit 0', () => {
    expect(cli('check', ...examples.map((f) => join(examplesDir, f))).code).toBe(0)
  })

  it('a warning alone does not fail the check', () => {
    const file = writeTmp('warn.cellrun', 'cell\n  compartment a 1 L\n  anode platinum in a\nstep 1: current 1 A for 1 h\n')
    const r = cli('check', file)
    expect(r.out.map((l) => GNU.exec(l)?.[4])).toEqual(['warning'])
    expect(r.code).toBe(0)
  })
})

describe('CLI and editor agree', () => {
  it('the text output is the core diagnostics, line for line (same codes, lines, columns)', () => {
    const file = writeTmp('agree.cellrun', BAD.text)
    const r = cli('check', file)
    const a = analyze(BAD.text)
    expect(r.out).toEqual(diagnosticLines(a, file))
    // and independently of report.ts: code, severity and 1-based position from the core spans
    const fromCore = a.diagnostics.map((d) => {
      const p = lineCol(BAD.text, d.span.start)
      return `${p.line}:${p.column} ${d.code}`
    })
    const fromCli = r.out.map((l) => {
      const m = GNU.exec(l)!
      return `${m[2]}:${m[3]} ${m[6]}`
    })
    expect(fromCli).toEqual(fromCore)
  })

  it.each(examples)('%s: same diagnostics through the CLI as through analyze()', (name) => {
    const path = join(examplesDir, name)
    const a = analyze(readFileSync(path, 'utf8'))
    const fromCli = cli('check', path).out.map((l) => GNU.exec(l)![6])
    expect(fromCli).toEqual(a.diagnostics.map((d) => d.code))
  })
})

describe('cellrun check --format json', () => {
  it('prints one JSON document with diagnostics, computed values and totals', () => {
    const file = writeTmp('json.cellrun', BAD.text)
    for (const argv of [
      ['check', '--format', 'json', file],
      ['check', '--format=json', file],
    ]) {
      const r = cli(...argv)
      expect(r.code).toBe(1)
      expect(r.out).toHaveLength(1)
      const doc = JSON.parse(r.out[0]) as { files: Record<string, unknown>[] }
      expect(doc.files).toHaveLength(1)
      const f = doc.files[0] as {
        file: string
        diagnostics: { line: number; column: number; code: string; severity: string }[]
        computed: unknown[]
        totals: { chargeAh: number }
      }
      expect(f.file).toBe(file)
      expect(f.diagnostics.map((d) => [d.line, d.column, d.code, d.severity])).toEqual([
        [5, 32, 'unknown-name', 'error'],
        [7, 17, 'wrong-unit', 'error'],
      ])
      expect(Array.isArray(f.computed)).toBe(true)
      expect(f.totals).toBeTypeOf('object')
    }
  })

  it('for the KOH example, totals hold the charge: 5 A × 6 h + 3 A × 1 h = 33 A·h', () => {
    const r = cli('check', '--format', 'json', join(examplesDir, 'koh-from-carbonate.cellrun'))
    expect(r.code).toBe(0)
    const f = JSON.parse(r.out[0]).files[0]
    // 100 mA/cm^2 × 50 cm^2 = 5 A; 5 A × 6 h + 3 A × 1 h = 33 A·h = 118800 C
    expect(Math.abs(f.totals.chargeAh - 33) / 33).toBeLessThan(1e-12)
    expect(Math.abs(f.totals.chargeC - 118800) / 118800).toBeLessThan(1e-12)
    expect(f.computed.some((c: { key: string }) => c.key === 'expect.max')).toBe(true)
    expect(f.diagnostics.every((d: { severity: string }) => d.severity !== 'error')).toBe(true)
  })
})

describe('usage and file problems: exit 2', () => {
  it('an unknown option', () => {
    const r = cli('check', '--frobnicate', join(examplesDir, examples[0]))
    expect(r.code).toBe(2)
    expect(r.err.join('\n')).toContain('--frobnicate')
  })

  it('a missing file', () => {
    const missing = join(tmp, 'no-such-file.cellrun')
    const r = cli('check', missing)
    expect(r.code).toBe(2)
    expect(r.err.join('\n')).toContain('no-such-file.cellrun')
  })

  it('a bad --format, an unknown command, no files, no arguments', () => {
    expect(cli('check', '--format', 'xml', join(examplesDir, examples[0])).code).toBe(2)
    expect(cli('frobnicate').code).toBe(2)
    expect(cli('check').code).toBe(2)
    expect(cli().code).toBe(2)
  })

  it('--help and --version exit 0', () => {
    expect(cli('--help').code).toBe(0)
    const v = cli('--version')
    expect(v.code).toBe(0)
    expect(v.out[0]).toMatch(/^cellrun \d+\.\d+\.\d+$/)
  })
})

describe('cellrun annotate: golden files', () => {
  it.each(examples)('%s', (name) => {
    const abs = join(examplesDir, name)
    const r = cli('annotate', relative(process.cwd(), abs) || abs)
    expect(r.code).toBe(0)
    expect(r.err).toEqual([])
    const text = r.out.join('')
    // normalise the header so the golden file does not depend on the working directory
    const lines = text.split('\n')
    expect(lines[0].startsWith('== ')).toBe(true)
    lines[0] = `== examples/${name}`
    const got = lines.join('\n')
    const golden = join(goldenDir, name.replace(/\.cellrun$/, '.annotated.txt'))
    if (UPDATE) {
      mkdirSync(goldenDir, { recursive: true })
      writeFileSync(golden, got)
    }
    expect(existsSync(golden), `${golden} is missing; create it with UPDATE_GOLDEN=1`).toBe(true)
    expect(got).toBe(readFileSync(golden, 'utf8'))
  })

  it('every source line is echoed, numbered from 1', () => {
    const abs = join(examplesDir, 'brine-chlorine.cellrun')
    const src = readFileSync(abs, 'utf8').split('\n')
    if (src[src.length - 1] === '') src.pop()
    const out = cli('annotate', abs).out.join('').split('\n')
    const echoed = out.filter((l) => /^\s*\d+ \| /.test(l)).map((l) => l.replace(/^\s*\d+ \| /, ''))
    expect(echoed).toEqual(src)
  })
})
