// `cellrun compare OLD NEW`: how the computed outcome changed between two versions of a protocol.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { analyze } from '../server/src/core/analyze'
import { compareOutcomes } from '../server/src/core/compare'

const example = readFileSync(join(__dirname, '..', 'examples', 'koh-from-carbonate.cellrun'), 'utf8')

describe('compare', () => {
  it('reports nothing for the same protocol (or one that only differs in comments and spacing)', () => {
    expect(compareOutcomes(analyze(example), analyze(example))).toEqual([])
    const cosmetic = example.replace('# Potassium hydroxide', '#   Potassium hydroxide').replace('charge feed: K2CO3 180 g', 'charge feed:  K2CO3 180 g')
    expect(compareOutcomes(analyze(example), analyze(cosmetic))).toEqual([])
  })

  it('shows a changed step as a changed charge, with the percentage', () => {
    const changed = example.replace('current 3 A for 1 h', 'current 4 A for 1 h')
    const lines = compareOutcomes(analyze(example), analyze(changed))
    // 5 A × 6 h + 3 A × 1 h = 33 A·h before; 5 A × 6 h + 4 A × 1 h = 34 A·h after; +1/33 = +3.03 %
    expect(lines).toContain('~ charge passed: 33 → 34 A·h (+3.03 %)')
    expect(lines.some((l) => l.startsWith('~ H₂ given off:'))).toBe(true)
  })

  it('lists new and cleared diagnostics', () => {
    const worse = example.replace('expect KOH 60 g in product', 'expect KOH 900 g in product')
    const lines = compareOutcomes(analyze(example), analyze(worse))
    expect(lines.some((l) => l.startsWith('+ new error [beyond-faraday]'))).toBe(true)
    const back = compareOutcomes(analyze(worse), analyze(example))
    expect(back.some((l) => l.startsWith('- cleared error [beyond-faraday]'))).toBe(true)
  })
})
