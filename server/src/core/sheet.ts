// The run sheet: what a technician prints and takes to the bench. Facts of the protocol, what to
// weigh out, the timeline with the simulated events, the gases to expect, the computed quantities
// with their working, the cautions, and space for the observations. Pure: analysis in, text out.
import type { Analysis } from './analyze'
import { prettyFormula } from './formula'
import { previewHtml } from './preview'
import { fmt } from './units'

interface Section {
  title: string
  /** Paragraph lines, list items (`- `) or a table (header row first). */
  lines?: string[]
  table?: string[][]
}

function sections(a: Analysis): { title: string; parts: Section[] } {
  const m = a.model
  const run = a.tree.lines.find((n) => n.kind === 'run')
  const title = run?.kind === 'run' ? run.title.text : 'Run sheet'
  const parts: Section[] = []
  const notes = a.tree.lines.flatMap((n) => (n.kind === 'note' ? [n.text.text] : []))
  const cell = [
    `Conditions: ${fmt(m.temperatureK - 273.15)} °C, ${fmt(m.pressurePa / 1000, 4)} kPa${m.conditionsStated.temperature || m.conditionsStated.pressure ? '' : ' (assumed: no conditions line)'}`,
    ...[...m.compartments.values()].map((c) => `- compartment ${c.name}${c.volumeL ? `: ${fmt(c.volumeL * 1000)} mL` : ''}`),
    ...m.separators.map((s) => `- separator ${s.type.text} between ${s.between.join(' and ')}${s.areaCm2 ? `, ${fmt(s.areaCm2)} cm²` : ''}`),
    ...m.electrodes.map((e) => `- ${e.role} ${e.material.text} in ${e.compartment}${e.areaCm2 ? `, ${fmt(e.areaCm2)} cm²` : ''}`),
    ...(m.vessel ? [`- vessel ${m.vessel.material.text}`] : []),
    ...(m.engine?.anode ? [`- anode reaction: ${m.engine.anode.equation} (${m.engine.anode.reason})`] : []),
    ...(m.engine?.cathode ? [`- cathode reaction: ${m.engine.cathode.equation} (${m.engine.cathode.reason})`] : []),
  ]
  parts.push({ title: 'The run', lines: [...notes, ...cell] })

  // Pick list: every charge item with what to weigh or measure.
  const pick: string[][] = [['compartment', 'substance', 'as written', 'amount', 'weighed / measured']]
  const itemAt = new Map<number, (typeof a.computed)[number]>()
  for (const x of a.computed) if (x.key === 'charge.item' && !itemAt.has(x.span.start)) itemAt.set(x.span.start, x)
  for (const n of a.tree.lines) {
    if (n.kind !== 'charge') continue
    for (const item of n.items) {
      const c = itemAt.get(item.span.start)
      pick.push([n.compartment.text, prettyFormula(item.formula.text), a.text.slice(item.span.start, item.span.end), c?.label ?? '', ''])
    }
  }
  if (pick.length > 1) parts.push({ title: 'To weigh out', table: pick })

  // Timeline.
  const timeline: string[][] = [['step', 'from (h)', 'to (h)', 'current', 'charge', 'products', 'done']]
  let t = 0
  const productsAt = new Map<number, string>()
  for (const c of a.computed) if (c.key === 'step.products' && !productsAt.has(c.line)) productsAt.set(c.line, c.label)
  for (const s of m.steps) {
    const start = t
    t += s.seconds ?? 0
    const prod = productsAt.get(s.line)?.replace(/^→ /, '') ?? ''
    timeline.push([s.label, fmt(start / 3600), fmt(t / 3600), s.currentA !== undefined ? `${fmt(s.currentA)} A` : s.voltageV !== undefined ? `${fmt(s.voltageV)} V` : '', s.chargeC !== undefined ? `${fmt(s.chargeC / 3600)} A·h` : '', prod, '☐'])
  }
  if (m.steps.length) parts.push({ title: 'Timeline', table: timeline })
  const events = m.simulation?.events ?? []
  if (events.length) parts.push({ title: 'Expected events (simulation)', lines: events.map((e) => `- after ${fmt(e.time / 3600)} h: ${e.message}`) })

  // Gases.
  const Vm = ((8.314462618 * m.temperatureK) / m.pressurePa) * 1000
  const gases = new Map<string, number>()
  for (const p of m.engine?.totals ?? []) if (p.gas) gases.set(p.formula, (gases.get(p.formula) ?? 0) + p.mol)
  if (gases.size) parts.push({ title: 'Gases given off (whole run)', lines: [...gases].map(([g, mol]) => `- ${prettyFormula(g)}: ${fmt(mol * Vm)} L at the run conditions (${fmt(mol)} mol)`) })

  // Computed quantities with their working.
  const work: string[] = []
  for (const c of a.computed) {
    if (!['step.charge', 'expect.max', 'observe.efficiency', 'run.totals', 'run.sim', 'cell.voltages'].includes(c.key)) continue
    work.push(`- line ${c.line + 1}, ${c.title}: ${c.label}`)
    for (const w of c.working) work.push(`    ${w}`)
  }
  if (work.length) parts.push({ title: 'Computed, with the working', lines: work })

  // Cautions: every finding that carries one, and the problems still open.
  const cautions = new Map<string, string>()
  for (const d of a.diagnostics) if (d.caution) cautions.set(d.code, d.caution)
  const problems = a.diagnostics.filter((d) => d.severity === 'error' || d.severity === 'warning').map((d) => `- line ${a.index.humanAt(d.span.start).line}: ${d.severity} [${d.code}] ${d.message}`)
  parts.push({
    title: 'Cautions',
    lines: [
      ...[...cautions].map(([code, text]) => `- ${code}: ${text}`),
      ...problems,
      'This sheet is arithmetic, not a safety review: follow your local codes, the safety data sheets and your institution\'s licensed practice.',
    ],
  })

  // Observations.
  const obs: string[][] = [['what', 'planned', 'measured', 'time', 'initials']]
  for (const y of m.yields) obs.push([`${prettyFormula(y.formula.tok.text)}${y.compartment ? ` in ${y.compartment.text}` : ''}`, y.kind === 'expect' ? y.quantity.expr.text : '', '', '', ''])
  obs.push(['cell voltage', '', '', '', ''], ['temperature', '', '', '', ''], ['remarks', '', '', '', ''])
  parts.push({ title: 'Observations', table: obs })
  return { title, parts }
}

const mdCell = (s: string) => s.replace(/\|/g, '\\|')

/** The run sheet as Markdown. */
export function sheetMarkdown(a: Analysis, file: string): string {
  const { title, parts } = sections(a)
  const out: string[] = [`# ${title}`, '', `Run sheet for \`${file}\`, computed by Cellrun.`, '']
  for (const p of parts) {
    out.push(`## ${p.title}`, '')
    if (p.lines) out.push(...p.lines, '')
    if (p.table) {
      const [head, ...rows] = p.table
      out.push(`| ${head.map(mdCell).join(' | ')} |`, `|${head.map(() => '---').join('|')}|`, ...rows.map((r) => `| ${r.map(mdCell).join(' | ')} |`), '')
    }
  }
  return out.join('\n')
}

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;')

/** The run sheet as a self-contained HTML page, with the simulation's plots as inline SVG. */
export function sheetHtml(a: Analysis, file: string): string {
  const { parts } = sections(a)
  const html: string[] = [`<p>Run sheet for <code>${esc(file)}</code>, computed by Cellrun.</p>`]
  for (const p of parts) {
    html.push(`<h2>${esc(p.title)}</h2>`)
    if (p.lines) {
      const items = p.lines.filter((l) => l.startsWith('- '))
      const paras = p.lines.filter((l) => !l.startsWith('- ') && !l.startsWith('    '))
      const work = p.lines.filter((l) => l.startsWith('    '))
      html.push(...paras.map((l) => `<p>${esc(l)}</p>`))
      if (items.length) html.push('<ul>', ...items.map((l) => `<li>${esc(l.slice(2))}</li>`), '</ul>')
      if (work.length) html.push(`<pre>${esc(work.map((l) => l.trim()).join('\n'))}</pre>`)
    }
    if (p.table) {
      const [head, ...rows] = p.table
      html.push('<table>', `<tr>${head.map((h) => `<th>${esc(h)}</th>`).join('')}</tr>`, ...rows.map((r) => `<tr>${r.map((c) => `<td>${esc(c)}</td>`).join('')}</tr>`), '</table>')
    }
  }
  // The plots: the preview page, with the sheet put in before them.
  return previewHtml(a).replace(/(<h1>[^<]*<\/h1>)/, `$1\n${html.join('\n')}\n<h2>The run, simulated</h2>`)
}
