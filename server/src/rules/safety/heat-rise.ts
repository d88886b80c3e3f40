// heat-rise: without declared cooling, the simulated cell warms by more than 20 K over the run, or
// past 60 °C: the heat (U − E_tn)·I·t of a stated cell voltage goes into the contents.
import type { Diagnostic } from '../../core/diagnostics'
import { ZERO_CELSIUS } from '../../core/constants'
import { fmt } from '../../core/units'
import type { Rule } from '../rule'
import { appendLine, handlingOf, peakTemperature } from './facts'

/** Largest temperature rise over the run without cooling, K (common practice, no source). */
export const MAX_RISE_K = 20
/** Highest temperature reached by the cell's own heat without cooling, °C (common practice, no source). */
export const MAX_CELSIUS = 60

export const heatRise: Rule = {
  code: 'heat-rise',
  severity: 'warning',
  category: 'safety',
  summary: `Without declared cooling, the simulated cell warms by more than ${MAX_RISE_K} K over the run, or past ${MAX_CELSIUS} °C.`,
  details:
    'The energy a cell takes above its thermoneutral voltage, (U − E_tn)·I·t, heats the contents. A cell that warms unchecked can soften plastic frames and membranes, boil off water, speed side reactions (hypochlorite to chlorate) and spray hot caustic or acid. Declare cooling (a jacket or coil) with the temperature it holds, or lower the current or the run time.',
  source: `Thresholds ${MAX_RISE_K} K and ${MAX_CELSIUS} °C: common practice, no source. The temperature is the simulation's estimate (heat capacity 3.9 J/(g·K), no heat loss to the room), so a real cell warms somewhat less.`,
  caution:
    'Provide cooling or limit the current so the contents stay well below boiling and within the rating of the vessel, membrane and tubing; watch the temperature during the run and stop if it keeps climbing. Follow your local codes, the safety data sheets and your institution\'s licensed practice.',
  check({ model }) {
    if (handlingOf(model, 'cooling').length > 0 || !model.simulation) return []
    const start = model.temperatureK
    const peak = peakTemperature(model)
    const rise = peak - start
    const hot = (t: number) => t - start > MAX_RISE_K || (t - ZERO_CELSIUS > MAX_CELSIUS && t - start > 0.5)
    if (!hot(peak)) return []
    // The step during which the cell first gets too warm.
    const first = model.simulation.steps.find((s) => hot(s.temperatureK))
    const node = first ? model.tree.lines[first.line] : undefined
    const span = node?.span ?? model.tree.lines[0].span
    const startC = start - ZERO_CELSIUS
    const peakC = peak - ZERO_CELSIUS
    const out: Diagnostic = {
      code: 'heat-rise',
      severity: 'warning',
      message:
        `without cooling the simulated cell warms from ${fmt(startC)} °C to ${fmt(peakC)} °C (ΔT ${fmt(rise)} K)` +
        `${first && node?.kind === 'step' ? `, passing ${first.temperatureK - start > MAX_RISE_K ? `a ${MAX_RISE_K} K rise` : `${MAX_CELSIUS} °C`} in step ${node.label.text}` : ''}` +
        (peakC >= 95 ? '; it would boil' : ''),
      span,
      fixes: [appendLine(model, `handling cooling: jacket or coil, hold at ${fmt(startC)} °C`)],
    }
    return [out]
  },
}
