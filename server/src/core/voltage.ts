// Reversible and thermoneutral cell voltages of the chosen electrode reactions, from standard
// Gibbs energies and enthalpies of formation (data/thermo.ts):
//   E_rev = ΔG / (n F),  E_tn = ΔH / (n F)
// for the overall cell reaction (anode oxidation + cathode reduction) written per mole of
// electrons, at 25 °C and standard states (unit activities, 1 bar gases). Concentration (Nernst)
// terms are left out: the figures are the textbook standard values (1.229 V and 1.481 V for water,
// about 2.19 V for chlor-alkali).
import { FARADAY } from './constants'
import { THERMO } from './data/thermo'
import type { ElectrodeReaction } from './engine'

export interface CellVoltages {
  /** Reversible (equilibrium) voltage, V. */
  reversible: number
  /** Thermoneutral voltage, V: at this voltage the cell neither heats nor cools. */
  thermoneutral: number
  /** The overall reaction per electron, as text. */
  overall: string
}

type Side = Record<string, number>

/** Species per mole of electrons: what a half-reaction consumes and forms (THERMO keys). */
function halfSpecies(r: ElectrodeReaction): { consumed: Side; formed: Side } | undefined {
  switch (r.kind) {
    case 'hydrogen':
      return r.form === 'acid'
        ? { consumed: { 'H^+(aq)': 1 }, formed: { 'H2(g)': 0.5 } }
        : { consumed: { 'H2O(l)': 1 }, formed: { 'H2(g)': 0.5, 'OH^-(aq)': 1 } }
    case 'oxygen':
      return r.form === 'alkaline'
        ? { consumed: { 'OH^-(aq)': 1 }, formed: { 'O2(g)': 0.25, 'H2O(l)': 0.5 } }
        : { consumed: { 'H2O(l)': 0.5 }, formed: { 'O2(g)': 0.25, 'H^+(aq)': 1 } }
    case 'chlorine':
      return { consumed: { 'Cl^-(aq)': 1 }, formed: { 'Cl2(g)': 0.5 } }
    case 'deposition': {
      const { element: el, charge: z } = r.metal!
      return { consumed: { [`${el}^${z === 1 ? '' : z}+(aq)`]: 1 / z }, formed: { [`${el}(s)`]: 1 / z } }
    }
    case 'dissolution': {
      const { element: el, charge: z } = r.metal!
      return { consumed: { [`${el}(s)`]: 1 / z }, formed: { [`${el}^${z === 1 ? '' : z}+(aq)`]: 1 / z } }
    }
    default:
      return undefined
  }
}

/** Standard voltages of a cell running these two reactions, or undefined when data is missing. */
export function cellVoltages(anode: ElectrodeReaction, cathode: ElectrodeReaction, oneSolution = false): CellVoltages | undefined {
  const a = halfSpecies(anode)
  const c = halfSpecies(cathode)
  if (!a || !c) return undefined
  // Net change per electron: formed minus consumed, both halves.
  const net = new Map<string, number>()
  const addSide = (side: Side, sign: number) => {
    for (const [k, v] of Object.entries(side)) net.set(k, (net.get(k) ?? 0) + sign * v)
  }
  addSide(a.formed, 1)
  addSide(c.formed, 1)
  addSide(a.consumed, -1)
  addSide(c.consumed, -1)
  // In one solution the H⁺ of one electrode and the OH⁻ of the other meet as water.
  const hPlus = net.get('H^+(aq)') ?? 0
  const ohMinus = net.get('OH^-(aq)') ?? 0
  if (oneSolution && hPlus > 0 && ohMinus > 0) {
    const k = Math.min(hPlus, ohMinus)
    net.set('H^+(aq)', hPlus - k)
    net.set('OH^-(aq)', ohMinus - k)
    net.set('H2O(l)', (net.get('H2O(l)') ?? 0) + k)
  }
  let dG = 0
  let dH = 0
  for (const [k, v] of net) {
    if (Math.abs(v) < 1e-12) continue
    const t = THERMO[k]
    if (!t) return undefined
    dG += v * t.dGf
    dH += v * t.dHf
  }
  const fmtSide = (want: number) =>
    [...net]
      .filter(([, v]) => Math.sign(v) === want && Math.abs(v) > 1e-12)
      .map(([k, v]) => `${+Math.abs(v).toFixed(4)} ${k}`)
      .join(' + ') || '(nothing)'
  return {
    reversible: (dG * 1000) / FARADAY,
    thermoneutral: (dH * 1000) / FARADAY,
    overall: `${fmtSide(-1)} → ${fmtSide(1)}`,
  }
}
