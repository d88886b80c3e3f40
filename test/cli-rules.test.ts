// `cellrun explain` and `--rule`: the command-line side of the hazard rules.
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { run } from '../server/src/cli/main'
import { RULES } from '../server/src/rules'

function cli(...argv: string[]) {
  const out: string[] = []
  const err: string[] = []
  const code = run(argv, (s) => out.push(s), (s) => err.push(s))
  return { code, out: out.join('\n'), err: err.join('\n') }
}

// A cell that makes hydrogen with no vent: hydrogen-vent fires (a warning).
const PROTOCOL = ['cell', '  compartment bath 1 L', '  anode platinum in bath', '  cathode nickel in bath', 'charge bath: KOH solution 1 L at 1 M', 'step 1: current 1 A for 1 h', ''].join('\n')

function file(text: string): string {
  const dir = mkdtempSync(join(tmpdir(), 'cellrun-cli-'))
  const f = join(dir, 'p.cellrun')
  writeFileSync(f, text)
  return f
}

describe('cellrun explain', () => {
  it('lists every rule without a code', () => {
    const r = cli('explain')
    expect(r.code).toBe(0)
    for (const rule of RULES) expect(r.out).toContain(rule.code)
  })

  it('prints a hazard rule in full: summary, caution, source, how to note it', () => {
    const r = cli('explain', 'hydrogen-vent')
    expect(r.code).toBe(0)
    expect(r.out).toContain('hazard rule')
    expect(r.out).toContain('Caution:')
    expect(r.out).toContain('local codes')
    expect(r.out).toContain('Source:')
    expect(r.out).toContain('# noted hydrogen-vent: REASON')
  })

  it('refuses an unknown code with exit 2', () => {
    expect(cli('explain', 'no-such-rule').code).toBe(2)
  })
})

describe('cellrun check with hazard rules', () => {
  it('prints the caution as a note line with the rule code', () => {
    const f = file(PROTOCOL)
    const r = cli('check', f)
    expect(r.out).toMatch(/: warning: .*\[hydrogen-vent\]/)
    expect(r.out).toMatch(/: note: caution: .*local codes.*\[hydrogen-vent\]/)
  })

  it('--rule raises a rule to an error (exit 1) or turns it off', () => {
    const f = file(PROTOCOL)
    expect(cli('check', f).code).toBe(0)
    expect(cli('check', '--rule', 'hydrogen-vent=error', f).code).toBe(1)
    expect(cli('check', '--rule', 'hydrogen-vent=off', f).out).not.toContain('hydrogen-vent')
    expect(cli('check', '--rule', 'nonsense', f).code).toBe(2)
  })

  it('a noted line turns the finding into a note and keeps the caution', () => {
    const f = file(PROTOCOL.replace('  cathode nickel in bath', '  cathode nickel in bath # noted hydrogen-vent: cell sits in the extracted enclosure'))
    const r = cli('check', f)
    expect(r.out).toMatch(/: note: noted \(cell sits in the extracted enclosure\): .*\[hydrogen-vent\]/)
    expect(r.out).toMatch(/caution: .*\[hydrogen-vent\]/)
  })
})
