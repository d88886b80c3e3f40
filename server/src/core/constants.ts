// Physical constants. Exact values are the defining constants of the SI (2019 revision, BIPM SI
// Brochure 9th ed.; CODATA 2018 lists them as exact).

/** Elementary charge, C (exact, SI 2019). */
export const ELEMENTARY_CHARGE = 1.602176634e-19
/** Avogadro constant, 1/mol (exact, SI 2019). */
export const AVOGADRO = 6.02214076e23
/** Boltzmann constant, J/K (exact, SI 2019). */
export const BOLTZMANN = 1.380649e-23
/** Faraday constant F = e·N_A, C/mol: exact since the SI 2019 revision (96 485.332 12... C/mol). */
export const FARADAY = ELEMENTARY_CHARGE * AVOGADRO
/** Molar gas constant R = k·N_A, J/(mol·K): exact since SI 2019 (8.314 462 618... J/(mol·K)). */
export const GAS_CONSTANT = BOLTZMANN * AVOGADRO
/** 0 °C in kelvin (definition of the Celsius scale). */
export const ZERO_CELSIUS = 273.15
/** Standard atmosphere, Pa (definition). */
export const STANDARD_ATMOSPHERE = 101325

/** Conditions assumed when a protocol states none. */
export const DEFAULT_TEMPERATURE_K = ZERO_CELSIUS + 25
export const DEFAULT_PRESSURE_PA = STANDARD_ATMOSPHERE

/**
 * Density of pure liquid water, g/mL, at 0-100 °C in 10 °C steps (plus 25 °C); CRC Handbook of
 * Chemistry and Physics, "Properties of water in the range 0-100 °C" (values from memory of that
 * table, rounded to 5 decimals). Linear interpolation between points.
 */
const WATER_DENSITY: [number, number][] = [
  [0, 0.99984],
  [10, 0.9997],
  [20, 0.99821],
  [25, 0.99705],
  [30, 0.99565],
  [40, 0.99222],
  [50, 0.98803],
  [60, 0.9832],
  [70, 0.97778],
  [80, 0.97182],
  [90, 0.96535],
  [100, 0.95835],
]

/** Water density in g/mL at a Celsius temperature, clamped to 0-100 °C. */
export function waterDensity(celsius: number): number {
  const t = Math.max(0, Math.min(100, celsius))
  for (let i = 1; i < WATER_DENSITY.length; i++) {
    const [t1, d1] = WATER_DENSITY[i]
    if (t <= t1) {
      const [t0, d0] = WATER_DENSITY[i - 1]
      return d0 + ((d1 - d0) * (t - t0)) / (t1 - t0)
    }
  }
  return WATER_DENSITY[WATER_DENSITY.length - 1][1]
}
