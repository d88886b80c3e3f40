// The README's table of hazard rules is generated from the rules themselves, so it cannot drift.
// Regenerate with UPDATE_DOCS=1 npx vitest run test/docs.test.ts
import { readFileSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { RULES } from '../server/src/rules'

const readme = join(__dirname, '..', 'README.md')
const BEGIN = '<!-- hazard-rules:begin -->'
const END = '<!-- hazard-rules:end -->'

const cell = (s: string | undefined) => (s ?? '').replace(/\|/g, '\\|').replace(/\n+/g, ' ')

export function hazardTable(): string {
  const rows = RULES.filter((r) => r.category === 'safety').map(
    (r) => `| \`${r.code}\` | ${r.severity} | ${cell(r.summary)} | ${cell(r.details ?? r.caution)} | ${cell(r.source)} |`,
  )
  return ['| code | default | what | why | source |', '|---|---|---|---|---|', ...rows].join('\n')
}

describe('README', () => {
  it('lists every hazard rule with its summary, reasoning and source', () => {
    const text = readFileSync(readme, 'utf8')
    const start = text.indexOf(BEGIN)
    const end = text.indexOf(END)
    expect(start).toBeGreaterThan(0)
    expect(end).toBeGreaterThan(start)
    const want = `${BEGIN}\n${hazardTable()}\n${END}`
    if (process.env.UPDATE_DOCS) writeFileSync(readme, text.slice(0, start) + want + text.slice(end + END.length))
    else expect(text.slice(start, end + END.length)).toBe(want)
  })

  it('gives every hazard rule a caution that defers to local codes, and a source', () => {
    for (const r of RULES.filter((x) => x.category === 'safety')) {
      expect(r.caution, r.code).toMatch(/local codes/)
      expect(r.source, r.code).toBeTruthy()
    }
  })

  it('opens with the job and keeps the two set-up commands', () => {
    const text = readFileSync(readme, 'utf8')
    expect(text).toContain('npm ci && npm run demo')
    expect(text).toContain('npm test')
  })
})
