// `cellrun sheet`: the printable run sheet. Golden files pin the Markdown of each example
// (regenerate with UPDATE_GOLDEN=1 npx vitest run test/sheet.test.ts and read the diff); the
// numbers in them are checked elsewhere against outside sources (faraday, chemist-input tests).
import { readdirSync, readFileSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { analyze } from '../server/src/core/analyze'
import { sheetHtml, sheetMarkdown } from '../server/src/core/sheet'

const root = join(__dirname, '..')
const examples = readdirSync(join(root, 'examples')).filter((f) => f.endsWith('.cellrun')).sort()

describe('run sheet', () => {
  it.each(examples)('%s: Markdown matches its golden file', (name) => {
    const file = `examples/${name}`
    const md = sheetMarkdown(analyze(readFileSync(join(root, file), 'utf8')), file)
    const golden = join(root, 'test', 'golden', name.replace(/\.cellrun$/, '.sheet.md'))
    if (process.env.UPDATE_GOLDEN) writeFileSync(golden, md)
    expect(md).toBe(readFileSync(golden, 'utf8'))
  })

  it('has every section a technician needs, a pick-list row per charge item and an observation row per yield line', () => {
    const text = readFileSync(join(root, 'examples', 'koh-from-carbonate.cellrun'), 'utf8')
    const a = analyze(text)
    const md = sheetMarkdown(a, 'x.cellrun')
    for (const h of ['## The run', '## To weigh out', '## Timeline', '## Gases given off', '## Computed, with the working', '## Cautions', '## Observations']) expect(md).toContain(h)
    const items = a.tree.lines.flatMap((n) => (n.kind === 'charge' ? n.items : []))
    const pick = md.split('## To weigh out')[1].split('##')[0]
    expect(pick.split('\n').filter((l) => l.startsWith('| ') && !l.startsWith('| compartment')).length).toBe(items.length)
    const obs = md.split('## Observations')[1]
    for (const y of a.model.yields) expect(obs).toContain(y.formula.tok.text.replace(/(\d)/g, (d) => '₀₁₂₃₄₅₆₇₈₉'[Number(d)]))
    expect(md).toContain('local codes')
  })

  it('as HTML keeps the sheet and the simulated plots in one self-contained page without scripts', () => {
    const html = sheetHtml(analyze(readFileSync(join(root, 'examples', 'brine-chlorine.cellrun'), 'utf8')), 'b.cellrun')
    expect(html).toContain('<h2>To weigh out</h2>')
    expect(html).toContain('<svg')
    expect(html).not.toMatch(/<script/i)
  })
})
