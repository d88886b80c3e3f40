// Settings: hint groups and verbosity, significant figures, default conditions.
import { describe, expect, it } from 'vitest'
import { analyze } from '../server/src/core/analyze'
import { toInlayHints } from '../server/src/lsp/convert'
import { hintGroup, settingsToOptions } from '../server/src/lsp/settings'

const PROTOCOL = [
  'run "s"',
  'cell',
  '  compartment a 1 L',
  '  anode platinum in a, area 10 cm^2',
  '  cathode nickel in a, area 10 cm^2',
  'charge a: KOH solution 1 L at 1 M',
  'step 1: current 1 A for 1 h',
  'expect H2 0.1 L in a',
  '',
].join('\n')

describe('settings', () => {
  it('maps every computed key to a hint group', () => {
    const a = analyze(PROTOCOL)
    const groups = new Set(a.computed.map((c) => hintGroup(c.key)))
    for (const g of ['charge', 'amounts', 'reactions', 'products', 'yields']) expect(groups).toContain(g)
  })

  it('switches hint groups off and shortens labels when brief', () => {
    const a = analyze(PROTOCOL)
    const all = toInlayHints(a)
    const { hints } = settingsToOptions({ inlayHints: { products: false, simulation: false } })
    const some = toInlayHints(a, undefined, hints)
    const off = a.computed.filter((c) => ['products', 'simulation'].includes(hintGroup(c.key))).length
    expect(off).toBeGreaterThan(0)
    expect(some.length).toBe(all.length - off)
    const brief = toInlayHints(a, undefined, settingsToOptions({ inlayHints: { verbosity: 'brief' } }).hints)
    expect(brief.every((h) => !String(h.label).includes(' · '))).toBe(true)
  })

  it('sets significant figures of the labels', () => {
    // 1 A × 1 h = 1 A·h = 3600 C; n(e⁻) = 3600 / 96485.33212 = 0.0373115... mol (CODATA 2018 F)
    const five = analyze(PROTOCOL, settingsToOptions({ significantFigures: 5 }).options)
    expect(five.computed.find((c) => c.key === 'step.charge')!.label).toContain('0.037311 mol e⁻')
    const three = analyze(PROTOCOL)
    expect(three.computed.find((c) => c.key === 'step.charge')!.label).toContain('0.0373 mol e⁻')
  })

  it('writes labels read later in the settings of their analysis, even from nonsense figures', () => {
    // Labels are written when first read, after analyze() returns: they must still use its settings.
    // Figures that are not a number fall back to 3; the gas unit must survive that.
    const a = analyze(PROTOCOL, { significantFigures: NaN, gasUnit: 'mL' })
    const products = a.computed.find((c) => c.key === 'step.products')!.label
    expect(products).toMatch(/\d mL H₂/)
    // 1 A × 1 h = 3600 C; n(e⁻) = 3600 / 96485.33212 = 0.0373 mol at 3 figures (CODATA 2018 F)
    expect(a.computed.find((c) => c.key === 'step.charge')!.label).toContain('0.0373 mol e⁻')
  })

  it('uses the default conditions when a protocol states none', () => {
    // 0 °C and 101.325 kPa: molar volume R·T/p = 8.314462618 × 273.15 / 101325 m³/mol = 22.414 L/mol
    const { options } = settingsToOptions({ defaults: { temperature: 0, pressure: 101.325 } })
    const a = analyze(PROTOCOL, options)
    expect(a.model.temperatureK).toBeCloseTo(273.15, 9)
    expect(a.model.yields[0].litresPerMol!).toBeCloseTo((8.314462618 * 273.15) / 101325 * 1000, 6)
  })

  it('shows gas volumes in the preferred unit', () => {
    // 1 A·h of hydrogen at 25 °C and 101.325 kPa: 3600/(2F) mol × R·T/p = 0.018655 mol × 24.465 L/mol = 0.4564 L
    const ml = analyze(PROTOCOL, settingsToOptions({ units: { gasVolume: 'mL' } }).options)
    expect(ml.computed.find((c) => c.key === 'step.products')!.label).toContain('456 mL H₂')
    const litres = analyze(PROTOCOL)
    expect(litres.computed.find((c) => c.key === 'step.products')!.label).toContain('0.456 L H₂')
  })

  it('reads rule severities and the efficiency floor, ignoring nonsense', () => {
    const { options } = settingsToOptions({ rules: { 'hydrogen-vent': 'off', x: 'loud' }, simulation: { efficiencyFloor: 90 }, significantFigures: 99 })
    expect(options.severities).toEqual({ 'hydrogen-vent': 'off' })
    expect(options.efficiencyFloor).toBeCloseTo(0.9, 12)
    expect(options.significantFigures).toBeUndefined()
  })
})
