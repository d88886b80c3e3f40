// The run preview (server/src/core/preview.ts): the page as text (series, events, CSP, numbers as
// properties of the simulation), the `cellrun/preview` request over a real LSP connection, and the
// page rendered in headless Chromium (skipped where /usr/bin/chromium is not installed).
//
// No expected number is pasted from a run of the code under test: the plotted extremes are compared
// with the simulation result the page was drawn from, and gas volumes with V = nRT/p computed here
// from the SI value of R (k·N_A, exact since 2019: BIPM SI Brochure, 9th ed.).
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { PassThrough } from 'node:stream'
import { describe, expect, it } from 'vitest'
import { createMessageConnection, StreamMessageReader, StreamMessageWriter } from 'vscode-jsonrpc/node'
import { createConnection, ProposedFeatures } from 'vscode-languageserver/node'
import { analyze, type Analysis } from '../server/src/core/analyze'
import { previewHtml } from '../server/src/core/preview'
import { registerPreview } from '../server/src/lsp/preview'

const ROOT = join(__dirname, '..')
const KOH = readFileSync(join(ROOT, 'examples/koh-from-carbonate.cellrun'), 'utf8')
/** The KOH example run on past its feed, with a planned strength: it has events to mark. */
const KOH_LONG =
  KOH.replace('step 2: current 3 A for 1 h, efficiency 80 %', 'step 2: current 3 A for 1 h, efficiency 80 %\nstep 3: current 5 A for 5 h') + '\nexpect KOH 20 wt% in product\n'
const R = 1.380649e-23 * 6.02214076e23 // J/(mol·K), exact [SI 2019]

/** Attributes of every `<tag ...>` that has attribute `attr`. */
function elementsWith(html: string, tag: string, attr: string): Record<string, string>[] {
  const out: Record<string, string>[] = []
  for (const m of html.matchAll(new RegExp(`<${tag}\\b([^>]*)>`, 'g'))) {
    const attrs = Object.fromEntries([...m[1].matchAll(/([\w:-]+)="([^"]*)"/g)].map((a) => [a[1], a[2]]))
    if (attr in attrs) out.push(attrs)
  }
  return out
}
/** The `<svg ...>...</svg>` blocks with their data-plot. */
function plots(html: string): Map<string, string> {
  return new Map([...html.matchAll(/<svg\b[^>]*data-plot="([^"]+)"[^>]*>[\s\S]*?<\/svg>/g)].map((m) => [m[1], m[0]]))
}
function sim(a: Analysis) {
  const s = a.model.simulation
  if (!s) throw new Error('test setup: no simulation')
  return s
}
/** The series keys the page should plot, from the simulation itself. */
function expectedSeries(a: Analysis): string[] {
  const s = sim(a)
  const main = s.mainProduct!
  const keys: string[] = []
  if (s.series.some((p) => p.compartments.find((c) => c.name === main.compartment)?.wtPercent !== undefined)) keys.push(`wt%:${main.compartment}`)
  for (const g of Object.keys(s.gases)) if (s.gases[g] > 0) keys.push(`gas:${g}`)
  keys.push('efficiency')
  for (const c of s.final) keys.push(`ph:${c.name}`)
  return keys.sort()
}

describe('previewHtml (the page as text)', () => {
  for (const [name, text] of [
    ['KOH example', KOH],
    ['KOH run past its feed', KOH_LONG],
    ['brine example', readFileSync(join(ROOT, 'examples/brine-chlorine.cellrun'), 'utf8')],
    ['copper plating example', readFileSync(join(ROOT, 'examples/acid-copper-plating.cellrun'), 'utf8')],
  ] as const) {
    it(`${name}: one polyline per series, one marker per event in every plot, no script, a strict CSP`, () => {
      const a = analyze(text)
      const s = sim(a)
      const html = previewHtml(a, { nonce: 'abc123' })
      expect(html.startsWith('<!DOCTYPE html>')).toBe(true)
      expect(html).not.toMatch(/<script|javascript:|\son\w+=/i)
      expect(html).not.toMatch(/<link\b|\bsrc=|url\(|@import/i)
      const csp = /<meta http-equiv="Content-Security-Policy" content="([^"]+)">/.exec(html)
      expect(csp).not.toBeNull()
      const policy = csp![1].replace(/&#39;/g, "'")
      expect(policy).toContain("default-src 'none'")
      expect(policy).toContain("script-src 'none'")
      expect(policy).toMatch(/style-src 'nonce-abc123'(;|$)/)
      expect(policy).not.toMatch(/unsafe-inline|unsafe-eval/)
      // Every style element carries the nonce; no inline style attributes (the CSP would block them).
      expect([...html.matchAll(/<style\b([^>]*)>/g)].every((m) => m[1].includes('nonce="abc123"'))).toBe(true)
      expect(html).not.toMatch(/\sstyle="/)

      const series = elementsWith(html, 'polyline', 'data-series')
      expect(series.map((x) => x['data-series']).sort()).toEqual(expectedSeries(a))
      for (const p of series) {
        expect(p.points.trim().split(/\s+/).length, p['data-series']).toBe(s.series.length)
        for (const k of ['data-min', 'data-max', 'data-last']) expect(Number.isFinite(Number(p[k])), `${p['data-series']} ${k}`).toBe(true)
        expect(Number(p['data-min'])).toBeLessThanOrEqual(Number(p['data-max']))
      }
      for (const [id, svg] of plots(html)) {
        const markers = elementsWith(svg, 'g', 'data-event')
        expect(markers.length, `events in plot ${id}`).toBe(s.events.length)
        expect(markers.map((x) => Number(x['data-time']))).toEqual(s.events.map((e) => e.time))
      }
      // One table row per step.
      expect(elementsWith(html, 'tr', 'data-step')).toHaveLength(s.steps.length)
    })
  }

  it('marks each event of a run that has some (the KOH run past its feed)', () => {
    const a = analyze(KOH_LONG)
    const s = sim(a)
    expect(s.events.length).toBeGreaterThanOrEqual(2) // test setup: a target and a saturation at least
    const html = previewHtml(a)
    expect(plots(html).size).toBe(4)
    for (const e of s.events) expect(html).toContain(e.message.replace(/&/g, '&amp;'))
  })

  it('plots the product strength up to the simulated final wt% of the main product', () => {
    for (const text of [KOH, KOH_LONG]) {
      const a = analyze(text)
      const s = sim(a)
      const main = s.mainProduct!
      const final = s.final.find((c) => c.name === main.compartment)!.main!
      const line = elementsWith(previewHtml(a), 'polyline', 'data-series').find((x) => x['data-series'] === `wt%:${main.compartment}`)!
      // Property: the caustic only strengthens during these runs, so its plotted maximum is the end state.
      expect(Number(line['data-max'])).toBeCloseTo(final.wtPercent, 9)
      expect(Number(line['data-last'])).toBeCloseTo(final.wtPercent, 9)
    }
  })

  it('plots gas volumes as V = nRT/p at the run conditions, and the running efficiency in %', () => {
    const a = analyze(KOH)
    const s = sim(a)
    const lines = elementsWith(previewHtml(a), 'polyline', 'data-series')
    // conditions 30 degC, 101.325 kPa in the example.
    const Vm = (R * (273.15 + 30)) / 101325 * 1000
    for (const g of Object.keys(s.gases)) {
      const l = lines.find((x) => x['data-series'] === `gas:${g}`)!
      expect(Number(l['data-last'])).toBeCloseTo(s.gases[g] * Vm, 9)
    }
    const ce = lines.find((x) => x['data-series'] === 'efficiency')!
    expect(Number(ce['data-last'])).toBeCloseTo(100 * s.series[s.series.length - 1].efficiency, 9)
  })

  it('escapes the run title and uses the fallback title without a run line', () => {
    const a = analyze(KOH.replace('run "KOH from carbonate, batch 3"', 'run "KOH <b>&</b> \'x\'"'))
    const html = previewHtml(a)
    expect(html).toContain('<h1>KOH &lt;b&gt;&amp;&lt;/b&gt; &#39;x&#39;</h1>')
    expect(previewHtml(analyze(KOH.replace(/^run .*$/m, '')), { title: 'batch.cellrun' })).toContain('<h1>batch.cellrun</h1>')
  })

  it('says plainly that there is no simulation for a protocol without electrodes', () => {
    const a = analyze('run "No cell yet"\ncell\n  compartment bath 1 L\ncharge bath: NaCl 10 g, water 1 L\nstep 1: current 1 A for 1 h\n')
    expect(a.model.simulation).toBeUndefined()
    const html = previewHtml(a)
    expect(html).toContain('data-empty="no-simulation"')
    expect(html).toMatch(/No simulation/)
    expect(html).not.toMatch(/<svg|<polyline/)
    expect(html).toContain('<h1>No cell yet</h1>')
  })
})

describe('cellrun/preview request', () => {
  it('answers { html } for an open document over a real connection, and a note for an unknown one', async () => {
    const toServer = new PassThrough()
    const toClient = new PassThrough()
    const server = createConnection(ProposedFeatures.all, new StreamMessageReader(toServer), new StreamMessageWriter(toClient))
    const a = analyze(KOH)
    registerPreview(server, (uri) => (uri === 'file:///w/koh.cellrun' ? a : undefined))
    server.listen()
    const client = createMessageConnection(new StreamMessageReader(toClient), new StreamMessageWriter(toServer))
    client.listen()
    try {
      const r = await client.sendRequest<{ html: string }>('cellrun/preview', { uri: 'file:///w/koh.cellrun' })
      expect(r.html).toContain('<h1>KOH from carbonate, batch 3</h1>')
      expect(elementsWith(r.html, 'polyline', 'data-series').length).toBe(expectedSeries(a).length)
      // A fresh nonce per page.
      const nonce = (h: string) => /'nonce-([^']+)'/.exec(h.replace(/&#39;/g, "'"))![1]
      const again = await client.sendRequest<{ html: string }>('cellrun/preview', { uri: 'file:///w/koh.cellrun' })
      expect(nonce(again.html)).not.toBe(nonce(r.html))
      const none = await client.sendRequest<{ html: string }>('cellrun/preview', { uri: 'file:///w/other.cellrun' })
      expect(none.html).toContain('other.cellrun is not open')
    } finally {
      client.dispose()
      server.dispose()
    }
  })
})

const CHROMIUM = '/usr/bin/chromium'
const HAVE_CHROMIUM = existsSync(CHROMIUM)
if (!HAVE_CHROMIUM) console.warn(`preview.test.ts: ${CHROMIUM} not found; the headless rendering test is skipped (apt-get install chromium to run it).`)

describe('the preview rendered in headless Chromium', () => {
  it.skipIf(!HAVE_CHROMIUM)(`draws the KOH example's plots with their lines and event markers, without console errors (skipped without ${CHROMIUM})`, async () => {
    const { chromium } = await import('playwright-core')
    const profile = mkdtempSync(join(tmpdir(), 'cellrun-chromium-'))
    const context = await chromium.launchPersistentContext(profile, {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
      viewport: { width: 1000, height: 900 },
      offline: true,
    })
    try {
      const page = context.pages()[0] ?? (await context.newPage())
      const problems: string[] = []
      page.on('console', (m) => {
        if (m.type() === 'error' || m.type() === 'warning') problems.push(`${m.type()}: ${m.text()}`)
      })
      page.on('pageerror', (e) => problems.push(`pageerror: ${e.message}`))
      page.on('request', (r) => {
        if (!r.url().startsWith('data:') && r.url() !== 'about:blank') problems.push(`request: ${r.url()}`)
      })
      for (const [text, shot] of [
        [KOH, '/tmp/cellrun-preview.png'],
        [KOH_LONG, '/tmp/cellrun-preview-events.png'],
      ] as const) {
        const a = analyze(text)
        const s = sim(a)
        await page.setContent(previewHtml(a, { nonce: 'r4nd0m' }), { waitUntil: 'load' })
        // Browser-side code as text: the project's TypeScript lib has no DOM types.
        const svgs = (await page.evaluate(
          `[...document.querySelectorAll('svg[data-plot]')].map((e) => ({ id: e.getAttribute('data-plot'), box: e.getBoundingClientRect().toJSON() }))`,
        )) as { id: string; box: { width: number; height: number } }[]
        expect(svgs.map((x) => x.id)).toEqual(['concentration', 'gases', 'efficiency', 'ph'])
        for (const x of svgs) {
          expect(x.box.width, `${x.id} width`).toBeGreaterThan(100)
          expect(x.box.height, `${x.id} height`).toBeGreaterThan(100)
        }
        const lines = (await page.evaluate(
          `[...document.querySelectorAll('polyline[data-series]')].map((e) => ({ key: e.getAttribute('data-series'), n: e.points.numberOfItems, w: e.getBBox().width, stroke: getComputedStyle(e).stroke }))`,
        )) as { key: string; n: number; w: number; stroke: string }[]
        expect(lines.map((x) => x.key).sort()).toEqual(expectedSeries(a))
        for (const l of lines) {
          expect(l.n, `${l.key} points`).toBe(s.series.length)
          expect(l.w, `${l.key} drawn width`).toBeGreaterThan(100)
          expect(l.stroke, `${l.key} stroke`).not.toBe('none')
        }
        // The style sheet applied (the CSP let the nonce'd style through): grid lines are faint.
        expect(await page.evaluate(`getComputedStyle(document.querySelector('svg .grid')).strokeOpacity`)).toBe('0.12')
        for (const id of ['concentration', 'gases', 'efficiency', 'ph']) {
          expect(await page.locator(`svg[data-plot="${id}"] [data-event]`).count(), `event markers in ${id}`).toBe(s.events.length)
        }
        await page.screenshot({ path: shot, fullPage: true })
      }
      expect(problems).toEqual([])
    } finally {
      await context.close()
      rmSync(profile, { recursive: true, force: true })
    }
  }, 60_000)
})
