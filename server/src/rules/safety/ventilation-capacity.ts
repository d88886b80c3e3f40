// ventilation-capacity: a `handling vent` or `handling hood` line states an extract flow too small to
// dilute the peak hydrogen flow below 25 % of its lower flammable limit; or chlorine is made and a
// vent, with no scrubber, is all that handles it.
import type { Diagnostic } from '../../core/diagnostics'
import { fix } from '../../core/diagnostics'
import { type Span, spanOf } from '../../core/positions'
import { evaluateExpression, fmt } from '../../core/units'
import type { Rule } from '../rule'
import { appendLine, handlingOf, litresPerMol, peakGasStep, produced } from './facts'

/** Hydrogen's lower flammable limit in air, vol % (NFPA 497 / IEC 60079-20-1, from memory). */
export const H2_LFL_PERCENT = 4
/** Share of the lower flammable limit a ventilated space is kept below (common practice, e.g. NFPA 69, from memory). */
export const LFL_SHARE = 0.25
/** Extract flow per unit of hydrogen flow: 1 / (4 % × 25 %) = 100. */
export const DILUTION = 1 / ((H2_LFL_PERCENT / 100) * LFL_SHARE)

/** A volume flow written in a handling text: `200 L/h`, `50 m^3/h`, `30 L/min`, `0.5 m³/min`. */
const FLOW = /(?<![\p{L}\p{N}_.])(\d+(?:\.\d+)?(?:[eE][+-]?\d+)?)\s*((?:m\^?3|m³|dm\^?3|dm³|L|l|mL|ml)\s*\/\s*(?:h|hr|min|s))(?![\p{L}\p{N}_])/u

/** The first volume flow in a text, L/h, with where it stands in the text and its unit as written. */
export function flowIn(text: string): { lph: number; start: number; end: number; unit: string; perUnitLph: number } | undefined {
  const m = FLOW.exec(text)
  if (!m) return undefined
  const unit = m[2]
  const mathUnit = unit
    .replace(/\s+/g, '')
    .replace(/^(d?)m(?:\^?3|³)/, '$1m^3')
    .replace(/^l\//, 'L/')
    .replace(/^ml\//, 'mL/')
    .replace(/\/hr$/, '/h')
  // A flow times an hour is a volume: the kind the units module knows, in litres.
  const litresPerHour = (expr: string): number | undefined => {
    const r = evaluateExpression(`(${expr}) * 1 h`, new Map())
    if (!r.ok || r.kind !== 'volume') return undefined
    return r.number
  }
  const lph = litresPerHour(`${m[1]} ${mathUnit}`)
  const perUnitLph = litresPerHour(`1 ${mathUnit}`)
  if (lph === undefined || perUnitLph === undefined) return undefined
  return { lph, start: m.index, end: m.index + m[0].length, unit, perUnitLph }
}

/** Round up to two significant figures, so a flow written from it still meets the requirement. */
export function ceil2(n: number): number {
  if (!(n > 0) || !Number.isFinite(n)) return n
  const f = Math.pow(10, Math.floor(Math.log10(n)) - 1)
  const up = Math.ceil(n / f - 1e-9) * f
  const r = Number(up.toPrecision(2))
  return r >= n ? r : Number((r + f).toPrecision(2))
}

const HYDROGEN = /hydrogen|(^|[^A-Za-z])H2([^A-Za-z0-9]|$)|H₂/
const CHLORINE = /chlorine|(^|[^A-Za-z])Cl2([^A-Za-z0-9]|$)|Cl₂/i

export const ventilationCapacity: Rule = {
  code: 'ventilation-capacity',
  severity: 'warning',
  category: 'safety',
  summary:
    'A vent or hood with a stated flow below 100 times the peak hydrogen flow, or chlorine handled by a vent alone, without a scrubber.',
  details:
    'Hydrogen burns in air from about 4 vol %; an extract is usually sized to keep it below a quarter of that, 1 vol %, which takes at least 100 times the peak hydrogen flow, well mixed. Chlorine is toxic: a vent only moves it to the exhaust, so it is absorbed in a caustic scrubber first. Raise the stated flow to what the peak needs, or declare a scrubber for the chlorine.',
  source:
    'Hydrogen lower flammable limit 4 vol % in air (NFPA 497 / IEC 60079-20-1, from memory); keeping a ventilated space below 25 % of the lower flammable limit: common practice in ventilation design (e.g. NFPA 69, from memory). Scrubber caustic: 2 mol NaOH per mol Cl₂ (Cl₂ + 2 NaOH → NaCl + NaOCl + H₂O).',
  caution:
    "Extract gases where they form, keep ignition sources away from hydrogen, check that the extract actually draws before the run, and absorb chlorine in a caustic scrubber before it reaches the exhaust. Follow your local codes, the safety data sheets and your institution's licensed practice.",
  check({ model }) {
    const out: Diagnostic[] = []
    // Hydrogen: each vent or hood line that states a flow (those naming hydrogen, when some do).
    const peak = peakGasStep(model, 'H2')
    if (peak) {
      const withFlow = handlingOf(model, 'vent', 'hood')
        .map((h) => ({ h, flow: flowIn(h.text.text) }))
        .filter((x): x is { h: (typeof x)['h']; flow: NonNullable<(typeof x)['flow']> } => x.flow !== undefined)
      const forHydrogen = withFlow.filter((x) => HYDROGEN.test(x.h.text.text))
      const required = peak.lph * DILUTION
      for (const { h, flow } of forHydrogen.length > 0 ? forHydrogen : withFlow) {
        if (flow.lph * (1 + 1e-9) >= required) continue
        const span: Span = { start: h.text.start + flow.start, end: h.text.start + flow.end }
        const written = `${fmt(ceil2(required / flow.perUnitLph))} ${flow.unit}`
        out.push({
          code: 'ventilation-capacity',
          severity: 'warning',
          message:
            `the ${h.type.text} extract of ${fmt(flow.lph)} L/h is below the ${fmt(required)} L/h needed for the peak hydrogen flow of ${fmt(peak.lph)} L/h (step ${peak.label}): ` +
            `${fmt(DILUTION)} × the hydrogen flow keeps it below 1 vol %, a quarter of its ${H2_LFL_PERCENT} vol % lower flammable limit`,
          span,
          fixes: [fix(`Raise the flow to ${written}`, span, written)],
        })
      }
    }
    // Chlorine: made, vented, and no scrubber.
    const cl2 = produced(model, 'Cl2')
    const vents = handlingOf(model, 'vent')
    if (cl2 > 0 && vents.length > 0 && handlingOf(model, 'scrubber').length === 0) {
      const vent = vents.find((h) => CHLORINE.test(h.text.text)) ?? vents[0]
      const naoh = ceil2(2 * cl2)
      out.push({
        code: 'ventilation-capacity',
        severity: 'warning',
        message: `the run makes about ${fmt(cl2 * litresPerMol(model))} L of chlorine (${fmt(cl2)} mol), and a vent is its only handling: no scrubber is declared, so the chlorine reaches the exhaust untreated`,
        span: spanOf(vent.text),
        fixes: [appendLine(model, `handling scrubber: chlorine off-gas through NaOH solution holding at least ${fmt(naoh)} mol NaOH, then to the vent`)],
      })
    }
    return out
  },
}
