// The substances Cellrun has data for, and what the data says about one: molar mass (IUPAC 2021
// standard atomic weights), solubility at a temperature and the 20 °C density table. Used by
// completion (the formulas offered) and by the formula hover.
import { DEPOSITABLE, KNOWN_GASES } from './chemistry'
import { ZERO_CELSIUS } from './constants'
import { DENSITY_20C } from './data/density'
import { DISSOCIATION } from './data/ions'
import { SOLUBILITY, solubilityAt } from './data/solubility'
import { parseFormula, prettyFormula } from './formula'
import { fmt } from './units'

export const ATOMIC_WEIGHTS_SOURCE = 'IUPAC 2021 standard atomic weights'

const has = (o: object, k: string) => Object.prototype.hasOwnProperty.call(o, k)

/** Formulas with solubility, density or dissociation data, sorted; what a charge line usually holds. */
export function chargeSpecies(): string[] {
  const all = new Set([...Object.keys(SOLUBILITY), ...Object.keys(DENSITY_20C), ...Object.keys(DISSOCIATION)])
  return [...all].filter((f) => parseFormula(f).ok).sort((x, y) => x.localeCompare(y))
}

/** Products an `expect` or `observe` line usually names: the charge species, gases and metals. */
export function productSpecies(): string[] {
  const gases = ['H2', 'O2', 'Cl2', 'CO2'].filter((g) => KNOWN_GASES.has(g))
  const metals = Object.keys(DEPOSITABLE)
  return [...new Set([...gases, ...metals, ...chargeSpecies()])]
}

/** One line for a formula: its molar mass and the source of the atomic weights. */
export function molarMassLine(text: string): string | undefined {
  const f = parseFormula(text === 'water' ? 'H2O' : text)
  if (!f.ok || !Number.isFinite(f.molarMass)) return undefined
  return `${prettyFormula(f.text)}: M = ${fmt(f.molarMass, 6)} g/mol (${ATOMIC_WEIGHTS_SOURCE})`
}

/** The key the data tables use for a formula: a hydrate's anhydrous salt (CuSO4·5H2O -> CuSO4). */
export function dataKey(text: string): string {
  const state = /\((aq|s|l|g)\)$/.exec(text)
  const bare = state ? text.slice(0, state.index) : text
  const m = /^(.+?)[·•*.]\s*\d*(?:\.\d+)?\s*H2O$/.exec(bare)
  return m ? m[1] : bare
}

/**
 * What the data tables hold for a formula (markdown lines): the solubility at `celsius` and the
 * range of the 20 °C density table. Nothing for a substance the tables do not cover.
 */
export function dataNotes(text: string, temperatureK: number): string[] {
  const key = dataKey(text)
  const out: string[] = []
  if (has(SOLUBILITY, key)) {
    const celsius = temperatureK - ZERO_CELSIUS
    const s = solubilityAt(key, celsius)
    const curve = SOLUBILITY[key]
    const pts = curve.points
    if (s) {
      const range = `${pts[0][0]}–${pts[pts.length - 1][0]} °C`
      out.push(
        `Solubility at ${fmt(celsius)} °C: ${fmt(s.gPer100gWater)} g ${prettyFormula(key)} per 100 g water` +
          (s.extrapolated ? ` (the table covers ${range} only: nearest value)` : '') +
          `  \n*(${curve.source})*`,
      )
    }
  }
  if (has(DENSITY_20C, key)) {
    const table = DENSITY_20C[key]
    const pts = table.points
    out.push(`Density table at 20 °C: ${fmt(pts[0][0])}–${fmt(pts[pts.length - 1][0])} wt% ${prettyFormula(key)}  \n*(${table.source})*`)
  }
  return out
}
