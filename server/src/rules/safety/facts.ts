// Queries over the model that the hazard rules share. Pure functions; no LSP types.
import type { Model } from '../../core/model'
import type { Product } from '../../core/engine'
import { GAS_CONSTANT } from '../../core/constants'
import type { LineNode } from '../../core/syntax'
import type { Span } from '../../core/positions'

/** Declared handling lines of the given kinds. */
export function handlingOf(model: Model, ...kinds: string[]): Model['handling'] {
  return model.handling.filter((h) => kinds.includes(h.type.text))
}

/** Total of a product over the run (engine bookkeeping at the stated efficiencies), mol. */
export function produced(model: Model, formula: string): number {
  return (model.engine?.totals ?? []).filter((p: Product) => p.formula === formula).reduce((t, p) => t + p.mol, 0)
}

/** Litres per mole of gas at the run's conditions (ideal gas). */
export function litresPerMol(model: Model): number {
  return ((GAS_CONSTANT * model.temperatureK) / model.pressurePa) * 1000
}

/** The step in which a gas comes off fastest, and that rate in L/h at the run's conditions; undefined when none does. */
export function peakGasStep(model: Model, formula: string): { lph: number; label: string } | undefined {
  // Asked by more than one rule: worked out once per model and gas.
  let byGas = peaks.get(model)
  if (!byGas) peaks.set(model, (byGas = new Map()))
  if (byGas.has(formula)) return byGas.get(formula)
  let best: { lph: number; label: string } | undefined
  const stepAt = new Map(model.steps.map((s) => [s.line, s]))
  const Vm = litresPerMol(model)
  for (const sp of model.engine?.steps ?? []) {
    const step = stepAt.get(sp.line)
    if (!step?.seconds) continue
    let mol = 0
    for (const p of sp.products) if (p.formula === formula) mol += p.mol
    const lph = (mol * Vm) / (step.seconds / 3600)
    if (lph > 0 && (!best || lph > best.lph)) best = { lph, label: step.label }
  }
  byGas.set(formula, best)
  return best
}

const peaks = new WeakMap<Model, Map<string, { lph: number; label: string } | undefined>>()

/** The highest rate at which a gas comes off in any step, L/h at the run's conditions (0 when none). */
export function peakGasRate(model: Model, formula: string): number {
  return peakGasStep(model, formula)?.lph ?? 0
}

/** Where to attach a finding about the whole cell: the `cell` line, else the first step, else line 0. */
export function cellSpan(model: Model): Span {
  const n = model.tree.lines.find((x) => x.kind === 'cell') ?? model.tree.lines.find((x) => x.kind === 'step') ?? model.tree.lines[0]
  return n.span
}

/** The electrode line of a role. */
export function electrodeNode(model: Model, role: 'anode' | 'cathode'): Extract<LineNode, { kind: 'electrode' }> | undefined {
  return model.tree.lines.find((x): x is Extract<LineNode, { kind: 'electrode' }> => x.kind === 'electrode' && x.role === role)
}

/** A fix that appends a line at the end of the document. */
export function appendLine(model: Model, line: string): { title: string; edits: { span: Span; newText: string }[] } {
  const text = model.tree.text
  const end = text.length
  const sep = text.length === 0 || text.endsWith('\n') ? '' : '\n'
  return { title: `Add \`${line}\``, edits: [{ span: { start: end, end }, newText: `${sep}${line}\n` }] }
}

/** The highest simulated temperature, K (the run temperature when there is no simulation). */
export function peakTemperature(model: Model): number {
  let t = model.temperatureK
  for (const s of model.simulation?.steps ?? []) t = Math.max(t, s.temperatureK)
  return t
}
