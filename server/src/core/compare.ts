// How the computed outcome of a protocol changed between two versions: totals, yields, products,
// the simulated end state and the diagnostics, so a reviewer sees the effect of a change and not
// only its text. Pure: two analyses in, lines of text out.
import type { Analysis } from './analyze'
import { prettyFormula } from './formula'
import { fmt } from './units'

interface Figure {
  key: string
  label: string
  value: number
  unit: string
}

/** The figures of an analysis that a reviewer compares. */
function figures(a: Analysis): Figure[] {
  const m = a.model
  const out: Figure[] = []
  const t = m.totals
  if (t.chargeC > 0) out.push({ key: 'charge', label: 'charge passed', value: t.chargeC / 3600, unit: 'A·h' })
  if (t.seconds > 0) out.push({ key: 'duration', label: 'duration', value: t.seconds / 3600, unit: 'h' })
  if (t.energyJ !== undefined) out.push({ key: 'energy', label: 'energy', value: t.energyJ / 3600, unit: 'W·h' })
  const Vm = ((8.314462618 * m.temperatureK) / m.pressurePa) * 1000
  const totals = new Map<string, number>()
  for (const p of m.engine?.totals ?? []) totals.set(`${p.formula}|${p.gas}`, (totals.get(`${p.formula}|${p.gas}`) ?? 0) + p.mol)
  for (const [k, mol] of totals) {
    const [formula, gas] = k.split('|')
    if (gas === 'true') out.push({ key: `gas:${formula}`, label: `${prettyFormula(formula)} given off`, value: mol * Vm, unit: 'L' })
    else out.push({ key: `product:${formula}`, label: `${prettyFormula(formula)} formed (stated efficiencies)`, value: mol, unit: 'mol' })
  }
  for (const c of a.computed) {
    if (c.key === 'expect.max' && c.value !== undefined) out.push({ key: `max:${c.line}:${c.title}`, label: c.title, value: c.value, unit: 'g' })
  }
  const sim = m.simulation
  if (sim?.mainProduct) {
    const electrons = sim.steps.reduce((s, x) => s + x.electronMol, 0)
    const formed = sim.steps.reduce((s, x) => s + (x.product?.mol ?? 0), 0)
    if (electrons > 0) out.push({ key: 'sim:ce', label: `simulated current efficiency for ${prettyFormula(sim.mainProduct.formula)}`, value: ((formed * sim.mainProduct.electrons) / electrons) * 100, unit: '%' })
    const end = sim.final.find((c) => c.name === sim.mainProduct!.compartment)?.main
    if (end) out.push({ key: 'sim:wt', label: `simulated ${prettyFormula(end.formula)} at the end in ${sim.mainProduct.compartment}`, value: end.wtPercent, unit: 'wt%' })
  }
  return out
}

function change(before: number, after: number): string {
  if (before === 0) return ''
  const pct = ((after - before) / Math.abs(before)) * 100
  return ` (${pct >= 0 ? '+' : ''}${fmt(pct)} %)`
}

/** Lines describing how the outcome changed from `a` to `b`; empty when nothing computed changed. */
export function compareOutcomes(a: Analysis, b: Analysis): string[] {
  const lines: string[] = []
  const fa = new Map(figures(a).map((f) => [f.key, f]))
  const fb = new Map(figures(b).map((f) => [f.key, f]))
  for (const [k, f] of fb) {
    const old = fa.get(k)
    if (!old) lines.push(`+ ${f.label}: ${fmt(f.value)} ${f.unit}`)
    else if (fmt(old.value) !== fmt(f.value)) lines.push(`~ ${f.label}: ${fmt(old.value)} → ${fmt(f.value)} ${f.unit}${change(old.value, f.value)}`)
  }
  for (const [k, f] of fa) if (!fb.has(k)) lines.push(`- ${f.label}: was ${fmt(f.value)} ${f.unit}`)
  const key = (d: Analysis['diagnostics'][number]) => `${d.severity} [${d.code}] ${d.message}`
  const da = new Set(a.diagnostics.map(key))
  const db = new Set(b.diagnostics.map(key))
  for (const d of db) if (!da.has(d)) lines.push(`+ new ${d}`)
  for (const d of da) if (!db.has(d)) lines.push(`- cleared ${d}`)
  return lines
}
