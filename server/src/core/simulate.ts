// The cell simulation: a time-stepped mass balance of each compartment across the whole run.
//
// State per compartment: moles of every ion and neutral species (water included), solids that
// came out of solution, and from these the volume, concentrations and a pH estimate; one
// temperature for the cell. Each time step passes dn mol of electrons:
//   1. the cathode and anode reactions change their compartments (water consumed or made, OH⁻/H⁺
//      made, metal deposited or dissolved, gases leaving);
//   2. the separator carries the same charge: each mobile ion a share in proportion to its
//      conductivity contribution |z|·c·λ (transport numbers); a cation-exchange separator passes
//      the anode side's cations and leaks hydroxide back in proportion to the catholyte's hydroxide
//      concentration; an anion-exchange one is its mirror; a diaphragm passes both; cations drag
//      water with them (electro-osmotic drag);
//   3. each compartment comes to its fast equilibria: H⁺ + OH⁻ → H₂O; carbonate buffering and CO₂
//      release; chlorine meeting hydroxide → hypochlorite; warm hypochlorite → chlorate; salts past
//      their solubility precipitate;
//   4. the cell warms by (U − E_tn)·I·dt unless cooling is declared.
// Steps adapt so that no reacting species changes by more than a few percent per step.
//
// Constants that are rules of thumb rather than table values say so beside them.
import { FARADAY } from './constants'
import { ionsOf } from './engine'
import type { ElectrodeReaction } from './engine'
import { tableDensity } from './data/density'
import { SOLUBILITY, solubilityAt } from './data/solubility'
import { parseFormula, prettyFormula } from './formula'

/**
 * Limiting equivalent ionic conductivities at 25 °C, S·cm²/mol per equivalent (CRC Handbook,
 * "Ionic conductivity and diffusion at infinite dilution", from memory). Used as relative mobilities.
 */
const LAMBDA: Record<string, number> = {
  'H^+': 349.65,
  'Li^+': 38.66,
  'Na^+': 50.08,
  'K^+': 73.48,
  'NH4^+': 73.5,
  'Mg^2+': 53.0,
  'Ca^2+': 59.47,
  'Cu^2+': 53.6,
  'Zn^2+': 52.8,
  'Ni^2+': 49.6,
  'Fe^2+': 54.0,
  'Ag^+': 61.9,
  'OH^-': 198.0,
  'Cl^-': 76.31,
  'Br^-': 78.1,
  'I^-': 76.8,
  'SO4^2-': 80.0,
  'CO3^2-': 69.3,
  'HCO3^-': 44.5,
  'NO3^-': 71.42,
  'ClO3^-': 64.6,
  'ClO4^-': 67.3,
}
const LAMBDA_DEFAULT = 50 // for an ion the table lacks; common practice, no source (typical of small ions)

/**
 * Hydroxide back-migration through a cation-exchange membrane: share of the current it carries per
 * mol/L of hydroxide in the catholyte. Calibrated so that 32 wt% NaOH (about 10.5 mol/L) loses
 * about 4.5 %, inside the 94-97 % current efficiency of industrial membrane cells (EU BREF for the
 * chlor-alkali industry, 2014; Euro Chlor). Common practice, no source for the linear form.
 */
export const OH_LEAK_PER_MOLAR = 0.0045
/** Proton leakage through an anion-exchange membrane, per mol/L of H⁺ in the anolyte (mirror of the above; common practice, no source). */
export const H_LEAK_PER_MOLAR = 0.03

/**
 * Electro-osmotic drag of perfluorinated sulfonic acid membranes in caustic service: about 3.5 mol
 * water per mol of sodium crossing (chlor-alkali literature, from memory; it falls as the caustic
 * gets stronger). Overridable per separator with `drag`.
 */
export const DEFAULT_DRAG = 3.5

/** Mixing through a porous diaphragm: share of each ion's concentration difference evened out per second (common practice, no source: about 4 % per hour). */
const DIAPHRAGM_MIXING_PER_S = 1e-5

/** Heat capacity of the cell contents, J/(g·K): aqueous salt solutions, 3.3-4.2 (common practice, no source). */
const HEAT_CAPACITY = 3.9

/** Second dissociation constant of carbonic acid: pKa2 = 10.33 at 25 °C (CRC Handbook, from memory). */
const PKA2 = 10.33

/** First-order rate of hypochlorite turning to chlorate at 60 °C, 1/s, doubling every 10 K (common practice, no source). */
const CHLORATE_RATE_60C = 2e-4
/** Below this temperature hypochlorite is taken as stable. */
const CHLORATE_MIN_CELSIUS = 40

const WATER = 'H2O'
const M_WATER = 18.015

export interface SimCompartmentInput {
  name: string
  waterG: number
  solutes: { formula: string; mol: number }[]
}

export interface SimStep {
  line: number
  currentA?: number
  seconds?: number
  efficiency: number
  voltageV?: number
}

export interface SimTarget {
  line: number
  formula: string
  compartment: string
  kind: 'wt%' | 'mol/L'
  value: number
}

export interface SimInput {
  compartments: SimCompartmentInput[]
  anode: ElectrodeReaction
  cathode: ElectrodeReaction
  /** Separator between the anode's and the cathode's compartments (none: they share one solution). */
  separator?: { type: 'cation-exchange' | 'anion-exchange' | 'diaphragm'; drag?: number }
  steps: SimStep[]
  temperatureK: number
  cooled: boolean
  thermoneutralV?: number
  targets: SimTarget[]
  /** Warn when a step's simulated current efficiency falls below this fraction. */
  efficiencyFloor: number
}

export type EventKind = 'feed-exhausted' | 'saturated' | 'target-reached' | 'ph' | 'efficiency' | 'temperature' | 'dry'

export interface SimEvent {
  kind: EventKind
  /** Seconds from the start of the run. */
  time: number
  /** The step line during which it happens. */
  line: number
  compartment?: string
  message: string
}

export interface CompartmentSnapshot {
  name: string
  /** Moles of each species (water included). */
  species: Record<string, number>
  solids: Record<string, number>
  waterG: number
  massG: number
  volumeL: number
  ph: number
  /** The main product here, as a salt or acid or base formula, with its concentration. */
  main?: { formula: string; mol: number; wtPercent: number; molPerL: number }
}

export interface StepResult {
  line: number
  /** Seconds from the start when the step ends. */
  endTime: number
  electronMol: number
  /** Main product formed in the step, mol, and its current efficiency. */
  product?: { formula: string; mol: number; efficiency: number }
  compartments: CompartmentSnapshot[]
  gases: Record<string, number>
  temperatureK: number
}

export interface SeriesPoint {
  time: number
  temperatureK: number
  /** Current efficiency for the main product from the start of the run to this point. */
  efficiency: number
  gases: Record<string, number>
  compartments: { name: string; ph: number; wtPercent?: number; molPerL?: number }[]
}

export interface SimResult {
  steps: StepResult[]
  events: SimEvent[]
  series: SeriesPoint[]
  /** Gases released, mol. */
  gases: Record<string, number>
  /** Metal deposited at the cathode, mol. */
  deposits: Record<string, number>
  /** Metal dissolved from the anode into the cell, mol. */
  dissolved: Record<string, number>
  /** Final state. */
  final: CompartmentSnapshot[]
  /** What the main product is. */
  mainProduct?: { formula: string; compartment: string; electrons: number }
  /** Time steps taken (for cost checks). */
  iterations: number
}

interface Species {
  charge: number
  counts: Map<string, number>
  mass: number
}

const speciesCache = new Map<string, Species>()
const NO_SOLIDS: Record<string, number> = Object.freeze({}) as Record<string, number>

/** Forget the species and salt tables read so far (for benchmarks that measure a first analysis). */
export function clearSimulationCaches(): void {
  speciesCache.clear()
  saltCache.clear()
  productIonsCache.clear()
  saltTable = undefined
}
function species(key: string): Species {
  let s = speciesCache.get(key)
  if (!s) {
    const f = parseFormula(key)
    s = { charge: f.charge, counts: new Map(f.counts), mass: Number.isFinite(f.molarMass) ? f.molarMass : 0 }
    speciesCache.set(key, s)
  }
  return s
}

/** The neutral salt (or acid or base) of a cation and an anion, by their ion keys: `K^+`, `CO3^2-` → K2CO3. */
function saltOf(cation: string, anion: string): { formula: string; nc: number; na: number; mass: number } {
  let byAnion = saltCache.get(cation)
  if (!byAnion) {
    // Ion keys come from what documents charge: bounded like the other caches.
    if (saltCache.size >= 4096) saltCache.clear()
    saltCache.set(cation, (byAnion = new Map()))
  }
  let salt = byAnion.get(anion)
  if (!salt) {
    const zc = species(cation).charge
    const za = -species(anion).charge
    const base = (k: string) => k.replace(/\^.*$/, '')
    const g = gcd(zc, za)
    const nc = za / g
    const na = zc / g
    const wrap = (s: string, n: number) => (n === 1 ? s : /^[A-Z][a-z]?$/.test(s) ? `${s}${n}` : `(${s})${n}`)
    const formula = `${wrap(base(cation), nc)}${wrap(base(anion), na)}`
    const f = parseFormula(formula)
    salt = { formula, nc, na, mass: Number.isFinite(f.molarMass) ? f.molarMass : nc * species(cation).mass + na * species(anion).mass }
    byAnion.set(anion, salt)
  }
  return salt
}

const saltCache = new Map<string, Map<string, { formula: string; nc: number; na: number; mass: number }>>()

type ProductIons = { cation: string; anion: string; cationCount: number; anionCount: number; molarMass: number }

/** The ion keys a salt, acid or base formula is made of (`K2CO3` → `K^+` ×2, `CO3^2-`), or null. */
function productIons(formula: string): ProductIons | null {
  let p = productIonsCache.get(formula)
  if (p === undefined) {
    const f = parseFormula(formula)
    const ions = ionsOf(f)
    p = ions
      ? { cation: ionKey(ions.cation, ions.cationCharge), anion: ionKey(ions.anion, ions.anionCharge), cationCount: ions.cationCount, anionCount: ions.anionCount, molarMass: f.molarMass }
      : null
    if (productIonsCache.size >= 4096) productIonsCache.clear()
    productIonsCache.set(formula, p)
  }
  return p
}

const productIonsCache = new Map<string, ProductIons | null>()

function ionKey(formula: string, charge: number): string {
  const a = Math.abs(charge)
  return `${formula}^${a === 1 ? '' : a}${charge > 0 ? '+' : '-'}`
}

class Solution {
  amt = new Map<string, number>()
  /**
   * The species in amt, in its order (entries are only ever added): read by index, as a for-of over
   * the Map's keys made an iterator result per entry on every time step (measured).
   */
  keys: string[] = []
  solids = new Map<string, number>()
  /** Water at the start, mol: the drag leaves at least a tenth of it. */
  initialWater = 0
  constructor(readonly name: string) {}

  get(k: string): number {
    return this.amt.get(k) ?? 0
  }
  add(k: string, v: number): void {
    const cur = this.amt.get(k)
    if (cur === undefined) this.keys.push(k)
    const n = (cur ?? 0) + v
    this.amt.set(k, n < 0 && n > -1e-12 ? 0 : n)
    this.known = false
  }
  // Mass, main salt and volume of the current contents, worked out once per change (a time step
  // reads them many times); kept in fields, not a new object per change.
  private known = false
  private knownMass = 0
  private knownMain: ReturnType<Solution['mainSaltUncached']> = undefined
  private knownVolume: number | undefined = undefined
  private derive(): void {
    if (this.known) return
    this.knownMass = this.massUncached()
    this.knownMain = this.mainSaltUncached()
    this.knownVolume = undefined
    this.known = true
  }
  massG(): number {
    this.derive()
    return this.knownMass
  }
  private massUncached(): number {
    let m = 0
    for (let i = 0; i < this.keys.length; i++) {
      const k = this.keys[i]
      const v = this.amt.get(k)!
      m += v * (k === WATER ? M_WATER : species(k).mass)
    }
    return m
  }
  waterG(): number {
    return this.get(WATER) * M_WATER
  }
  /** The main solute as a salt/base/acid formula: the most plentiful cation with the most plentiful anion. */
  mainSalt(): { formula: string; mol: number; mass: number } | undefined {
    this.derive()
    return this.knownMain
  }
  private mainSaltUncached(): { formula: string; mol: number; mass: number } | undefined {
    // The leading cation and anion by charge carried (kept as key and amount, not as pairs).
    let catKey: string | undefined
    let catMol = 0
    let anKey: string | undefined
    let anMol = 0
    for (let i = 0; i < this.keys.length; i++) {
      const k = this.keys[i]
      const v = this.amt.get(k)!
      if (k === WATER || v <= 1e-12) continue
      const c = species(k).charge
      if (c > 0 && k !== 'H^+' && (catKey === undefined || v * c > catMol * species(catKey).charge)) {
        catKey = k
        catMol = v
      }
      if (c < 0 && (anKey === undefined || v * -c > anMol * -species(anKey).charge)) {
        anKey = k
        anMol = v
      }
    }
    const hPlus = this.get('H^+')
    if (catKey === undefined && hPlus > 1e-12) {
      catKey = 'H^+'
      catMol = hPlus
    }
    if (catKey === undefined || anKey === undefined) return undefined
    const salt = saltOf(catKey, anKey)
    return { formula: salt.formula, mol: Math.min(catMol / salt.nc, anMol / salt.na), mass: salt.mass }
  }
  volumeL(): number {
    this.derive()
    this.knownVolume ??= this.volumeUncached()
    return this.knownVolume
  }
  private volumeUncached(): number {
    const total = this.massG()
    const main = this.mainSalt()
    if (main && total > 0) {
      const w = (100 * main.mol * main.mass) / total
      const d = tableDensity(main.formula, w)
      if (d !== undefined) return total / d / 1000
    }
    return total / 998.2 // water at 20 °C, 0.9982 g/mL (CRC)
  }
  conc(k: string, V = this.volumeL()): number {
    return V > 0 ? this.get(k) / V : 0
  }
  ph(): number {
    const V = this.volumeL()
    const oh = this.conc('OH^-', V)
    const h = this.conc('H^+', V)
    if (oh > 1e-7) return Math.min(15, 14 + Math.log10(oh))
    if (h > 1e-7) return Math.max(-1, -Math.log10(h))
    const co3 = this.get('CO3^2-')
    const hco3 = this.get('HCO3^-')
    // Carbonate/bicarbonate buffer; with almost no carbonate left it tends to bicarbonate's own pH.
    if (co3 > 1e-12 && hco3 > 1e-12) return Math.max(8.3, PKA2 + Math.log10(co3 / hco3))
    if (hco3 > 1e-12) return 8.3 // bicarbonate alone, (pKa1 + pKa2)/2 (CRC, from memory)
    if (co3 > 1e-12) return 11.6 // carbonate alone, about 0.5 mol/L (from memory)
    return 7
  }
  snapshot(main?: string): CompartmentSnapshot {
    const V = this.volumeL()
    const total = this.massG()
    const m = this.mainSalt()
    // Built by loops (same keys, same order as the Maps): one snapshot per compartment per step.
    const species: Record<string, number> = {}
    for (let i = 0; i < this.keys.length; i++) {
      const k = this.keys[i]
      const v = this.amt.get(k)!
      if (v > 1e-15) species[k] = v
    }
    // Most compartments hold no solid: they share one empty, frozen record (results are read-only).
    let solids: Record<string, number> = NO_SOLIDS
    for (const k of this.solids.keys()) {
      if (solids === NO_SOLIDS) solids = {}
      solids[k] = this.solids.get(k)!
    }
    const chosen = main ? this.productOf(main) : m
    // Every field in the literal (main undefined when there is none): one layout, all in the object.
    return {
      name: this.name,
      species,
      solids,
      waterG: this.waterG(),
      massG: total,
      volumeL: V,
      ph: this.ph(),
      main: chosen && chosen.mol > 0 ? { formula: chosen.formula, mol: chosen.mol, wtPercent: (100 * chosen.mol * chosen.mass) / total, molPerL: chosen.mol / V } : undefined,
    }
  }
  /** Amount of a given salt/base formula present as its ions. */
  productOf(formula: string): { formula: string; mol: number; mass: number } | undefined {
    const ions = productIons(formula)
    if (!ions) return undefined
    const mol = Math.min(this.get(ions.cation) / ions.cationCount, this.get(ions.anion) / ions.anionCount)
    return { formula, mol, mass: ions.molarMass }
  }
  clone(): Solution {
    const s = new Solution(this.name)
    s.amt = new Map(this.amt)
    s.keys = this.keys.slice()
    s.solids = new Map(this.solids)
    return s
  }
}

function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b)
}

function lambda(k: string): number {
  return LAMBDA[k] ?? LAMBDA_DEFAULT
}

/** Load a compartment: water and the ions (or molecules) of what was charged. */
function load(c: SimCompartmentInput, gases: Record<string, number>): Solution {
  const s = new Solution(c.name)
  s.add(WATER, c.waterG / M_WATER)
  s.initialWater = c.waterG / M_WATER
  for (const x of c.solutes) {
    const f = parseFormula(x.formula)
    const i = ionsOf(f)
    if (i) {
      s.add(ionKey(i.cation, i.cationCharge), x.mol * i.cationCount)
      s.add(ionKey(i.anion, i.anionCharge), x.mol * i.anionCount)
    } else if (f.ok) s.add(x.formula, x.mol)
  }
  // What was charged reacts at once (acid poured onto carbonate gives off its CO₂ before the run).
  equilibrate(s, 0, 298.15, gases)
  return s
}

/** Fast equilibria in one solution. Returns gases released (mol) by key. */
function equilibrate(s: Solution, dt: number, T: number, gases?: Record<string, number>): void {
  // H⁺ + OH⁻ → H₂O
  const n = Math.min(s.get('H^+'), s.get('OH^-'))
  if (n > 0) {
    s.add('H^+', -n)
    s.add('OH^-', -n)
    s.add(WATER, n)
  }
  // OH⁻ + HCO₃⁻ → CO₃²⁻ + H₂O
  const b = Math.min(s.get('OH^-'), s.get('HCO3^-'))
  if (b > 0) {
    s.add('OH^-', -b)
    s.add('HCO3^-', -b)
    s.add('CO3^2-', b)
    s.add(WATER, b)
  }
  // H⁺ + CO₃²⁻ → HCO₃⁻; H⁺ + HCO₃⁻ → CO₂↑ + H₂O
  const c1 = Math.min(s.get('H^+'), s.get('CO3^2-'))
  if (c1 > 0) {
    s.add('H^+', -c1)
    s.add('CO3^2-', -c1)
    s.add('HCO3^-', c1)
  }
  const c2 = Math.min(s.get('H^+'), s.get('HCO3^-'))
  if (c2 > 0) {
    s.add('H^+', -c2)
    s.add('HCO3^-', -c2)
    s.add(WATER, c2)
    if (gases) gases.CO2 = (gases.CO2 ?? 0) + c2
  }
  // Warm hypochlorite turns to chlorate: 3 ClO⁻ → ClO₃⁻ + 2 Cl⁻.
  const celsius = T - 273.15
  if (dt > 0 && celsius >= CHLORATE_MIN_CELSIUS && s.get('ClO^-') > 0) {
    const k = CHLORATE_RATE_60C * Math.pow(2, (celsius - 60) / 10)
    const x = s.get('ClO^-') * (1 - Math.exp(-k * dt))
    s.add('ClO^-', -x)
    s.add('ClO3^-', x / 3)
    s.add('Cl^-', (2 * x) / 3)
  }
}

/** The salts with solubility data, with their ions, read once. */
let saltTable: { key: string; cat: string; an: string; nc: number; na: number; M: number; solT?: number; sol?: ReturnType<typeof solubilityAt> }[] | undefined
function salts() {
  if (!saltTable) {
    saltTable = []
    for (const key of Object.keys(SOLUBILITY)) {
      const f = parseFormula(key)
      const i = ionsOf(f)
      if (i) saltTable.push({ key, cat: ionKey(i.cation, i.cationCharge), an: ionKey(i.anion, i.anionCharge), nc: i.cationCount, na: i.anionCount, M: f.molarMass })
    }
  }
  return saltTable
}

const NOTHING_PRECIPITATED: string[] = Object.freeze([]) as unknown as string[]

/** Salts with solubility data whose ions are present; the excess precipitates. Returns the salts that did. */
function precipitate(s: Solution, T: number): readonly string[] {
  // Most time steps precipitate nothing: they share one empty list (a list is made on the first salt).
  let out: string[] = NOTHING_PRECIPITATED
  let water: number | undefined
  const table = salts()
  for (let i = 0; i < table.length; i++) {
    const x = table[i]
    const present = Math.min(s.get(x.cat) / x.nc, s.get(x.an) / x.na)
    if (!(present > 0) && !(s.solids.get(x.key) ?? 0)) continue
    // The temperature changes only when the cell heats: read the table again only then.
    if (x.solT !== T) {
      x.solT = T
      x.sol = solubilityAt(x.key, T - 273.15)
    }
    const sol = x.sol
    if (!sol || sol.extrapolated) continue
    water ??= s.waterG()
    const max = (sol.gPer100gWater * water) / 100 / x.M
    const solid = s.solids.get(x.key) ?? 0
    if (solid > 0 && present < max) {
      // Crystals dissolve again as far as the solution takes them.
      const back = Math.min(solid, max - present)
      s.add(x.cat, back * x.nc)
      s.add(x.an, back * x.na)
      s.solids.set(x.key, solid - back)
      continue
    }
    if (present > max * (1 + 1e-9)) {
      const n = present - max
      s.add(x.cat, -n * x.nc)
      s.add(x.an, -n * x.na)
      s.solids.set(x.key, (s.solids.get(x.key) ?? 0) + n)
      if (out === NOTHING_PRECIPITATED) out = []
      out.push(x.key)
    }
  }
  return out
}

/** What the run is for, and how many electrons one unit of it takes. */
function mainProductOf(input: SimInput, a: Solution, c: Solution): { formula: string; compartment: string; electrons: number; measure: (st: State) => number } | undefined {
  const { anode, cathode } = input
  if (cathode.kind === 'deposition') {
    const el = cathode.metal!.element
    return { formula: el, compartment: c.name, electrons: cathode.metal!.charge, measure: (st) => st.deposits[el] ?? 0 }
  }
  const sep = input.separator?.type
  if (anode.kind === 'chlorine' && !sep) {
    const cat = c.mainSalt()?.formula.match(/^[A-Z][a-z]?/)?.[0] ?? 'Na'
    // Warm, the hypochlorite goes on to chlorate (6 e⁻ per ClO₃⁻); cool, it stays (2 e⁻ per ClO⁻).
    if (input.temperatureK - 273.15 >= CHLORATE_MIN_CELSIUS) {
      return { formula: `${cat}ClO3`, compartment: c.name, electrons: 6, measure: (st) => st.sol(c.name).get('ClO3^-') + st.sol(c.name).get('ClO^-') / 3 }
    }
    return { formula: `${cat}ClO`, compartment: c.name, electrons: 2, measure: (st) => st.sol(c.name).get('ClO^-') + 3 * st.sol(c.name).get('ClO3^-') }
  }
  const alkalineFeed = a.get('OH^-') > 0
  if (sep === 'cation-exchange' || (sep === 'diaphragm' && !alkalineFeed)) {
    if (cathode.kind === 'hydrogen') {
      const feedCation = [...a.amt].filter(([k, v]) => v > 0 && species(k).charge > 0 && k !== 'H^+').sort((x, y) => y[1] - x[1])[0]
      const el = feedCation ? feedCation[0].replace(/\^.*$/, '') : 'Na'
      const z = feedCation ? species(feedCation[0]).charge : 1
      return { formula: z === 1 ? `${el}OH` : `${el}(OH)${z}`, compartment: c.name, electrons: z, measure: (st) => (st.sol(c.name).get('OH^-') - (st.mixedIn['OH^-'] ?? 0)) / z }
    }
  }
  if (sep === 'anion-exchange') {
    const an = [...c.amt].filter(([k, v]) => v > 0 && species(k).charge < 0 && k !== 'OH^-').sort((x, y) => y[1] - x[1])[0]
    if (an) {
      const z = -species(an[0]).charge
      const name = an[0].replace(/\^.*$/, '')
      return { formula: `${z === 1 ? 'H' : `H${z}`}${name}`, compartment: a.name, electrons: z, measure: (st) => st.sol(a.name).get('H^+') / z }
    }
  }
  if (anode.kind === 'chlorine') return { formula: 'Cl2', compartment: a.name, electrons: 2, measure: (st) => st.gases.Cl2 ?? 0 }
  return { formula: 'H2', compartment: c.name, electrons: 2, measure: (st) => st.gases.H2 ?? 0 }
}

interface State {
  sols: Solution[]
  sol(name: string): Solution
  gases: Record<string, number>
  deposits: Record<string, number>
  dissolved: Record<string, number>
  /** Net moles of each ion moved into the cathode side by diaphragm mixing (not made by the current). */
  mixedIn: Record<string, number>
  T: number
}

export function simulate(input: SimInput): SimResult {
  const gases: Record<string, number> = {}
  const sols = input.compartments.map((x) => load(x, gases))
  const byName = new Map(sols.map((s) => [s.name, s]))
  const a = byName.get(input.anode.compartment)!
  const c = byName.get(input.cathode.compartment)!
  const state: State = { sols, sol: (n) => byName.get(n)!, gases, deposits: {}, dissolved: {}, mixedIn: {}, T: input.temperatureK }
  const result: SimResult = { steps: [], events: [], series: [], gases: state.gases, deposits: state.deposits, dissolved: state.dissolved, final: [], iterations: 0 }
  const main = mainProductOf(input, a, c)
  if (main) result.mainProduct = { formula: main.formula, compartment: main.compartment, electrons: main.electrons }
  const divided = a !== c && !!input.separator
  const drag = input.separator?.drag ?? DEFAULT_DRAG
  const sep = input.separator?.type

  // Initial amounts for exhaustion events.
  const feedCations = divided && sep !== 'anion-exchange' ? cationCharge(a, false) : 0
  const depIon = input.cathode.kind === 'deposition' ? ionKey(input.cathode.metal!.element, input.cathode.metal!.charge) : undefined
  const depInitial = depIon ? c.get(depIon) : 0
  const chlorideInitial = input.anode.kind === 'chlorine' ? a.get('Cl^-') : 0
  const once = new Set<string>()
  const event = (kind: EventKind, key: string, time: number, line: number, message: string, compartment?: string) => {
    if (once.has(key)) return
    once.add(key)
    result.events.push({ kind, time, line, message, ...(compartment ? { compartment } : {}) })
  }
  const lastPh = new Map(sols.map((s) => [s.name, s.ph()]))
  let time = 0
  let runElectrons = 0
  const runStart = main ? main.measure(state) : 0
  const running = () => (main && runElectrons > 0 ? ((main.measure(state) - runStart) * main.electrons) / runElectrons : 0)
  const totalSeconds = input.steps.reduce((t, s) => t + (s.seconds ?? 0), 0)
  const runTotal = input.steps.reduce((t, s) => t + ((s.currentA ?? 0) > 0 && (s.seconds ?? 0) > 0 ? (s.currentA! * s.seconds!) / FARADAY : 0), 0)
  const seriesEvery = Math.max(totalSeconds / 200, 1)
  let nextSeries = 0

  // Indexed loops in the simulation (a for-of made an iterator and a result per element here).
  for (let si = 0; si < input.steps.length; si++) {
    const step = input.steps[si]
    const seconds = step.seconds ?? 0
    const I = step.currentA ?? 0
    const stepStart = main ? main.measure(state) : 0
    let stepElectrons = 0
    if (seconds > 0 && I > 0) {
      let elapsed = 0
      const total = (I * seconds) / FARADAY
      // Time steps: at least 50 per run step, fewer when the step is a small part of a long run (a
      // protocol of a thousand short steps costs about as much as one of ten); at most 400 per
      // run step and about 1,000 per run. Enough for 2 % changes, cheap enough for every keystroke.
      const floor = Math.max(total / 400, runTotal / 1000)
      const cap = Math.max(total / 50, runTotal / 200)
      while (elapsed < seconds - 1e-9) {
        result.iterations++
        // Adaptive: no reactant of the moment changes by more than 2 % in one step.
        const scale = reactingScale(input, a, c, depIon, total * 1e-3)
        let dne = Math.max(floor, Math.min(cap, 0.02 * scale))
        let dt = (dne * FARADAY) / I
        if (elapsed + dt > seconds) {
          dt = seconds - elapsed
          dne = (I * dt) / FARADAY
        }
        elapsed += dt
        time += dt
        stepElectrons += dne
        // The separator's share first, so that hydroxide leaking back meets this step's chlorine.
        if (divided && transport(sep!, a, c, dne, drag)) {
          event('dry', 'dry', time, step.line, `${a.name} has lost nine tenths of its water to the drag through the separator: add water or stop`, a.name)
        }
        // Through a cation-exchange membrane the chlorine side's losses come from the hydroxide
        // leaking back (the transport above), so the stated efficiency is not applied a second time.
        electrodeReactions(input, state, a, c, dne, input.anode.kind === 'chlorine' && divided && sep === 'cation-exchange' ? 1 : step.efficiency)
        runElectrons += dne
        if (divided && sep === 'diaphragm') mix(a, c, dt, state.mixedIn)
        for (let k = 0; k < sols.length; k++) {
          const s = sols[k]
          equilibrate(s, dt, state.T, state.gases)
          const crystallised = precipitate(s, state.T)
          for (let i = 0; i < crystallised.length; i++) {
            const salt = crystallised[i]
            event('saturated', `sat:${s.name}:${salt}`, time, step.line, `${prettyFormula(salt)} reaches saturation in ${s.name} and starts to crystallise`, s.name)
          }
        }
        // Heat: (U − E_tn)·I·dt into the contents, unless cooled.
        if (!input.cooled && step.voltageV !== undefined && input.thermoneutralV !== undefined) {
          const mass = sols.reduce((m, s) => m + s.massG(), 0)
          if (mass > 0) state.T += ((step.voltageV - input.thermoneutralV) * dne * FARADAY) / (mass * HEAT_CAPACITY)
          if (state.T - 273.15 > 95) event('temperature', 'boil', time, step.line, `the contents pass 95 °C without cooling: the cell would boil`)
          // Boiling takes up the heat from there on (at about 1 atm; the water lost is not counted).
          state.T = Math.min(state.T, 373.15)
        }
        // Events.
        if (feedCations > 0 && cationCharge(a, false) < 0.01 * feedCations) {
          event('feed-exhausted', 'feed', time, step.line, `the cations of ${a.name} are used up: protons carry the current from here on`, a.name)
        }
        if (depIon && depInitial > 0 && c.get(depIon) < 0.01 * depInitial) {
          event('feed-exhausted', 'metal', time, step.line, `${prettyFormula(depIon)} in ${c.name} is used up: the cathode evolves hydrogen from here on`, c.name)
        }
        if (chlorideInitial > 0 && a.get('Cl^-') < 0.01 * chlorideInitial) {
          event('feed-exhausted', 'chloride', time, step.line, `the chloride in ${a.name} is used up: the anode evolves oxygen from here on`, a.name)
        }
        for (let k = 0; k < sols.length; k++) {
          const s = sols[k]
          const ph = s.ph()
          const before = lastPh.get(s.name)!
          if (before >= 7 && ph < 7) event('ph', `acid:${s.name}`, time, step.line, `${s.name} turns acidic (pH ${ph.toFixed(1)})`, s.name)
          if (before <= 7 && ph > 7) event('ph', `base:${s.name}`, time, step.line, `${s.name} turns alkaline (pH ${ph.toFixed(1)})`, s.name)
          if (before >= 2 && ph < 2) event('ph', `strong:${s.name}`, time, step.line, `${s.name} falls below pH 2`, s.name)
          lastPh.set(s.name, ph)
        }
        for (let k = 0; k < input.targets.length; k++) {
          const t = input.targets[k]
          const s = byName.get(t.compartment)
          const p = s?.productOf(t.formula)
          if (!s || !p) continue
          const v = t.kind === 'wt%' ? (100 * p.mol * p.mass) / s.massG() : p.mol / s.volumeL()
          if (v >= t.value) event('target-reached', `target:${t.line}`, time, step.line, `${prettyFormula(t.formula)} reaches ${t.value} ${t.kind} in ${t.compartment}`, t.compartment)
        }
        if (time >= nextSeries) {
          result.series.push(point(time, state, main, sols, running()))
          nextSeries = time + seriesEvery
        }
      }
    }
    const formed = main ? main.measure(state) - stepStart : 0
    const eff = stepElectrons > 0 && main ? (formed * main.electrons) / stepElectrons : 0
    if (stepElectrons > 0 && main && eff < input.efficiencyFloor) {
      event('efficiency', `eff:${step.line}`, time, step.line, `the current efficiency for ${prettyFormula(main.formula)} falls to ${(eff * 100).toFixed(0)} % in this step`)
    }
    result.steps.push({
      line: step.line,
      endTime: time,
      electronMol: stepElectrons,
      product: main ? { formula: main.formula, mol: formed, efficiency: eff } : undefined,
      compartments: sols.map((s) => s.snapshot(main && s.name === main.compartment ? main.formula : undefined)),
      gases: { ...state.gases },
      temperatureK: state.T,
    })
  }
  result.series.push(point(time, state, main, sols, running()))
  result.final = sols.map((s) => s.snapshot(main && s.name === main.compartment ? main.formula : undefined))
  return result
}

function point(time: number, state: State, main: ReturnType<typeof mainProductOf>, sols: Solution[], efficiency: number): SeriesPoint {
  return {
    time,
    temperatureK: state.T,
    efficiency,
    gases: { ...state.gases },
    compartments: sols.map((s) => {
      const p = main && s.name === main.compartment && main.formula !== 'H2' && main.formula !== 'Cl2' ? s.productOf(main.formula) : undefined
      return {
        name: s.name,
        ph: s.ph(),
        ...(p ? { wtPercent: (100 * p.mol * p.mass) / s.massG(), molPerL: p.mol / s.volumeL() } : {}),
      }
    }),
  }
}

/**
 * The smallest amount (mol) that the next step's reactions draw on, ignoring traces (below
 * `trace` mol), which may run out within one step without harm.
 */
function reactingScale(input: SimInput, a: Solution, c: Solution, depIon: string | undefined, trace: number): number {
  // The smallest of the candidates above the trace and the water's share (Math.min taken pairwise,
  // which is the same as over all at once): no array or closure per time step.
  let scale = Math.max(c.get(WATER), a.get(WATER)) * 0.05
  let v: number
  if (depIon && (v = c.get(depIon) * input.cathode.metal!.charge) > trace) scale = Math.min(scale, v)
  if (input.anode.kind === 'chlorine' && (v = a.get('Cl^-')) > trace) scale = Math.min(scale, v)
  if (a !== c && (v = cationCharge(a)) > trace) scale = Math.min(scale, v)
  if (input.anode.kind === 'oxygen') {
    for (let i = 0; i < OXYGEN_SIDE_ANIONS.length; i++) if ((v = a.get(OXYGEN_SIDE_ANIONS[i])) > trace) scale = Math.min(scale, v)
  }
  return scale
}

const OXYGEN_SIDE_ANIONS = ['CO3^2-', 'HCO3^-', 'OH^-']

/** The charge the cations of a solution carry, mol; with the protons or without them. */
function cationCharge(s: Solution, protons = true): number {
  let t = 0
  for (let i = 0; i < s.keys.length; i++) {
    const k = s.keys[i]
    if (k === WATER || (!protons && k === 'H^+')) continue
    const z = species(k).charge
    if (z > 0) t += s.amt.get(k)! * Math.abs(z)
  }
  return t
}

function electrodeReactions(input: SimInput, st: State, a: Solution, c: Solution, dne: number, eta: number): void {
  const { anode, cathode } = input
  // Cathode.
  let hydrogenE = dne
  if (cathode.kind === 'deposition') {
    const { element: el, charge: z } = cathode.metal!
    const ion = ionKey(el, z)
    const dep = Math.min((Math.min(1, Math.max(0, eta)) * dne) / z, c.get(ion))
    c.add(ion, -dep)
    st.deposits[el] = (st.deposits[el] ?? 0) + dep
    hydrogenE = dne - dep * z
  }
  if (hydrogenE > 0) {
    const fromAcid = Math.min(hydrogenE, c.get('H^+'))
    c.add('H^+', -fromAcid)
    const fromWater = hydrogenE - fromAcid
    c.add(WATER, -fromWater)
    c.add('OH^-', fromWater)
    st.gases.H2 = (st.gases.H2 ?? 0) + hydrogenE / 2
  }
  // Anode.
  let oxygenE = dne
  if (anode.kind === 'dissolution') {
    const { element: el, charge: z } = anode.metal!
    a.add(ionKey(el, z), dne / z)
    st.dissolved[el] = (st.dissolved[el] ?? 0) + dne / z
    oxygenE = 0
  } else if (anode.kind === 'chlorine') {
    const cl2 = Math.min((Math.min(1, Math.max(0, eta)) * dne) / 2, a.get('Cl^-') / 2)
    a.add('Cl^-', -2 * cl2)
    // Chlorine meeting hydroxide in the same solution forms hypochlorite; the rest leaves as gas.
    const hypo = Math.min(cl2, a.get('OH^-') / 2)
    a.add('OH^-', -2 * hypo)
    a.add('ClO^-', hypo)
    a.add('Cl^-', hypo)
    a.add(WATER, hypo)
    st.gases.Cl2 = (st.gases.Cl2 ?? 0) + cl2 - hypo
    oxygenE = dne - 2 * cl2
  }
  if (oxygenE > 0) {
    const fromOH = Math.min(oxygenE, a.get('OH^-'))
    a.add('OH^-', -fromOH)
    a.add(WATER, fromOH / 2)
    const fromWater = oxygenE - fromOH
    a.add(WATER, -fromWater / 2)
    a.add('H^+', fromWater)
    st.gases.O2 = (st.gases.O2 ?? 0) + oxygenE / 4
  }
}

// The separator's carriers of one time step (see transport).
const carrierFromAnode: boolean[] = []
const carrierKey: string[] = []
const carrierZ: number[] = []
const carrierK: number[] = []
let carrierCount = 0
function addCarrier(fromAnode: boolean, key: string, z: number, k: number): void {
  carrierFromAnode[carrierCount] = fromAnode
  carrierKey[carrierCount] = key
  carrierZ[carrierCount] = z
  carrierK[carrierCount] = k
  carrierCount++
}

/** The separator carries dne of charge: ions share it by |z|·c·λ; cations drag water. */
function transport(type: 'cation-exchange' | 'anion-exchange' | 'diaphragm', a: Solution, c: Solution, dne: number, drag: number): boolean {
  const Va = a.volumeL()
  const Vc = c.volumeL()
  let left = dne
  if (type === 'cation-exchange') {
    // Hydroxide leaks back from the catholyte.
    const oh = Math.min(Math.min(0.95, OH_LEAK_PER_MOLAR * c.conc('OH^-', Vc)) * dne, c.get('OH^-'))
    c.add('OH^-', -oh)
    a.add('OH^-', oh)
    left -= oh
  } else if (type === 'anion-exchange') {
    const h = Math.min(Math.min(0.95, H_LEAK_PER_MOLAR * a.conc('H^+', Va)) * dne, a.get('H^+'))
    a.add('H^+', -h)
    c.add('H^+', h)
    left -= h
  }
  // Carriers: cations leave the anode side toward the cathode; anions leave the cathode side. Kept
  // in module-level lists (a count says how many; transport does not call itself): this runs on
  // every time step, and an object per carrier per step was most of the simulation's garbage.
  carrierCount = 0
  if (type !== 'anion-exchange') {
    for (let i = 0; i < a.keys.length; i++) {
      const k = a.keys[i]
      const v = a.amt.get(k)!
      const z = k === WATER ? 0 : species(k).charge
      if (z > 0 && v > 0) addCarrier(true, k, z, z * (v / Va) * lambda(k))
    }
  }
  if (type !== 'cation-exchange') {
    for (let i = 0; i < c.keys.length; i++) {
      const k = c.keys[i]
      const v = c.amt.get(k)!
      const z = k === WATER ? 0 : species(k).charge
      if (z < 0 && v > 0) addCarrier(false, k, -z, -z * (v / Vc) * lambda(k))
    }
  }
  let sum = 0
  for (let i = 0; i < carrierCount; i++) sum = sum + carrierK[i]
  if (sum <= 0 || left <= 0) return false
  let cationEq = 0
  for (let i = 0; i < carrierCount; i++) {
    const from = carrierFromAnode[i] ? a : c
    const to = carrierFromAnode[i] ? c : a
    const key = carrierKey[i]
    const z = carrierZ[i]
    const eq = Math.min((left * carrierK[i]) / sum, from.get(key) * z)
    from.add(key, -eq / z)
    to.add(key, eq / z)
    if (from === a) cationEq += eq
  }
  // Electro-osmotic drag: water moves with the cations.
  const wanted = drag * cationEq
  const water = Math.max(0, Math.min(wanted, a.get(WATER) - 0.1 * a.initialWater))
  a.add(WATER, -water)
  c.add(WATER, water)
  return water < wanted - 1e-12
}

/** A porous diaphragm lets the two solutions mix slowly: ions move down their concentration difference, in neutral pairs of charge. */
function mix(a: Solution, c: Solution, dt: number, mixedIn: Record<string, number>): void {
  const f = 1 - Math.exp(-DIAPHRAGM_MIXING_PER_S * dt)
  const Va = a.volumeL()
  const Vc = c.volumeL()
  const moves: [string, number][] = []
  const keys = new Set([...a.amt.keys(), ...c.amt.keys()])
  for (const k of keys) {
    if (k === WATER) continue
    // Moles from a to c that would even out the concentrations, scaled by f.
    const target = ((a.get(k) + c.get(k)) * Va) / (Va + Vc)
    moves.push([k, (a.get(k) - target) * f])
  }
  // Keep both sides neutral: scale cation and anion moves to the same net charge.
  let plus = 0
  let minus = 0
  for (const [k, n] of moves) {
    const z = species(k).charge
    if (z > 0) plus += z * n
    else if (z < 0) minus += -z * n
  }
  const scaleMinus = minus !== 0 ? plus / minus : 0
  for (const [k, n] of moves) {
    const z = species(k).charge
    const m = z < 0 ? n * scaleMinus : z > 0 && minus === 0 ? 0 : n
    if (m > 0) {
      const x = Math.min(m, a.get(k))
      a.add(k, -x)
      c.add(k, x)
      mixedIn[k] = (mixedIn[k] ?? 0) + x
    } else if (m < 0) {
      const x = Math.min(-m, c.get(k))
      c.add(k, -x)
      a.add(k, x)
      mixedIn[k] = (mixedIn[k] ?? 0) - x
    }
  }
}

/** Elements and charge in the whole system (solutions, solids, gases, deposits) less metal dissolved from the anode: constant through a run. */
export function inventory(r: SimResult): { elements: Record<string, number>; charge: number } {
  const el: Record<string, number> = {}
  let charge = 0
  const addSpecies = (key: string, mol: number) => {
    const s = key === WATER ? species('H2O') : species(key)
    for (const [e, n] of s.counts) el[e] = (el[e] ?? 0) + n * mol
    charge += s.charge * mol
  }
  for (const c of r.final) {
    for (const [k, v] of Object.entries(c.species)) addSpecies(k, v)
    for (const [k, v] of Object.entries(c.solids)) addSpecies(k, v)
  }
  for (const [g, v] of Object.entries(r.gases)) addSpecies(g, v)
  for (const [m, v] of Object.entries(r.deposits)) addSpecies(m, v)
  for (const [m, v] of Object.entries(r.dissolved)) addSpecies(m, -v)
  return { elements: el, charge }
}
