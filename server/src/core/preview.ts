// The run preview: one self-contained HTML page drawn from an analysis (no scripts, no external
// resources, styles inline under a nonce). A summary table of the simulated state at the end of
// each step and four SVG plots of our own drawing against time: the main product's strength, the
// gas volumes, the running current efficiency and the pH of each compartment, with the
// simulation's events marked. Pure: the analysis in, a string out.
//
// For tests and tools, every plotted line carries `data-series`, its extremes `data-min`,
// `data-max` and `data-last` (in the unit of its axis), and every event marker `data-event`.
import type { Analysis } from './analyze'
import { GAS_CONSTANT, ZERO_CELSIUS } from './constants'
import { parseFormula, prettyFormula } from './formula'
import type { EventKind, SimEvent, SimResult } from './simulate'
import { fmt } from './units'

export interface PreviewOptions {
  /** Heading when the protocol has no `run` line (e.g. the file name). */
  title?: string
  /** Nonce for the inline style; the caller should pass a fresh random one per page. */
  nonce?: string
  /** The webview's resource origin (VS Code `webview.cspSource`); allowed for images and fonts only, which the page does not use. */
  cspSource?: string
}

/** Our palette: mid-tone colours that read on light and dark backgrounds; dashes tell series apart without colour. */
const COLOURS = ['#3b7dd8', '#d9822b', '#3f9e5a', '#c24d6b', '#8a68c4', '#8a8a8a']
const DASHES = ['', '7 4', '2 3', '9 3 2 3']

/** Main products that leave as gas: their "strength" is not a solution concentration. */
const GAS_PRODUCTS = new Set(['H2', 'O2', 'Cl2'])

export function previewHtml(analysis: Analysis, options: PreviewOptions = {}): string {
  const m = analysis.model
  const runNode = analysis.tree.lines.find((n) => n.kind === 'run')
  const runTitle = runNode?.kind === 'run' ? runNode.title.text.trim() : ''
  const title = runTitle || options.title || 'Cellrun run'
  const nonce = (options.nonce ?? 'cellrun-preview').replace(/[^A-Za-z0-9+/=_-]/g, '') || 'cellrun-preview'
  const extra = options.cspSource ? options.cspSource.replace(/[^A-Za-z0-9:/.*_ -]/g, '').trim() : ''
  const csp = [
    "default-src 'none'",
    `style-src 'nonce-${nonce}'`,
    "script-src 'none'",
    ...(extra ? [`img-src ${extra}`, `font-src ${extra}`] : []),
    "base-uri 'none'",
    "form-action 'none'",
  ].join('; ')

  const body: string[] = [`<h1>${esc(title)}</h1>`]
  const sim = m.simulation
  if (!sim) {
    body.push(
      '<p class="empty" data-empty="no-simulation">No simulation for this protocol. Describe the cell (its compartments, an anode and a cathode) and at least one step with a current and a duration to see the run here.</p>',
    )
  } else {
    body.push(...simulationSections(analysis, sim))
  }
  return [
    '<!DOCTYPE html>',
    '<html lang="en">',
    '<head>',
    '<meta charset="utf-8">',
    `<meta http-equiv="Content-Security-Policy" content="${esc(csp)}">`,
    '<meta name="viewport" content="width=device-width, initial-scale=1">',
    `<title>${esc(title)}: run preview</title>`,
    `<style nonce="${nonce}">${STYLE}</style>`,
    '</head>',
    '<body>',
    ...body,
    '</body>',
    '</html>',
    '',
  ].join('\n')
}

function simulationSections(analysis: Analysis, sim: SimResult): string[] {
  const m = analysis.model
  const main = sim.mainProduct
  const out: string[] = []
  const litresPerMol = ((GAS_CONSTANT * m.temperatureK) / m.pressurePa) * 1000
  const conditions = `${fmt(m.temperatureK - ZERO_CELSIUS)} °C, ${fmt(m.pressurePa / 1000, 4)} kPa`

  // Summary line.
  const electrons = sim.steps.reduce((t, s) => t + s.electronMol, 0)
  const formed = sim.steps.reduce((t, s) => t + (s.product?.mol ?? 0), 0)
  const facts: string[] = []
  if (main) facts.push(`main product ${esc(prettyFormula(main.formula))} in ${esc(main.compartment)}`)
  if (main && electrons > 0) facts.push(`current efficiency ${fmt((100 * formed * main.electrons) / electrons)} % over the run`)
  facts.push(`run conditions ${esc(conditions)}`)
  facts.push(`${sim.events.length} event${sim.events.length === 1 ? '' : 's'}`)
  out.push(`<p class="meta">Simulated run: ${facts.join(' · ')}.</p>`)

  // Per-step table.
  const names = sim.final.map((c) => c.name)
  const head = ['Step', 'Ends at', 'Current efficiency', 'Main product', ...names.map((n) => `pH ${n}`), 'Temperature']
  const labelAt = new Map(m.steps.map((s) => [s.line, s.label]))
  const rows = sim.steps.map((st) => {
    const label = labelAt.get(st.line) ?? String(st.line + 1)
    const cells: string[] = [`step ${label}`, clock(st.endTime)]
    if (st.electronMol <= 0) {
      cells.push('no current', '—')
    } else {
      cells.push(st.product ? `${fmt(st.product.efficiency * 100)} %` : '—')
      cells.push(strength(st, main, litresPerMol))
    }
    for (const n of names) {
      const c = st.compartments.find((x) => x.name === n)
      cells.push(c ? c.ph.toFixed(1) : '—')
    }
    cells.push(`${fmt(st.temperatureK - ZERO_CELSIUS)} °C`)
    return `<tr data-step="${esc(label)}">${cells.map((c) => `<td>${esc(c)}</td>`).join('')}</tr>`
  })
  out.push(
    '<table class="steps">',
    `<caption>Simulated state at the end of each step</caption>`,
    `<thead><tr>${head.map((h) => `<th scope="col">${esc(h)}</th>`).join('')}</tr></thead>`,
    `<tbody>${rows.join('')}</tbody>`,
    '</table>',
  )

  const total = Math.max(sim.series.length ? sim.series[sim.series.length - 1].time : 0, ...sim.steps.map((s) => s.endTime))
  if (!(total > 0) || sim.series.length === 0) {
    out.push('<p class="empty" data-empty="no-charge">The run passes no charge, so there is nothing to plot over time.</p>')
    return out
  }
  const unit = total >= 2 * 3600 ? { name: 'h', s: 3600 } : total >= 120 ? { name: 'min', s: 60 } : { name: 's', s: 1 }
  const ctx: PlotContext = { totalS: total, unit, events: sim.events }

  // (a) Main product strength in its compartment.
  const prodName = main?.compartment
  const wt = prodName
    ? sim.series.flatMap((p) => {
        const c = p.compartments.find((x) => x.name === prodName)
        return c?.wtPercent !== undefined ? [[p.time, c.wtPercent] as [number, number]] : []
      })
    : []
  if (main && wt.length > 0) {
    out.push(
      plot(ctx, {
        id: 'concentration',
        caption: `${prettyFormula(main.formula)} in ${main.compartment}`,
        yLabel: `${prettyFormula(main.formula)} (wt%)`,
        series: [{ key: `wt%:${main.compartment}`, label: `${prettyFormula(main.formula)} in ${main.compartment}`, unit: 'wt%', points: wt }],
        includeZero: true,
      }),
    )
  } else {
    out.push(
      `<figure data-plot="concentration"><figcaption>Main product strength</figcaption><p class="empty" data-empty="no-concentration">${
        main ? `${esc(prettyFormula(main.formula))} does not stay in solution (it deposits or leaves as gas), so there is no concentration to plot.` : 'The run has no main product to follow.'
      }</p></figure>`,
    )
  }

  // (b) Gas volumes at the run conditions.
  const gasKeys = [...new Set([...Object.keys(sim.gases), ...sim.series.flatMap((p) => Object.keys(p.gases))])].filter(
    (g) => sim.series.some((p) => (p.gases[g] ?? 0) > 0) || (sim.gases[g] ?? 0) > 0,
  )
  if (gasKeys.length > 0) {
    out.push(
      plot(ctx, {
        id: 'gases',
        caption: `Gas released (dry, ideal gas at ${conditions})`,
        yLabel: 'gas volume (L)',
        series: gasKeys.map((g) => ({ key: `gas:${g}`, label: prettyFormula(g), unit: 'L', points: sim.series.map((p) => [p.time, (p.gases[g] ?? 0) * litresPerMol] as [number, number]) })),
        includeZero: true,
      }),
    )
  } else {
    out.push('<figure data-plot="gases"><figcaption>Gas released</figcaption><p class="empty" data-empty="no-gas">No gas is released in this run.</p></figure>')
  }

  // (c) Running current efficiency.
  if (main) {
    const pts = sim.series.map((p) => [p.time, p.efficiency * 100] as [number, number])
    out.push(
      plot(ctx, {
        id: 'efficiency',
        caption: `Current efficiency for ${prettyFormula(main.formula)}, from the start of the run`,
        yLabel: 'current efficiency (%)',
        series: [{ key: 'efficiency', label: `CE ${prettyFormula(main.formula)}`, unit: '%', points: pts }],
        includeZero: false,
      }),
    )
  }

  // (d) pH of each compartment.
  out.push(
    plot(ctx, {
      id: 'ph',
      caption: 'pH of each compartment',
      yLabel: 'pH',
      series: names.map((n) => ({
        key: `ph:${n}`,
        label: n,
        unit: 'pH',
        points: sim.series.flatMap((p) => {
          const c = p.compartments.find((x) => x.name === n)
          return c ? [[p.time, c.ph] as [number, number]] : []
        }),
      })),
      includeZero: false,
      guide: { value: 7, label: 'neutral' },
    }),
  )

  // The events in full.
  if (sim.events.length > 0) {
    out.push(
      '<h2>Events</h2>',
      `<ol class="events">${sim.events.map((e, i) => `<li data-event-item="${i + 1}"><span class="mark">⚑${i + 1}</span> ${esc(clock(e.time))}: ${esc(e.message)}</li>`).join('')}</ol>`,
    )
  }
  out.push(
    '<p class="note">A model with stated assumptions, not a measurement: compare runs and plan with it, and confirm at the bench. Plotted from the simulation\'s samples (about 200 over the run).</p>',
  )
  return out
}

/** The main product's strength at the end of a step: wt% and mol/L when dissolved, else what the step formed. */
function strength(st: SimResult['steps'][number], main: SimResult['mainProduct'], litresPerMol: number): string {
  if (!main) return '—'
  const c = st.compartments.find((x) => x.name === main.compartment)
  if (!GAS_PRODUCTS.has(main.formula) && c?.main && c.main.formula === main.formula) {
    return `${fmt(c.main.wtPercent)} wt% (${fmt(c.main.molPerL)} mol/L) ${prettyFormula(main.formula)}`
  }
  const mol = st.product?.mol ?? 0
  if (GAS_PRODUCTS.has(main.formula)) return `${fmt(mol * litresPerMol)} L ${prettyFormula(main.formula)} in the step`
  const M = parseFormula(main.formula).molarMass
  return Number.isFinite(M) ? `${fmt(mol * M)} g ${prettyFormula(main.formula)} in the step` : `${fmt(mol)} mol ${prettyFormula(main.formula)} in the step`
}

// ---- plots -------------------------------------------------------------------------------------

interface PlotContext {
  totalS: number
  unit: { name: string; s: number }
  events: SimEvent[]
}

interface SeriesSpec {
  key: string
  label: string
  unit: string
  /** [seconds, value] pairs. */
  points: [number, number][]
}

interface PlotSpec {
  id: string
  caption: string
  yLabel: string
  series: SeriesSpec[]
  includeZero: boolean
  guide?: { value: number; label: string }
}

const W = 720
const H_PLOT = 200
const LEFT = 64
const RIGHT = 24
const BOTTOM = 46
const CHAR_W = 6.6 // rough width of a 12 px character, for laying out the legend and event labels

const SHORT: Record<EventKind, string> = {
  'feed-exhausted': 'feed out',
  saturated: 'saturated',
  'target-reached': 'target',
  ph: 'pH',
  efficiency: 'CE low',
  temperature: 'hot',
  dry: 'dry',
}

function plot(ctx: PlotContext, spec: PlotSpec): string {
  const series = spec.series.filter((s) => s.points.length > 0)
  const values = series.flatMap((s) => s.points.map((p) => p[1])).filter(Number.isFinite)
  let lo = values.length ? Math.min(...values) : 0
  let hi = values.length ? Math.max(...values) : 1
  if (spec.includeZero) lo = Math.min(lo, 0)
  if (spec.guide) {
    lo = Math.min(lo, spec.guide.value)
    hi = Math.max(hi, spec.guide.value)
  }
  const y = niceScale(lo, hi)
  const x = niceScale(0, ctx.totalS / ctx.unit.s, 8, true)

  const plotW = W - LEFT - RIGHT
  const sx = (t: number) => LEFT + ((t / ctx.unit.s - x.lo) / (x.hi - x.lo)) * plotW
  // Event labels: each on the first row where it does not overlap the label before it; when
  // events crowd together (more than two rows), just their numbers (the list below has the rest).
  const layout = (long: boolean) => {
    const rowEnds: number[] = []
    const labels = ctx.events.map((e, i) => {
      const px = sx(e.time)
      const text = long ? `⚑${i + 1} ${SHORT[e.kind] ?? e.kind}` : `⚑${i + 1}`
      const w = text.length * CHAR_W + (long ? 0 : 4)
      const anchorEnd = px + w > W - 2
      const start = anchorEnd ? px - w : px
      let row = rowEnds.findIndex((end) => start > end + 6)
      if (row < 0) row = rowEnds.length
      rowEnds[row] = start + w
      return { e, i, px, text, anchorEnd, row }
    })
    return { rowEnds, labels }
  }
  let { rowEnds, labels } = layout(true)
  if (rowEnds.length > 2) ({ rowEnds, labels } = layout(false))

  // Legend rows, then the event label rows, then the plot area.
  const legendRows: { label: string; i: number; x: number }[][] = [[]]
  let lx = LEFT
  series.forEach((s, i) => {
    const w = 30 + s.label.length * CHAR_W + 16
    if (lx + w > W - RIGHT && legendRows[legendRows.length - 1].length > 0) {
      legendRows.push([])
      lx = LEFT
    }
    legendRows[legendRows.length - 1].push({ label: s.label, i, x: lx })
    lx += w
  })
  const top = 10 + legendRows.length * 16 + rowEnds.length * 13 + 6
  const height = top + H_PLOT + BOTTOM
  const sy = (v: number) => top + H_PLOT - ((v - y.lo) / (y.hi - y.lo)) * H_PLOT
  const r = (n: number) => (Math.round(n * 10) / 10).toString()

  const parts: string[] = []
  parts.push(
    `<svg viewBox="0 0 ${W} ${height}" width="${W}" height="${height}" role="img" aria-label="${esc(spec.caption)}" data-plot="${esc(spec.id)}" data-y-min="${y.lo}" data-y-max="${y.hi}" data-x-max-s="${ctx.totalS}" data-x-unit="${ctx.unit.name}">`,
  )
  // Grid and y ticks.
  for (const v of y.ticks) {
    const py = r(sy(v))
    parts.push(`<line class="grid" x1="${LEFT}" x2="${W - RIGHT}" y1="${py}" y2="${py}"/>`)
    parts.push(`<line class="axis" x1="${LEFT - 5}" x2="${LEFT}" y1="${py}" y2="${py}"/>`)
    parts.push(`<text x="${LEFT - 8}" y="${py}" text-anchor="end" dominant-baseline="middle">${tick(v, y.step)}</text>`)
  }
  // x ticks.
  for (const v of x.ticks) {
    const px = r(LEFT + ((v - x.lo) / (x.hi - x.lo)) * plotW)
    parts.push(`<line class="axis" x1="${px}" x2="${px}" y1="${top + H_PLOT}" y2="${top + H_PLOT + 5}"/>`)
    parts.push(`<text x="${px}" y="${top + H_PLOT + 18}" text-anchor="middle">${tick(v, x.step)}</text>`)
  }
  // Axes.
  parts.push(`<line class="axis" x1="${LEFT}" x2="${LEFT}" y1="${top}" y2="${top + H_PLOT}"/>`)
  parts.push(`<line class="axis" x1="${LEFT}" x2="${W - RIGHT}" y1="${top + H_PLOT}" y2="${top + H_PLOT}"/>`)
  parts.push(`<text class="label" x="${LEFT + plotW / 2}" y="${top + H_PLOT + 38}" text-anchor="middle">time (${ctx.unit.name})</text>`)
  parts.push(`<text class="label" transform="translate(16 ${r(top + H_PLOT / 2)}) rotate(-90)" text-anchor="middle">${esc(spec.yLabel)}</text>`)
  // Guide line (pH 7).
  if (spec.guide) {
    const gy = r(sy(spec.guide.value))
    parts.push(`<line class="guide" x1="${LEFT}" x2="${W - RIGHT}" y1="${gy}" y2="${gy}"/>`)
    parts.push(`<text class="guide-label" x="${W - RIGHT - 4}" y="${r(sy(spec.guide.value) - 4)}" text-anchor="end">${esc(spec.guide.label)}</text>`)
  }
  // Event markers: a vertical line and a short label each, the full message as a tooltip.
  for (const { e, i, px, text, anchorEnd, row } of labels) {
    const ty = top - 6 - (rowEnds.length - 1 - row) * 13
    parts.push(
      `<g class="event" data-event="${i + 1}" data-kind="${esc(e.kind)}" data-time="${e.time}"><title>${esc(`⚑${i + 1} at ${clock(e.time)}: ${e.message}`)}</title>` +
        `<line x1="${r(px)}" x2="${r(px)}" y1="${r(ty + 3)}" y2="${top + H_PLOT}"/>` +
        `<text x="${r(anchorEnd ? px - 2 : px + 2)}" y="${r(ty)}" text-anchor="${anchorEnd ? 'end' : 'start'}">${esc(text)}</text></g>`,
    )
  }
  // Series.
  series.forEach((s, i) => {
    const ys = s.points.map((p) => p[1])
    const colour = COLOURS[i % COLOURS.length]
    const dash = DASHES[i % DASHES.length]
    const pts = s.points.map(([t, v]) => `${r(sx(t))},${r(sy(v))}`).join(' ')
    parts.push(
      `<polyline data-series="${esc(s.key)}" data-label="${esc(s.label)}" data-unit="${esc(s.unit)}" data-min="${Math.min(...ys)}" data-max="${Math.max(...ys)}" data-last="${ys[ys.length - 1]}" fill="none" stroke="${colour}" stroke-width="2" stroke-linejoin="round"${dash ? ` stroke-dasharray="${dash}"` : ''} points="${pts}"/>`,
    )
  })
  // Legend.
  legendRows.forEach((row, k) => {
    const ly = 14 + k * 16
    for (const item of row) {
      const colour = COLOURS[item.i % COLOURS.length]
      const dash = DASHES[item.i % DASHES.length]
      parts.push(
        `<g class="legend-item"><line x1="${item.x}" x2="${item.x + 24}" y1="${ly}" y2="${ly}" stroke="${colour}" stroke-width="2.5"${dash ? ` stroke-dasharray="${dash}"` : ''}/>` +
          `<text x="${item.x + 30}" y="${ly}" dominant-baseline="middle">${esc(item.label)}</text></g>`,
      )
    }
  })
  parts.push('</svg>')
  return `<figure data-plot="${esc(spec.id)}"><figcaption>${esc(spec.caption)}</figcaption>${parts.join('')}</figure>`
}

/** Round axis limits and ticks (1, 2, 2.5 or 5 × 10ⁿ) covering [lo, hi]; `exact`: the axis ends at hi itself (time ends with the run). */
function niceScale(lo: number, hi: number, count = 5, exact = false): { lo: number; hi: number; step: number; ticks: number[] } {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) {
    lo = 0
    hi = 1
  }
  if (!(hi > lo)) {
    const pad = Math.abs(lo) > 0 ? Math.abs(lo) * 0.1 : 1
    lo -= pad
    hi += pad
  }
  const raw = (hi - lo) / count
  const mag = Math.pow(10, Math.floor(Math.log10(raw)))
  const f = raw / mag
  const step = (f <= 1 ? 1 : f <= 2 ? 2 : f <= 2.5 ? 2.5 : f <= 5 ? 5 : 10) * mag
  const a = Math.floor(lo / step + 1e-9) * step
  const b = exact ? hi : Math.ceil(hi / step - 1e-9) * step
  const ticks: number[] = []
  for (let i = 0; a + i * step <= b + step * 1e-9; i++) ticks.push(Number((a + i * step).toPrecision(12)))
  return { lo: Number(a.toPrecision(12)), hi: exact ? hi : Number(b.toPrecision(12)), step, ticks }
}

/** A tick label with the decimals its step needs. */
function tick(v: number, step: number): string {
  const decimals = Math.max(0, Math.min(6, -Math.floor(Math.log10(step) + 1e-9) + (step / Math.pow(10, Math.floor(Math.log10(step) + 1e-9)) === 2.5 ? 1 : 0)))
  const s = v.toFixed(decimals)
  return s === '-0' || /^-0\.0*$/.test(s) ? s.slice(1) : s
}

/** A time from the start of the run: 45 s, 12 min, 6 h, 1 h 30 min. */
function clock(s: number): string {
  if (s < 60) return `${fmt(s)} s`
  let h = Math.floor(s / 3600)
  let min = Math.round((s - h * 3600) / 60)
  if (min === 60) {
    h++
    min = 0
  }
  if (h === 0) return `${min} min`
  return min === 0 ? `${h} h` : `${h} h ${min} min`
}

function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;')
}

const STYLE = `
:root { color-scheme: light dark; }
body { margin: 0; padding: 16px 20px 32px; max-width: 980px; font-family: var(--vscode-font-family, system-ui, -apple-system, "Segoe UI", sans-serif); font-size: var(--vscode-font-size, 13px); line-height: 1.45; color: var(--vscode-editor-foreground, CanvasText); background: var(--vscode-editor-background, Canvas); }
h1 { font-size: 1.45em; font-weight: 600; margin: 0 0 4px; }
h2 { font-size: 1.1em; font-weight: 600; margin: 20px 0 6px; }
.meta, .note { opacity: 0.8; margin: 0 0 12px; }
.note { font-size: 0.92em; margin-top: 16px; }
.empty { padding: 10px 12px; border: 1px dashed color-mix(in srgb, currentColor 40%, transparent); border-radius: 4px; }
table.steps { border-collapse: collapse; margin: 4px 0 20px; font-variant-numeric: tabular-nums; }
table.steps caption { text-align: left; font-weight: 600; padding-bottom: 6px; }
table.steps th, table.steps td { padding: 4px 12px 4px 0; text-align: right; border-bottom: 1px solid color-mix(in srgb, currentColor 18%, transparent); white-space: nowrap; }
table.steps th { font-weight: 600; border-bottom-color: color-mix(in srgb, currentColor 45%, transparent); }
table.steps th:first-child, table.steps td:first-child, table.steps td:nth-child(4), table.steps th:nth-child(4) { text-align: left; }
figure { margin: 0 0 22px; }
figcaption { font-weight: 600; margin-bottom: 2px; }
svg { display: block; width: 100%; max-width: 720px; height: auto; overflow: visible; color: inherit; }
svg text { fill: currentColor; font-size: 12px; font-family: inherit; }
svg .label { font-size: 12px; opacity: 0.9; }
svg .axis { stroke: currentColor; stroke-width: 1; }
svg .grid { stroke: currentColor; stroke-opacity: 0.12; }
svg .guide { stroke: currentColor; stroke-opacity: 0.45; stroke-dasharray: 2 4; }
svg .guide-label { font-size: 11px; opacity: 0.7; }
svg .event line { stroke: currentColor; stroke-opacity: 0.55; stroke-dasharray: 4 3; }
svg .event text { font-size: 11px; }
ol.events { margin: 0; padding-left: 0; list-style: none; }
ol.events li { margin: 2px 0; }
ol.events .mark { font-weight: 600; }
`
