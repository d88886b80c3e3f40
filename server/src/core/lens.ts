// The code lens on the `run` line: the whole run in one line (products with their amounts, gases
// in litres at the run conditions, energy, duration), from the analysis's own results.
import type { Analysis } from './analyze'
import { GAS_CONSTANT } from './constants'
import { parseFormula, prettyFormula } from './formula'
import type { Span } from './positions'
import { fmt } from './units'

export const SHOW_PREVIEW_COMMAND = 'cellrun.showPreview'

export interface Lens {
  span: Span
  title: string
  /** A command the client runs when the lens is clicked; its one argument is the document's URI. */
  command: string
}

export function codeLenses(a: Analysis): Lens[] {
  const run = a.tree.lines.find((n) => n.kind === 'run')
  if (!run) return []
  return [{ span: run.span, title: runSummary(a), command: SHOW_PREVIEW_COMMAND }]
}

/** `KOH 61.5 g · gases H2 15.5 L, O2 7.76 L · 12 W·h · 7 h`. */
export function runSummary(a: Analysis): string {
  const m = a.model
  const t = m.totals
  if (!(t.chargeC > 0)) return 'Run: no charge passed yet (a step needs a current and a duration)'
  const parts: string[] = []
  const totals = m.engine?.totals ?? []
  // Products: what forms in the solution or on the cathode; metal ions a soluble anode releases are not products.
  const products = totals.filter((p) => !p.gas && p.mol > 0 && !(p.origin === 'anode' && parseFormula(p.formula).charge !== 0))
  const gases = totals.filter((p) => p.gas && p.mol > 0)
  if (products.length) parts.push(products.map((p) => `${prettyFormula(p.formula)} ${mass(p.formula, p.mol)}`).join(', '))
  if (gases.length) {
    const litresPerMol = ((GAS_CONSTANT * m.temperatureK) / m.pressurePa) * 1000
    parts.push(`gases ${gases.map((p) => `${prettyFormula(p.formula)} ${fmt(p.mol * litresPerMol)} L`).join(', ')}`)
  }
  if (t.energyJ !== undefined) parts.push(`${fmt(t.energyJ / 3600)} W·h`)
  parts.push(duration(t.seconds))
  return `Run: ${parts.join(' · ')}`
}

function mass(formula: string, mol: number): string {
  const M = parseFormula(formula).molarMass
  return Number.isFinite(M) ? `${fmt(mol * M)} g` : `${fmt(mol)} mol`
}

function duration(s: number): string {
  if (s >= 3600) return `${fmt(s / 3600, 4)} h`
  if (s >= 60) return `${fmt(s / 60, 4)} min`
  return `${fmt(s, 4)} s`
}
