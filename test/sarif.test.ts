// `cellrun check --format sarif`: a SARIF 2.1.0 log, validated against the published SARIF 2.1.0
// JSON schema (sarif-2.1.0-rtm.5, the OASIS schema as shipped in the npm package
// @microsoft/jest-sarif), with 1-based regions and relative URIs; plus folders, globs,
// --quiet and --max-warnings.
import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Ajv from 'ajv-draft-04'
import { describe, expect, it } from 'vitest'
import { run } from '../server/src/cli/main'

const require = createRequire(import.meta.url)
const schema = require('@microsoft/jest-sarif/lib/schemas/sarif-2.1.0-rtm.5.json')

function cli(...argv: string[]) {
  const out: string[] = []
  const err: string[] = []
  const code = run(argv, (s) => out.push(s), (s) => err.push(s))
  return { code, out: out.join('\n'), err: err.join('\n') }
}

// One error (a current in volts) and one hazard warning (hydrogen with no vent).
const TEXT = ['cell', '  compartment bath 1 L', '  anode platinum in bath', '  cathode nickel in bath', 'charge bath: KOH solution 1 L at 1 M', 'step 1: current 1 A for 1 h', 'step 2: current 5 V for 1 h', ''].join('\n')

function workspace(): string {
  const dir = mkdtempSync(join(tmpdir(), 'cellrun-sarif-'))
  mkdirSync(join(dir, 'runs', 'old'), { recursive: true })
  writeFileSync(join(dir, 'runs', 'a.cellrun'), TEXT)
  writeFileSync(join(dir, 'runs', 'old', 'b.cellrun'), TEXT.replace('step 2: current 5 V for 1 h\n', ''))
  writeFileSync(join(dir, 'runs', 'notes.txt'), 'not a protocol')
  return dir
}

describe('SARIF', () => {
  it('validates against the SARIF 2.1.0 schema and points at 1-based regions with relative URIs', () => {
    const dir = workspace()
    const cwd = process.cwd()
    process.chdir(dir)
    try {
      const r = cli('check', '--format', 'sarif', 'runs')
      expect(r.code).toBe(1)
      const log = JSON.parse(r.out)
      // The schema's language pattern is not valid with the regex 'u' flag, so ajv's default is turned off.
      const ajv = new Ajv({ allErrors: true, strict: false, unicodeRegExp: false })
      const validate = ajv.compile(schema)
      expect(validate(log), JSON.stringify(validate.errors?.slice(0, 3))).toBe(true)
      const results = log.runs[0].results
      const wrong = results.find((x: { ruleId: string }) => x.ruleId === 'wrong-unit')
      expect(wrong.level).toBe('error')
      const loc = wrong.locations[0].physicalLocation
      expect(loc.artifactLocation.uri).toBe('runs/a.cellrun')
      // `5 V` on line 7 (1-based), columns 17-20 (1-based, end exclusive) of `step 2: current 5 V for 1 h`
      const line = TEXT.split('\n')[6]
      expect(loc.region).toEqual({ startLine: 7, startColumn: line.indexOf('5 V') + 1, endLine: 7, endColumn: line.indexOf('5 V') + 4 })
      const rule = log.runs[0].tool.driver.rules[wrong.ruleIndex]
      expect(rule.id).toBe('wrong-unit')
      expect(results.some((x: { ruleId: string; level: string }) => x.ruleId === 'hydrogen-vent' && x.level === 'warning')).toBe(true)
    } finally {
      process.chdir(cwd)
    }
  })
})

describe('paths and thresholds', () => {
  it('checks every .cellrun below a folder and matches globs', () => {
    const dir = workspace()
    const viaFolder = cli('check', join(dir, 'runs'))
    expect(viaFolder.out).toContain('a.cellrun')
    expect(viaFolder.out).toContain(join('old', 'b.cellrun'))
    expect(viaFolder.out).not.toContain('notes.txt')
    const cwd = process.cwd()
    process.chdir(dir)
    try {
      const viaGlob = cli('check', 'runs/**/*.cellrun')
      expect(viaGlob.out).toContain('runs/old/b.cellrun')
      expect(cli('check', 'runs/*.cellrun').out).not.toContain('old/b.cellrun')
      expect(cli('check', 'nowhere/*.cellrun').code).toBe(2)
    } finally {
      process.chdir(cwd)
    }
  })

  it('--quiet reports errors only; --max-warnings turns too many warnings into exit 1', () => {
    const dir = workspace()
    const b = join(dir, 'runs', 'old', 'b.cellrun') // warnings only (hydrogen-vent), no error
    expect(cli('check', b).code).toBe(0)
    expect(cli('check', '--quiet', b).out).toBe('')
    expect(cli('check', '--max-warnings', '0', b).code).toBe(1)
    expect(cli('check', '--max-warnings', '5', b).code).toBe(0)
    expect(cli('check', '--max-warnings', 'many', b).code).toBe(2)
  })
})
