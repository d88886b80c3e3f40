// The benchmark (`npm run bench`, test/bench/) is not a test and its figures are not checked here;
// this only makes sure it still builds and runs end to end (generator, yaml comparison, the real
// server over stdio), so that it does not rot between the times someone measures.
import { execFileSync } from 'node:child_process'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { ensureBuilt, ROOT } from './support/lsp-server'
import { generateProtocol } from './bench/generate'

describe('the benchmark', () => {
  it('the generator gives the line count asked for, and the same statements as YAML', () => {
    for (const n of [100, 1_000, 10_000]) {
      const g = generateProtocol(n)
      expect(g.lines).toBe(n)
      expect(g.text.split('\n')).toHaveLength(n + 1) // a final line break
      // One YAML item per protocol statement (comments and blank lines are kept as they are).
      const statements = g.text.split('\n').filter((l) => l.trim() !== '' && !l.trim().startsWith('#') && !/^ {2}/.test(l)).length
      const items = g.yaml.split('\n').filter((l) => l.startsWith('- ')).length
      expect(items).toBe(statements)
    }
  })

  it('runs in its smoke mode and prints every table', () => {
    ensureBuilt()
    execFileSync(process.execPath, [join(ROOT, 'esbuild.mjs'), 'bench'], { cwd: ROOT, stdio: 'pipe', timeout: 60_000 })
    const out = execFileSync(process.execPath, ['--expose-gc', join(ROOT, 'dist', 'bench.cjs'), '--smoke'], { cwd: ROOT, encoding: 'utf8', timeout: 120_000 })
    expect(out).toMatch(/Whole-document analysis/)
    expect(out).toMatch(/^ +1000 +97 /m) // the 1,000-line row: 97 steps
    expect(out).toMatch(/Scaling/)
    expect(out).toMatch(/typing in a step +[\d.]+ ms/)
    expect(out).toMatch(/Language server memory/)
  }, 180_000)
})
