// The `cellrun.*` settings, read from the client and turned into analysis options and hint filters.
import type { Severity } from '../core/diagnostics'
import type { ModelOptions } from '../core/model'
import { ZERO_CELSIUS } from '../core/constants'

export interface Settings {
  simulation?: { efficiencyFloor?: number }
  rules?: Record<string, string>
  significantFigures?: number
  defaults?: { temperature?: number; pressure?: number }
  units?: { gasVolume?: string }
  inlayHints?: Partial<Record<HintGroup, boolean>> & { verbosity?: 'full' | 'brief' }
}

/** Kinds of inlay hint that can be switched off one by one. */
export type HintGroup = 'charge' | 'amounts' | 'reactions' | 'products' | 'yields' | 'simulation'

export interface HintSettings {
  /** Groups switched off (false); every other group is shown. */
  groups: Partial<Record<HintGroup, boolean>>
  /** Brief: only the first part of each label (before the first ` · `). */
  brief: boolean
}

/** The hint group of a computed value's key. */
export function hintGroup(key: string): HintGroup {
  if (key.startsWith('step.charge') || key.startsWith('run.totals')) return 'charge'
  if (key.startsWith('charge.') || key.startsWith('compartment.')) return 'amounts'
  if (key.endsWith('.reaction') || key === 'cell.voltages') return 'reactions'
  if (key === 'step.products') return 'products'
  if (key.startsWith('expect.') || key.startsWith('observe.')) return key.endsWith('.sim') || key === 'expect.target' ? 'simulation' : 'yields'
  return 'simulation'
}

export function settingsToOptions(s: Settings | null | undefined): { options: ModelOptions; hints: HintSettings } {
  const options: ModelOptions = {}
  const floor = s?.simulation?.efficiencyFloor
  if (typeof floor === 'number' && floor >= 0 && floor <= 100) options.efficiencyFloor = floor / 100
  const severities: Record<string, Severity | 'off'> = {}
  for (const [code, v] of Object.entries(s?.rules ?? {})) {
    if (v === 'error' || v === 'warning' || v === 'information' || v === 'off') severities[code] = v
  }
  options.severities = severities
  const sig = s?.significantFigures
  if (typeof sig === 'number' && sig >= 2 && sig <= 8) options.significantFigures = Math.round(sig)
  const t = s?.defaults?.temperature
  if (typeof t === 'number' && t > -ZERO_CELSIUS && t < 1000) options.defaultTemperatureK = t + ZERO_CELSIUS
  const p = s?.defaults?.pressure
  if (typeof p === 'number' && p > 0) options.defaultPressurePa = p * 1000
  const gas = s?.units?.gasVolume
  if (gas === 'L' || gas === 'mL' || gas === 'm^3') options.gasUnit = gas
  const groups: HintSettings['groups'] = {}
  for (const g of ['charge', 'amounts', 'reactions', 'products', 'yields', 'simulation'] as const) {
    if (s?.inlayHints?.[g] === false) groups[g] = false
  }
  return { options, hints: { groups, brief: s?.inlayHints?.verbosity === 'brief' } }
}
