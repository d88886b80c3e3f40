// The model: what a protocol states, with every expression evaluated, and what follows from it
// (charge passed, amounts, concentrations, Faraday limits). Plain data; the rules in ../rules turn
// the facts recorded here into diagnostics, and each Computed value is a hint with its working.
import { FARADAY, GAS_CONSTANT, DEFAULT_PRESSURE_PA, DEFAULT_TEMPERATURE_K, ZERO_CELSIUS, waterDensity } from './constants'
import { KNOWN_GASES, productReaction } from './chemistry'
import { balance, checkBalance, parseReaction, type BalanceCheck, type BalanceResult, type ParsedReaction } from './balance'
import { runEngine, sameSubstance, type EngineResult, type Product, type StepProducts as EngineStep } from './engine'
import { ResultCache } from './memo'
import { cellVoltages, type CellVoltages } from './voltage'
import { simulate, type SimResult, type SimTarget, type StepResult as SimStep } from './simulate'

/** The engine and the simulation for an unchanged chemistry are taken from the last analyses (see memo.ts). */
export const engineRuns = new ResultCache(runEngine)
export const simulationRuns = new ResultCache(simulate)
import { DENSITY_20C, massFractionFromMassConc, massFractionFromMolarity, solutionDensity } from './data/density'
import { SOLUBILITY, solubilityAt } from './data/solubility'
import type { Severity } from './diagnostics'
import type { IncludeOptions, IncludeProblem } from './include'
import { parseFormula, prettyFormula, type Formula } from './formula'
import { type Span, spanOf } from './positions'
import type { ChargeItem, LineNode, SyntaxTree, Tok } from './syntax'
import {
  evaluateExpression,
  fmt,
  formatSettings,
  formatValue,
  gasVolumeText,
  isConstantName,
  isUnitSymbol,
  type ExprFailure,
  type GasUnit,
  type Kind,
  type Value,
  withFormatSettings,
} from './units'

/** One evaluated expression and what was expected of it. */
export interface QuantityFact {
  line: number
  expr: Tok
  /** What the value is for, e.g. "the current of step 1". */
  role: string
  expected: readonly Kind[]
  /** Set when evaluation failed. */
  failure?: ExprFailure
  value?: Value
  kind?: Kind | 'other'
  /** Value in the kind's stored unit (see KIND_UNIT), when the kind is one expected. */
  number?: number
  constraint?: 'positive' | 'non-negative' | 'fraction'
  /** A `let` value: any quantity is fine. */
  anyKind?: boolean
  /** The clause keyword or statement keyword this expression follows (for quick fixes). */
  keyword?: Tok
}

export interface FormulaFact {
  line: number
  tok: Tok
  formula: Formula
  isWater: boolean
}

export interface NameRef {
  line: number
  tok: Tok
  /** What kind of name: a compartment. */
  of: 'compartment'
  resolved: boolean
}

export interface Declaration {
  line: number
  tok: Tok
  of: 'value' | 'compartment'
  /** A value named like a unit (`min`, `h`, `A`): it is not defined, so the unit keeps its meaning. */
  shadowsUnit?: boolean
}

export interface Compartment {
  name: string
  decl: Tok
  line: number
  volumeL?: number
  /** Solutes by formula text (anhydrous part for hydrates). */
  solutes: Map<string, { formula: Formula; mol: number; g: number; approximate: boolean }>
  /** Water mass charged (g), including hydrate water and solution water; undefined when not known. */
  waterG: number
  waterKnown: boolean
  /** Volume of liquid charged (L) where it can be told (water and solutions by volume). */
  chargedVolumeL: number
  lastChargeLine?: number
}

export interface Electrode {
  line: number
  role: 'anode' | 'cathode'
  material: Tok
  compartment: string
  areaCm2?: number
}

export interface Separator {
  line: number
  type: Tok
  between: [string, string]
  areaCm2?: number
  /** Electro-osmotic drag, mol water per mol of charge carried by cations. */
  drag?: number
}

/** A value computed from the protocol, shown as a hint and explained in a hover. */
export interface Computed {
  line: number
  /** What the hover applies to. */
  span: Span
  /** Where the hint goes. */
  anchor: number
  /** Stable key, e.g. "step.charge". */
  key: string
  /** Short label for the hint. */
  label: string
  /** Main value and its unit, for JSON output. */
  value?: number
  unit?: string
  /** Hover title and the working, line by line. */
  title: string
  working: string[]
}

export interface StepFact {
  line: number
  label: string
  span: Span
  currentA?: number
  /** The current clause as written. */
  currentText?: string
  /** Set when the current came from a current density. */
  densityAm2?: number
  voltageV?: number
  seconds?: number
  efficiency: number
  chargeC?: number
  hasCurrentClause: boolean
  hasVoltageClause: boolean
  hasDurationClause: boolean
  usedArea?: { cm2: number; from: string }
  /** Heat released in the step, J: (U − E_tn)·Q, when the voltage is stated. */
  heatJ?: number
  /** A current density was given but the part it refers to has no area to multiply it by. */
  densityWithoutArea?: { span: Span; on: 'anode' | 'cathode' | 'separator' }
}

export interface YieldFact {
  line: number
  kind: 'expect' | 'observe'
  formula: FormulaFact
  compartment?: Tok
  quantity: QuantityFact
  /** Stated amount in mol: what is there after the run (planned or measured). */
  mol?: number
  /** The same substance charged before the run into that compartment, mol (0 for gases). */
  initialMol: number
  /** Stated amount less what was charged: formed by the run, mol. */
  formedMol?: number
  /** The reaction that forms the product, as the engine chose it (or as assumed without a cell). */
  reaction?: { equation: string; reason: string; compartment?: string; gas: boolean; electrons: number }
  noReaction?: string
  /** Where the product forms is not where the line says. */
  wrongCompartment?: { formedIn: string[] }
  /** Theoretical maximum formed, mol: at 100 % efficiency, and with the steps' efficiencies. */
  maxMol100?: number
  maxMolEff?: number
  /** A feed ran out during the run, which caps the maximum. */
  feedLimited?: boolean
  /** For a gas stated by volume: litres per mole at the run's conditions (ideal gas). */
  litresPerMol?: number
}

/** A half-reaction the protocol states for an electrode (`reaction anode: ...`). */
export interface StatedReaction {
  line: number
  role: 'anode' | 'cathode'
  equation: Tok
  parsed: ParsedReaction
  check: BalanceCheck
  /** The balanced form, when the equation as written does not balance and one exists. */
  balanced?: BalanceResult
  /** Electrons on the side that fits the electrode (anode gives them, cathode takes them). */
  electronSide: 'right' | 'left' | 'none' | 'both'
}

/** An amount stated two ways (`260 g (1.88 mol)`), both evaluated. */
export interface TwoWays {
  line: number
  /** The second statement, in parentheses. */
  span: Span
  what: string
  /** Moles from the first statement and from the second. */
  first: number
  second: number
  /** The second statement rewritten from the first, in its own unit. */
  suggestion: string
}

/** A solute charged beyond its solubility in the water of its compartment. */
export interface Undissolved {
  line: number
  span: Span
  compartment: string
  formula: string
  chargedG: number
  dissolvedG: number
  gPer100gWater: number
  celsius: number
  /** Other solutes share the water (common ions lower the solubility further). */
  others: boolean
}

/** A charge item whose amount needed a density v1 does not have (taken as water's). */
export interface Approximation {
  line: number
  span: Span
  /** Estimated mass fraction of the solute, %, to judge how far off the amount may be. */
  massPercent: number
  suggestion: string
}

export interface Model {
  tree: SyntaxTree
  approximations: Approximation[]
  undissolved: Undissolved[]
  twoWays: TwoWays[]
  reactions: StatedReaction[]
  temperatureK: number
  pressurePa: number
  conditionsStated: { temperature: boolean; pressure: boolean }
  values: Map<string, Value>
  declarations: Declaration[]
  refs: NameRef[]
  quantities: QuantityFact[]
  formulas: FormulaFact[]
  compartments: Map<string, Compartment>
  electrodes: Electrode[]
  separators: Separator[]
  vessel?: { line: number; material: Tok }
  steps: StepFact[]
  yields: YieldFact[]
  handling: { line: number; type: Tok; text: Tok }[]
  computed: Computed[]
  /** The chemistry engine's reactions and products (see engine.ts). */
  engine?: EngineResult
  /** Standard reversible and thermoneutral voltages of the chosen reactions (see voltage.ts). */
  voltages?: CellVoltages
  /** The time-stepped simulation of the run (see simulate.ts), when the cell is described. */
  simulation?: SimResult
  /** Concentrations `expect` lines plan for (targets for the simulation). */
  targets: SimTarget[]
  /** Problems with `include` lines, and whether includes were followed at all. */
  includeProblems: IncludeProblem[]
  includesFollowed: boolean
  totals: { chargeC: number; electronMol: number; effectiveElectronMol: number; seconds: number; energyJ?: number }
}

const CM2 = 1 // areas are kept in cm²
/** Liquids charged by volume are taken as measured at room temperature. */
const MEASURING_CELSIUS = 20

export interface ModelOptions {
  /** Report a step whose simulated current efficiency falls below this fraction (default 0.8). */
  efficiencyFloor?: number
  /** Severity per rule code, overriding the rule's default; 'off' drops its findings. */
  severities?: Readonly<Record<string, Severity | 'off'>>
  /** Significant figures in hint labels (default 3). */
  significantFigures?: number
  /** Unit for gas volumes in hint labels (default L). */
  gasUnit?: GasUnit
  /** Where to find included definitions files (see include.ts); without it `include` lines are not followed. */
  includes?: IncludeOptions
  /** Set by analyze(): the first line of the included definitions appended to the document. */
  definitionsFrom?: number
  /** Set by analyze(): what went wrong with the include lines. */
  includeProblems?: IncludeProblem[]
  /** Run conditions assumed when a protocol states none (default 25 °C, 101.325 kPa). */
  defaultTemperatureK?: number
  defaultPressurePa?: number
}

export function buildModel(tree: SyntaxTree, options: ModelOptions = {}): Model {
  const m: Model = {
    tree,
    approximations: [],
    targets: [],
    includeProblems: options.includeProblems ?? [],
    includesFollowed: options.includes !== undefined,
    undissolved: [],
    twoWays: [],
    reactions: [],
    temperatureK: options.defaultTemperatureK ?? DEFAULT_TEMPERATURE_K,
    pressurePa: options.defaultPressurePa ?? DEFAULT_PRESSURE_PA,
    conditionsStated: { temperature: false, pressure: false },
    values: new Map(),
    declarations: [],
    refs: [],
    quantities: [],
    formulas: [],
    compartments: new Map(),
    electrodes: [],
    separators: [],
    steps: [],
    yields: [],
    handling: [],
    computed: [],
    totals: { chargeC: 0, electronMol: 0, effectiveElectronMol: 0, seconds: 0 },
  }
  const ev = new Evaluator(m)

  // Pass 1: named values, in order (a value may use the values defined above it). Included
  // definitions (appended after the document) come first: they are defined before it.
  const from = options.definitionsFrom
  const inOrder = from !== undefined ? [...tree.lines.slice(from), ...tree.lines.slice(0, from)] : tree.lines
  for (let li = 0; li < inOrder.length; li++) {
    const n = inOrder[li]
    if (n.kind !== 'let') continue
    // A unit's name, or a constant's (`pi` always means π in an expression): the value would be ignored.
    const shadowsUnit = isUnitSymbol(n.name.text) || isConstantName(n.name.text)
    m.declarations.push({ line: n.line, tok: n.name, of: 'value', ...(shadowsUnit ? { shadowsUnit } : {}) })
    const q = ev.quantity(n, n.expr, `the value of \`${n.name.text}\``, ANY_KIND)
    q.anyKind = true
    if (q.value !== undefined && !m.values.has(n.name.text) && !shadowsUnit) m.values.set(n.name.text, q.value)
  }
  // Pass 2: conditions and the cell.
  for (let li = 0; li < tree.lines.length; li++) {
    const n = tree.lines[li]
    if (n.kind === 'conditions') ev.conditions(n)
    else if (n.kind === 'compartment') {
      m.declarations.push({ line: n.line, tok: n.name, of: 'compartment' })
      const q = ev.quantity(n, n.volume, `the volume of compartment \`${n.name.text}\``, ['volume'], 'positive')
      if (!m.compartments.has(n.name.text)) {
        m.compartments.set(n.name.text, {
          name: n.name.text,
          decl: n.name,
          line: n.line,
          ...(q.number !== undefined ? { volumeL: q.number } : {}),
          solutes: new Map(),
          waterG: 0,
          waterKnown: true,
          chargedVolumeL: 0,
        })
      }
    } else if (n.kind === 'vessel') {
      m.vessel = { line: n.line, material: n.material }
    }
  }
  for (let li = 0; li < tree.lines.length; li++) {
    const n = tree.lines[li]
    if (n.kind === 'separator') {
      const [a, b] = n.between
      ev.ref(n.line, a)
      ev.ref(n.line, b)
      const area = n.area ? ev.quantity(n, n.area, 'the separator area', ['area'], 'positive').number : undefined
      const drag = n.drag ? ev.quantity(n, n.drag, 'the electro-osmotic drag (mol water per mol cation)', ['dimensionless'], 'non-negative').number : undefined
      m.separators.push({
        line: n.line,
        type: n.type,
        between: [a.text, b.text],
        ...(area !== undefined ? { areaCm2: area * CM2 } : {}),
        ...(drag !== undefined && drag >= 0 ? { drag } : {}),
      })
    } else if (n.kind === 'electrode') {
      ev.ref(n.line, n.compartment)
      const area = n.area ? ev.quantity(n, n.area, `the ${n.role} area`, ['area'], 'positive').number : undefined
      m.electrodes.push({
        line: n.line,
        role: n.role,
        material: n.material,
        compartment: n.compartment.text,
        ...(area !== undefined ? { areaCm2: area } : {}),
      })
    }
  }
  // Pass 3: charges, steps, yields, handling.
  for (let li = 0; li < tree.lines.length; li++) {
    const n = tree.lines[li]
    if (n.kind === 'charge') ev.charge(n)
    else if (n.kind === 'step') ev.step(n)
    else if (n.kind === 'handling') m.handling.push({ line: n.line, type: n.type, text: n.text })
    else if (n.kind === 'reaction') m.reactions.push(statedReaction(n))
  }
  ev.compartmentSummaries()
  ev.stepTotals()
  ev.chemistry()
  for (let li = 0; li < tree.lines.length; li++) {
    const n = tree.lines[li]
    if (n.kind === 'expect' || n.kind === 'observe') ev.yieldLine(n)
  }
  ev.simulation(options.efficiencyFloor ?? 0.8)
  ev.simulatedYields()
  return m
}

const ANY_KIND: readonly Kind[] = [
  'dimensionless',
  'mass',
  'amount',
  'volume',
  'area',
  'length',
  'current',
  'current-density',
  'voltage',
  'time',
  'charge',
  'temperature',
  'pressure',
  'molarity',
  'mass-concentration',
  'mass-fraction',
  'energy',
  'power',
  'molar-mass',
]

const WATER_NAMES = new Set(['water', 'H2O'])

// The kinds each statement expects, shared (a fact refers to its list; no list per fact).
const CURRENT_KINDS: readonly Kind[] = ['current', 'current-density']
const VOLTAGE_KINDS: readonly Kind[] = ['voltage']
const TIME_KINDS: readonly Kind[] = ['time']
const FRACTION_KINDS: readonly Kind[] = ['dimensionless']
const GAS_AMOUNT_KINDS: readonly Kind[] = ['mass', 'amount', 'volume']
const PLANNED_AMOUNT_KINDS: readonly Kind[] = ['mass', 'amount', 'mass-fraction', 'molarity']
const AMOUNT_KINDS: readonly Kind[] = ['mass', 'amount']

/**
 * Writes a hint's label or working when it is first read, from the inputs the hint was made with
 * (a fact it shows) and the evaluator that made it. Writers are module-level functions, shared by
 * every hint of their kind: a long protocol's hints hold data, not a closure and its context each.
 */
type Write<T, R> = (inputs: T, ev: Evaluator) => R

/** A hint as the evaluator makes it: label and working may be given as writers (or functions), run when first read. */
interface HintSpec<T = undefined> {
  key: string
  label: string | Write<T, string>
  value?: number
  unit?: string
  title: string
  working: string[] | Write<T, string[]>
  /** What the writers are given (with the evaluator). */
  inputs?: T
}

/**
 * A computed value whose label and working may be written when first read (they are getters):
 * an editor shows the hints of the lines in view and the hover under the pointer, not all of a long
 * protocol's on every keystroke. They are written in the formatting settings of the analysis that
 * made the value. In JSON it is the same as a plain Computed, with the keys in the same order.
 */
class DeferredComputed implements Computed {
  readonly line: number
  readonly span: Span
  readonly anchor: number
  readonly key: string
  readonly value?: number
  readonly unit?: string
  readonly title: string
  #label: string | Write<unknown, string>
  #working: string[] | Write<unknown, string[]>
  /** The writers' inputs and evaluator, let go once both are written. */
  #inputs: unknown
  #ev: Evaluator | undefined
  /** The formatting settings in force when the value was computed (see formatSettings). */
  readonly #settings: number

  constructor(at: { line: number; span: Span }, c: HintSpec<unknown>, ev: Evaluator) {
    this.line = at.line
    this.span = at.span
    this.anchor = at.span.end
    this.key = c.key
    if (c.value !== undefined) this.value = c.value
    if (c.unit !== undefined) this.unit = c.unit
    this.title = c.title
    this.#label = c.label
    this.#working = c.working
    this.#inputs = c.inputs
    this.#ev = ev
    this.#settings = formatSettings()
  }

  get label(): string {
    const f = this.#label
    if (typeof f === 'function') {
      this.#label = withFormatSettings(this.#settings, () => f(this.#inputs, this.#ev!))
      this.#release()
    }
    return this.#label as string
  }

  get working(): string[] {
    const f = this.#working
    if (typeof f === 'function') {
      this.#working = withFormatSettings(this.#settings, () => f(this.#inputs, this.#ev!))
      this.#release()
    }
    return this.#working as string[]
  }

  #release(): void {
    if (typeof this.#label !== 'function' && typeof this.#working !== 'function') {
      this.#inputs = undefined
      this.#ev = undefined
    }
  }

  toJSON(): Computed {
    return {
      line: this.line,
      span: this.span,
      anchor: this.anchor,
      key: this.key,
      label: this.label,
      ...(this.value !== undefined ? { value: this.value } : {}),
      ...(this.unit !== undefined ? { unit: this.unit } : {}),
      title: this.title,
      working: this.working,
    }
  }
}

// ---------------------------------------------------------------------------------------------
// Hint writers: the labels and workings of the hints every step and yield line has, written from
// the fact they show when first read (see DeferredComputed). They compute from the same fields, in
// the same order, as the analysis did.

/** A charged step's charge as its hint shows it: Q, in A·h, in mol e⁻, its energy and (on the last step) the run's sum. */
function stepCharge(s: StepFact, ev: Evaluator) {
  const Q = s.chargeC!
  return { Q, Ah: Q / 3600, ne: Q / FARADAY, E: s.voltageV !== undefined ? s.voltageV * Q : undefined, sum: ev.runSumOf(s) }
}

function stepChargeLabel(s: StepFact, ev: Evaluator): string {
  const { Ah, ne, E, sum } = stepCharge(s, ev)
  const parts = [`${fmt(Ah)} A·h`, `${fmt(ne)} mol e⁻`]
  if (s.usedArea) parts.unshift(`${fmt(s.currentA!)} A`)
  // Current density over each part with an area; the hint shows the reference one (cathode).
  const ref = s.usedArea ?? ev.referenceArea()
  if (ref && s.densityAm2 === undefined) parts.push(`${fmt((s.currentA! / ref.cm2) * 1000)} mA/cm²`)
  if (E !== undefined) parts.push(`${fmt(E / 3600)} W·h`)
  if (sum) parts.push(`Σ ${fmt(sum.chargeC / 3600)} A·h`)
  return parts.join(' · ')
}

function stepChargeWorking(s: StepFact, ev: Evaluator): string[] {
  const { Q, Ah, ne, E, sum } = stepCharge(s, ev)
  const eff = Math.min(Math.max(s.efficiency, 0), 1)
  const w = [
    s.densityAm2 !== undefined && s.usedArea
      ? `I = j·A = ${fmt(s.densityAm2 / 10, 4)} mA/cm² × ${fmt(s.usedArea.cm2, 4)} cm² (${s.usedArea.from}) = ${fmt(s.currentA!, 4)} A`
      : s.currentText && !/^\s*[\d.]+\s*A\s*$/.test(s.currentText)
        ? `I = ${s.currentText} = ${fmt(s.currentA!, 4)} A`
        : `I = ${fmt(s.currentA!, 4)} A`,
    `Q = I·t = ${fmt(s.currentA!, 4)} A × ${formatDuration(s.seconds!)} = ${fmt(Ah, 4)} A·h = ${fmt(Q, 4)} C`,
    `n(e⁻) = Q/F = ${fmt(Q, 4)} C ÷ ${fmt(FARADAY, 9)} C/mol = ${fmt(ne, 4)} mol`,
  ]
  if (eff < 1) w.push(`at ${fmt(eff * 100)} % current efficiency: ${fmt(ne * eff, 4)} mol e⁻ go to the product`)
  for (const on of ['cathode', 'anode', 'separator'] as const) {
    const a = ev.referenceArea(on)
    if (!a) continue
    const j = (s.currentA! / a.cm2) * 1000
    w.push(`j = I/A = ${fmt(s.currentA!, 4)} A ÷ ${fmt(a.cm2, 4)} cm² (${a.from}) = ${fmt(j, 4)} mA/cm²`)
  }
  if (E !== undefined) w.push(`E = U·Q = ${fmt(s.voltageV!, 4)} V × ${fmt(Ah, 4)} A·h = ${fmt(E / 3600, 4)} W·h`)
  if (sum) w.push(`all steps: Q = ${fmt(sum.chargeC / 3600, 4)} A·h = ${fmt(sum.chargeC, 4)} C, n(e⁻) = ${fmt(sum.electronMol, 4)} mol`)
  return w
}

/** A step's products (from the engine) and the step itself, as the products hint shows them. */
interface ProductsHint {
  sp: EngineStep
  step: StepFact | undefined
}

/** The energy parts of a step's products hint (specific energy, heat) and their working. */
function stepEnergy(x: ProductsHint, ev: Evaluator): { parts: string[]; lines: string[] } {
  const step = x.step
  const parts: string[] = []
  const lines: string[] = []
  if (step?.voltageV !== undefined && step.chargeC !== undefined) {
    const E = step.voltageV * step.chargeC
    const main = mainProduct(x.sp.products)
    if (main) {
      const M = parseFormula(main.formula).molarMass
      const kg = (main.mol * M) / 1000
      if (kg > 0) {
        const specific = E / 3.6e6 / kg
        parts.push(`${fmt(specific)} kWh/kg ${prettyFormula(main.formula)}`)
        lines.push(`specific energy = E/m = ${fmt(E / 3600, 4)} W·h ÷ ${fmt(kg * 1000, 4)} g ${prettyFormula(main.formula)} = ${fmt(specific, 4)} kWh/kg`)
      }
    }
    const v = ev.m.voltages
    if (v) {
      const heat = step.heatJ!
      parts.push(`heat ${fmt(heat / 3600)} W·h`)
      lines.push(`heat = (U − E_tn)·Q = (${fmt(step.voltageV, 4)} − ${fmt(v.thermoneutral, 4)}) V × ${fmt(step.chargeC / 3600, 4)} A·h = ${fmt(heat / 3600, 4)} W·h${heat < 0 ? ' (the cell takes heat in)' : ''}`)
    }
  }
  return { parts, lines }
}

function stepProductsLabel(x: ProductsHint, ev: Evaluator): string {
  const sp = x.sp
  const Vm = ev.litresPerMol()
  // Solid and dissolved products first (usually the point of the run), then the gases.
  const shown = [...sp.products].sort((a, b) => Number(a.gas) - Number(b.gas))
  return (
    '→ ' +
    [...shown.map((p) => `${amountText(p, p.mol, Vm)} ${prettyFormula(p.formula)}`), ...stepEnergy(x, ev).parts].join(' · ') +
    (sp.notes.length ? ' · ⚠ ' + sp.notes.length : '')
  )
}

function stepProductsWorking(x: ProductsHint, ev: Evaluator): string[] {
  const sp = x.sp
  const Vm = ev.litresPerMol()
  return [
    ...sp.products.map((p) => `${prettyFormula(p.formula)} in ${p.compartment}: ${fmt(p.mol, 4)} mol = ${amountText(p, p.mol, Vm, 4)}  (${p.equation})`),
    ...stepEnergy(x, ev).lines,
    ...sp.notes.map((n) => `⚠ ${n}`),
  ]
}

function stepSimLabel(st: SimStep, ev: Evaluator): string {
  const m = ev.m
  const main = m.simulation!.mainProduct
  const snap = main ? st.compartments.find((c) => c.name === main.compartment) : undefined
  const parts: string[] = []
  if (snap?.main && main && main.formula !== 'H2' && main.formula !== 'Cl2') parts.push(`${fmt(snap.main.wtPercent)} wt% ${prettyFormula(snap.main.formula)} in ${snap.name}`)
  if (st.product) parts.push(`CE ${fmt(st.product.efficiency * 100)} %`)
  for (const c of st.compartments) parts.push(`pH ${c.ph.toFixed(1)} ${c.name}`)
  if (Math.abs(st.temperatureK - m.temperatureK) > 0.5) parts.push(`${fmt(st.temperatureK - ZERO_CELSIUS)} °C`)
  return `sim: ${parts.join(' · ')}`
}

function stepSimWorking(st: SimStep, ev: Evaluator): string[] {
  const m = ev.m
  return [
    `after ${formatDuration(st.endTime)} of the run${st.product ? `; ${prettyFormula(st.product.formula)} formed in the step: ${fmt(st.product.mol, 4)} mol, current efficiency ${fmt(st.product.efficiency * 100, 3)} %` : ''}`,
    ...st.compartments.map(
      (c) =>
        `${c.name}: ${fmt(c.volumeL * 1000, 4)} mL, ${fmt(c.massG, 4)} g, pH ${c.ph.toFixed(2)}` +
        (c.main ? `, ${prettyFormula(c.main.formula)} ${fmt(c.main.wtPercent, 3)} wt% = ${fmt(c.main.molPerL, 3)} mol/L` : '') +
        (Object.keys(c.solids).length ? `, solid: ${Object.entries(c.solids).map(([k, x]) => `${fmt(x, 3)} mol ${prettyFormula(k)}`).join(', ')}` : ''),
    ),
    `gases so far: ${Object.entries(st.gases).map(([g, x]) => `${fmt(x * ev.litresPerMol(), 4)} L ${prettyFormula(g)}`).join(', ') || 'none'}`,
    `temperature ${fmt(st.temperatureK - ZERO_CELSIUS, 3)} °C${m.handling.some((h) => h.type.text === 'cooling') ? ' (cooling declared: held)' : ''}`,
    'simulation: ions share the current through the separator by |z|·c·λ; see the README for its assumptions',
  ]
}

/** A planned or measured yield as its hints show it: the fact, and what the yield line worked out with it. */
interface YieldHint {
  y: YieldFact
  /** Molar mass, g/mol, and molar gas volume, L/mol. */
  M: number
  Vm: number
  gas: boolean
  /** The formula as shown. */
  pf: string
  /** The compartment whose charge the stated amount includes. */
  where: Compartment | undefined
}

/** An amount of the yield's substance in the unit its line states it in. */
function yieldShown(x: YieldHint, mol: number): string {
  const kind = x.y.quantity.kind
  return kind === 'volume' ? gasVolumeText(mol * x.Vm) : kind === 'amount' ? `${fmt(mol)} mol` : `${fmt(mol * x.M)} g`
}

function expectMaxLabel(x: YieldHint): string {
  const y = x.y
  const initialMol = y.initialMol
  const maxMolEff = y.maxMolEff!
  const formedMol = y.formedMol
  return (
    `max ${yieldShown(x, initialMol + maxMolEff)}` +
    (initialMol > 0 ? ` incl. ${yieldShown(x, initialMol)} charged` : '') +
    (y.feedLimited ? ' (feed-limited)' : '') +
    (formedMol !== undefined && formedMol >= 0 && maxMolEff > 0 ? ` · plan ${fmt((100 * formedMol) / maxMolEff)} % of max` : '')
  )
}

function yieldWorking(x: YieldHint, ev: Evaluator): string[] {
  const { y, M, Vm, pf } = x
  const m = ev.m
  const reaction = y.reaction!
  const maxMolEff = y.maxMolEff!
  const initialMol = y.initialMol
  const w = [
    `${reaction.equation}  (${reaction.reason})`,
    `n(e⁻) = ${fmt(m.totals.electronMol, 4)} mol over all steps`,
    `${pf} formed: ${fmt(maxMolEff, 4)} mol = ${fmt(maxMolEff * M, 4)} g at the steps' efficiencies${y.feedLimited ? ' and with the feed running out' : ''}; Faraday's law for the whole charge: n(e⁻)/${fmt(reaction.electrons, 4)} = ${fmt(y.maxMol100!, 4)} mol`,
  ]
  if (x.gas) {
    w.push(`gas volume at ${fmt(m.temperatureK - ZERO_CELSIUS)} °C and ${fmt(m.pressurePa / 1000, 5)} kPa: V = nRT/p = ${fmt(maxMolEff * Vm, 4)} L (dry ideal gas; gas over the hot electrolyte also carries water vapour)`)
  }
  if (y.feedLimited) w.push(...m.engine!.steps.flatMap((s) => s.notes.map((n) => `⚠ step on line ${s.line + 1}: ${n}`)))
  if (initialMol > 0) w.push(`charged before the run into ${x.where!.name}: ${fmt(initialMol, 4)} mol = ${fmt(initialMol * M, 4)} g; the stated amount includes it`)
  return w
}

function observeEfficiencyLabel(x: YieldHint): string {
  return `current efficiency ${fmt((x.y.formedMol! / x.y.maxMol100!) * 100)} %`
}

function observeEfficiencyWorking(x: YieldHint, ev: Evaluator): string[] {
  const y = x.y
  const formedMol = y.formedMol!
  const initialMol = y.initialMol
  const ce = formedMol / y.maxMol100!
  return [
    ...yieldWorking(x, ev),
    `current efficiency = formed ÷ (n(e⁻)/${fmt(y.reaction!.electrons, 4)}) = ` +
      (initialMol > 0 ? `(${fmt(y.mol!, 4)} − ${fmt(initialMol, 4)}) mol` : `${fmt(formedMol, 4)} mol`) +
      ` ÷ ${fmt(y.maxMol100!, 4)} mol = ${fmt(ce * 100, 3)} %`,
  ]
}

/** The simulation's main product against a planned or measured yield of it. */
/** The simulation's main product over the run: its molar mass, mol formed, electrons passed and current efficiency (%). */
function simulatedMain(ev: Evaluator) {
  const main = ev.m.simulation!.mainProduct!
  const { formed, electrons } = ev.simSums!
  return { main, M: parseFormula(main.formula).molarMass, formed, electrons, ce: electrons > 0 ? ((formed * main.electrons) / electrons) * 100 : 0 }
}

function yieldSimLabel(y: YieldFact, ev: Evaluator): string {
  const { M, formed, ce } = simulatedMain(ev)
  return y.kind === 'expect' ? `sim: ${fmt((formed + y.initialMol) * M)} g at CE ${fmt(ce)} %` : `sim CE ${fmt(ce)} %`
}

function yieldSimWorking(y: YieldFact, ev: Evaluator): string[] {
  const { main, M, formed, electrons, ce } = simulatedMain(ev)
  return [
    `simulated ${prettyFormula(main.formula)} formed: ${fmt(formed, 4)} mol = ${fmt(formed * M, 4)} g` + (y.initialMol > 0 ? `, plus ${fmt(y.initialMol * M, 4)} g charged` : ''),
    `simulated current efficiency: ${fmt(formed, 4)} mol × ${main.electrons} ÷ ${fmt(electrons, 4)} mol e⁻ = ${fmt(ce, 3)} %`,
  ]
}

class Evaluator {
  constructor(readonly m: Model) {}

  /** The run's totals as the last charged step's hover shows them (when more than one step is charged). */
  private runSum: { step: StepFact; chargeC: number; electronMol: number } | undefined
  /** The main product the simulation formed over the run, mol, and the electrons it passed, mol. */
  simSums: { formed: number; electrons: number } | undefined
  runSumOf(s: StepFact): { chargeC: number; electronMol: number } | undefined {
    return this.runSum?.step === s ? this.runSum : undefined
  }

  /**
   * A computed value shown at the end of a statement (its hint) and explained over it (its hover).
   * The working may be given as a function: it is then written only when it is first read (a hover,
   * a report), not on every keystroke for every step of a long protocol.
   */
  private hintAt<T = undefined>(at: { line: number; span: Span }, c: HintSpec<T>): void {
    const { label, working } = c
    if (typeof label === 'function' || typeof working === 'function') this.m.computed.push(new DeferredComputed(at, c as HintSpec<unknown>, this))
    else {
      const { inputs: _, ...shown } = c
      this.m.computed.push({ line: at.line, span: at.span, anchor: at.span.end, ...shown, label, working })
    }
  }

  quantity(
    n: LineNode,
    expr: Tok,
    role: string,
    expected: readonly Kind[],
    constraint?: QuantityFact['constraint'],
    keyword?: Tok,
  ): QuantityFact {
    const r = evaluateExpression(expr.text, this.m.values)
    // Every field written at once (one layout for all facts); absent ones are undefined.
    const fact: QuantityFact = {
      line: n.line,
      expr,
      role,
      expected,
      constraint,
      keyword,
      failure: undefined,
      value: undefined,
      kind: undefined,
      number: undefined,
      anyKind: undefined,
    }
    if (!r.ok) {
      fact.failure = r.failure
    } else {
      fact.value = r.value
      fact.kind = r.kind
      if (r.kind !== 'other' && expected.includes(r.kind)) fact.number = r.number
    }
    this.m.quantities.push(fact)
    return fact
  }

  ref(line: number, tok: Tok): boolean {
    const resolved = this.m.compartments.has(tok.text)
    this.m.refs.push({ line, tok, of: 'compartment', resolved })
    return resolved
  }

  formula(line: number, tok: Tok): FormulaFact {
    // A state symbol (`NaCl(aq)`, `H2(g)`) says nothing the analysis needs: read the formula without it.
    const state = /\((aq|s|l|g)\)$/.exec(tok.text)
    const bare: Tok = state ? { text: tok.text.slice(0, state.index), start: tok.start, end: tok.start + state.index } : tok
    const isWater = WATER_NAMES.has(bare.text)
    const f: FormulaFact = { line, tok: bare, formula: parseFormula(isWater ? 'H2O' : bare.text), isWater }
    this.m.formulas.push(f)
    return f
  }

  conditions(n: Extract<LineNode, { kind: 'conditions' }>): void {
    for (const item of n.items) {
      const q = this.quantity(n, item, 'a run condition (temperature or pressure)', ['temperature', 'pressure'])
      if (q.number === undefined) continue
      if (q.kind === 'temperature') {
        q.constraint = 'positive'
        this.m.temperatureK = q.number
        this.m.conditionsStated.temperature = true
      } else if (q.kind === 'pressure') {
        q.constraint = 'positive'
        this.m.pressurePa = q.number
        this.m.conditionsStated.pressure = true
      }
    }
  }

  charge(n: Extract<LineNode, { kind: 'charge' }>): void {
    const known = this.ref(n.line, n.compartment)
    const comp = known ? this.m.compartments.get(n.compartment.text) : undefined
    // Liquids are measured out at room temperature, whatever the run's temperature: 20 °C.
    const rhoW = waterDensity(MEASURING_CELSIUS) // g/mL
    for (const item of n.items) {
      const ff = this.formula(n.line, item.formula)
      const f = ff.formula
      const r = item.concentration ? this.solutionItem(n, item, ff, rhoW) : this.plainItem(n, item, ff, rhoW)
      if (item.alternate) {
        this.alternate(n, item.alternate, r?.mol, f.molarMass, ff.isWater ? ['mass', 'amount', 'volume'] : ['mass', 'amount'], rhoW, `${ff.isWater ? 'water' : item.formula.text} charged`)
      }
      if (!r) continue
      // A hint after each item, not at the end of the line.
      this.m.computed.push({
        line: n.line,
        span: item.span,
        anchor: item.span.end,
        key: 'charge.item',
        label: r.label,
        value: r.mol,
        unit: 'mol',
        title: `${prettyFormula(ff.isWater ? 'H2O' : item.formula.text)} charged`,
        working: r.working,
      })
      if (!comp) continue
      comp.lastChargeLine = n.line
      comp.chargedVolumeL += r.volumeL ?? 0
      if (r.waterG === undefined) comp.waterKnown = false
      else comp.waterG += r.waterG
      if (!ff.isWater && f.ok && r.mol !== undefined) {
        const key = anhydrousKey(f)
        const prev = comp.solutes.get(key.text)
        const solG = r.mol * key.mass
        comp.solutes.set(key.text, {
          formula: key.formula,
          mol: (prev?.mol ?? 0) + r.mol,
          g: (prev?.g ?? 0) + solG,
          approximate: (prev?.approximate ?? false) || r.approximate,
        })
      }
    }
  }

  /** `FORMULA QUANTITY`: a solid by mass or amount, or water by volume or mass. */
  private plainItem(n: LineNode, item: ChargeItem, ff: FormulaFact, rhoW: number): ItemResult | undefined {
    const f = ff.formula
    const kinds: Kind[] = ff.isWater ? ['volume', 'mass', 'amount'] : ['mass', 'amount']
    const what = ff.isWater ? 'water' : item.formula.text
    const q = this.quantity(n, item.quantity, `the amount of ${what}`, kinds, 'positive')
    if (q.number === undefined) return undefined
    const M = f.molarMass
    const pf = prettyFormula(ff.isWater ? 'H2O' : item.formula.text)
    const given = formatValue(q.value!)
    if (q.kind === 'volume') {
      const g = q.number * 1000 * rhoW
      const mol = g / M
      return {
        mol,
        waterG: g,
        volumeL: q.number,
        approximate: false,
        label: `${fmt(g)} g · ${fmt(mol)} mol`,
        working: [
          `m = V·ρ = ${given} × ${fmt(rhoW, 5)} g/mL (water measured at ${MEASURING_CELSIUS} °C) = ${fmt(g, 4)} g`,
          `n = m/M = ${fmt(g, 4)} g ÷ ${fmt(M, 5)} g/mol = ${fmt(mol, 4)} mol`,
        ],
      }
    }
    if (!f.ok || !Number.isFinite(M)) return undefined
    if (q.kind === 'mass') {
      const mol = q.number / M
      const hydrate = f.hydrateWater > 0 ? f.hydrateWater * mol * WATER_M() : 0
      return {
        mol,
        waterG: ff.isWater ? q.number : hydrate,
        approximate: false,
        label: `${fmt(mol)} mol`,
        working: [
          `n = m/M = ${given} ÷ ${fmt(M, 5)} g/mol = ${fmt(mol, 4)} mol ${pf}`,
          ...(f.hydrateWater > 0 ? [`of which water of crystallisation: ${f.hydrateWater} × ${fmt(mol, 4)} mol × 18.015 g/mol = ${fmt(hydrate, 4)} g`] : []),
        ],
      }
    }
    // amount
    const g = q.number * M
    const hydrate = f.hydrateWater > 0 ? f.hydrateWater * q.number * WATER_M() : 0
    return {
      mol: q.number,
      waterG: ff.isWater ? g : hydrate,
      approximate: false,
      label: `${fmt(g)} g`,
      working: [`m = n·M = ${given} × ${fmt(M, 5)} g/mol = ${fmt(g, 4)} g ${pf}`],
    }
  }

  /** `FORMULA solution QUANTITY at CONCENTRATION`. */
  private solutionItem(n: LineNode, item: ChargeItem, ff: FormulaFact, rhoW: number): ItemResult | undefined {
    const f = ff.formula
    const what = item.formula.text
    const q = this.quantity(n, item.quantity, `the amount of ${what} solution`, ['volume', 'mass'], 'positive')
    const c = this.quantity(
      n,
      item.concentration!,
      `the concentration of the ${what} solution`,
      ['molarity', 'mass-concentration', 'mass-fraction'],
      'positive',
    )
    if (q.number === undefined || c.number === undefined || !f.ok) return undefined
    const M = f.molarMass
    const given = formatValue(q.value!)
    const conc = formatValue(c.value!)
    const working: string[] = []
    let soluteG: number
    let solutionG: number | undefined
    let approximate = false
    let volumeL: number | undefined
    // The solution's density from the 20 °C table, at a mass fraction w (%): exact where the table
    // covers it, else water's density with the result marked approximate.
    const table = DENSITY_20C[anhydrousKey(f).text]
    const tableNote = table ? ` (20 °C; ${table.source})` : ''
    const densityAt = (w: number | undefined) => {
      const d = w === undefined ? undefined : solutionDensity(anhydrousKey(f).text, w)
      return d && !d.extrapolated ? d.gPerMl : undefined
    }
    const wFromConc = (): number | undefined =>
      c.kind === 'molarity' ? massFractionFromMolarity(anhydrousKey(f).text, c.number!, anhydrousKey(f).mass) : c.kind === 'mass-concentration' ? massFractionFromMassConc(anhydrousKey(f).text, c.number!) : c.number!
    const w = table ? wFromConc() : c.kind === 'mass-fraction' ? c.number : undefined
    const rho = densityAt(w)
    if (q.kind === 'volume') {
      volumeL = q.number
      if (c.kind === 'molarity') {
        soluteG = q.number * c.number * M
        working.push(`n = V·c = ${given} × ${conc} = ${fmt(q.number * c.number, 4)} mol`)
      } else if (c.kind === 'mass-concentration') {
        soluteG = q.number * c.number
        working.push(`m = V·c = ${given} × ${conc} = ${fmt(soluteG, 4)} g`)
      } else if (rho) {
        solutionG = q.number * 1000 * rho
        soluteG = (solutionG * c.number) / 100
        working.push(`m = V·ρ·w = ${given} × ${fmt(rho, 4)} g/mL${tableNote} × ${conc} = ${fmt(soluteG, 4)} g`)
      } else {
        approximate = true
        solutionG = q.number * 1000 * rhoW
        soluteG = (solutionG * c.number) / 100
        working.push(
          `≈ m = V·ρ·w = ${given} × ${fmt(rhoW, 4)} g/mL × ${conc} = ${fmt(soluteG, 4)} g`,
          'approximate: no density table for this solution, so water\'s density is used; state the solution by mass for an exact figure',
        )
        this.m.approximations.push({ line: n.line, span: item.span, massPercent: c.number, suggestion: 'state the solution by mass' })
      }
      if (solutionG === undefined && rho) {
        solutionG = q.number * 1000 * rho
        working.push(`solution: V·ρ = ${given} × ${fmt(rho, 4)} g/mL${tableNote} = ${fmt(solutionG, 4)} g (${fmt(w!, 3)} wt%)`)
      }
    } else {
      solutionG = q.number
      if (c.kind === 'mass-fraction') {
        soluteG = (q.number * c.number) / 100
        working.push(`m = m_solution·w = ${given} × ${conc} = ${fmt(soluteG, 4)} g`)
        if (rho) volumeL = q.number / rho / 1000
      } else if (rho && w !== undefined) {
        soluteG = (q.number * w) / 100
        volumeL = q.number / rho / 1000
        working.push(`${conc} is ${fmt(w, 4)} wt% at ${fmt(rho, 4)} g/mL${tableNote}: m = ${given} × ${fmt(w, 4)} % = ${fmt(soluteG, 4)} g; V = m/ρ = ${fmt(volumeL * 1000, 4)} mL`)
      } else {
        approximate = true
        volumeL = q.number / rhoW / 1000
        soluteG = c.kind === 'molarity' ? volumeL * c.number * M : volumeL * c.number
        working.push(
          `≈ V = m/ρ = ${given} ÷ ${fmt(rhoW, 4)} g/mL = ${fmt(volumeL * 1000, 4)} mL;  solute ${fmt(soluteG, 4)} g`,
          'approximate: no density table for this solution, so water\'s density is used; state the solution by volume for an exact figure',
        )
        this.m.approximations.push({ line: n.line, span: item.span, massPercent: (100 * soluteG) / q.number, suggestion: 'state the solution by volume' })
      }
    }
    const mol = soluteG / M
    working.push(`n = m/M = ${fmt(soluteG, 4)} g ÷ ${fmt(M, 5)} g/mol = ${fmt(mol, 4)} mol`)
    const waterG = solutionG !== undefined ? solutionG - soluteG : undefined
    if (waterG !== undefined) working.push(`water in the solution: ${fmt(waterG, 4)} g`)
    return {
      mol,
      ...(waterG !== undefined ? { waterG } : {}),
      ...(volumeL !== undefined ? { volumeL } : {}),
      approximate,
      label: `${approximate ? '≈ ' : ''}${fmt(soluteG)} g · ${fmt(mol)} mol ${prettyFormula(what)}`,
      working,
    }
  }

  compartmentSummaries(): void {
    const celsius = this.m.temperatureK - ZERO_CELSIUS
    for (const comp of this.m.compartments.values()) {
      if (comp.lastChargeLine === undefined) continue
      const node = this.m.tree.lines[comp.lastChargeLine]
      const parts: string[] = []
      const working: string[] = []
      let solutesG = 0
      let approx = false
      for (const s of comp.solutes.values()) {
        solutesG += s.g
        approx ||= s.approximate
      }
      const waterKnown = comp.waterKnown && comp.waterG > 0
      // Solubility at the run temperature: what dissolves in the water charged, and what stays solid.
      for (const [text, s] of comp.solutes) {
        const sol = solubilityAt(text, celsius)
        if (!sol || !waterKnown) continue
        const maxG = (sol.gPer100gWater * comp.waterG) / 100
        if (sol.extrapolated) {
          const pts = SOLUBILITY[text].points
          working.push(`solubility of ${prettyFormula(text)}: the table (${SOLUBILITY[text].source}) covers ${pts[0][0]}-${pts[pts.length - 1][0]} °C only; not checked at ${fmt(celsius)} °C`)
          continue
        }
        working.push(
          `solubility of ${prettyFormula(text)} at ${fmt(celsius)} °C: ${fmt(sol.gPer100gWater, 4)} g per 100 g water × ${fmt(comp.waterG, 4)} g water = ${fmt(maxG, 4)} g (${SOLUBILITY[text].source})`,
        )
        if (s.g > maxG) {
          this.m.undissolved.push({ line: node.line, span: node.span, compartment: comp.name, formula: text, chargedG: s.g, dissolvedG: maxG, gPer100gWater: sol.gPer100gWater, celsius, others: comp.solutes.size > 1 })
          parts.push(`${fmt(s.g - maxG)} g ${prettyFormula(text)} undissolved`)
        }
      }
      // Volume of the solution: from the density table for a single solute, else the compartment's.
      const single = comp.solutes.size === 1 ? [...comp.solutes][0] : undefined
      let volumeL = comp.volumeL
      let volumeFrom = comp.volumeL ? `the volume declared for compartment ${comp.name}` : ''
      if (single && waterKnown) {
        const [text, s] = single
        const dissolvedG = Math.min(s.g, this.m.undissolved.find((u) => u.compartment === comp.name && u.formula === text)?.dissolvedG ?? Infinity)
        const total = comp.waterG + dissolvedG
        const w = (100 * dissolvedG) / total
        const rho = solutionDensity(text, w)
        // A saturated solution may lie a little past the table's last point: its end value is within 1 %.
        const last = DENSITY_20C[text]?.points.at(-1)?.[0] ?? 0
        if (rho && (!rho.extrapolated || (w > last && w <= last + 1))) {
          volumeL = total / rho.gPerMl / 1000
          volumeFrom = `the solution's own volume: ${fmt(total, 4)} g ÷ ${fmt(rho.gPerMl, 4)} g/mL (${prettyFormula(text)} ${fmt(w, 3)} wt% at 20 °C; ${DENSITY_20C[text].source})`
        }
      }
      // Concentrations count what dissolves; a solid excess is not in solution.
      const dissolvedShare = (text: string, g: number) => {
        const u = this.m.undissolved.find((x) => x.compartment === comp.name && x.formula === text)
        return u ? u.dissolvedG / g : 1
      }
      for (const [text, s] of comp.solutes) {
        if (!volumeL) continue
        const c = (s.mol * dissolvedShare(text, s.g)) / volumeL
        parts.push(`${prettyFormula(text)} ${fmt(c)} mol/L`)
        working.push(`c(${prettyFormula(text)}) = n/V = ${fmt(c * volumeL, 4)} mol dissolved ÷ ${fmt(volumeL, 4)} L = ${fmt(c, 4)} mol/L  (${fmt((c * volumeL * s.g) / s.mol / volumeL, 4)} g/L)`)
      }
      if (waterKnown && comp.solutes.size > 0) {
        let total = comp.waterG
        for (const [text, s] of comp.solutes) total += s.g * dissolvedShare(text, s.g)
        for (const [text, s] of comp.solutes) {
          const g = s.g * dissolvedShare(text, s.g)
          const w = (100 * g) / total
          working.push(`w(${prettyFormula(text)}) = ${fmt(g, 4)} g dissolved ÷ (${fmt(total, 4)} g of solution) = ${fmt(w, 3)} wt%`)
          if (comp.solutes.size === 1) parts.push(`${fmt(w)} wt%`)
        }
      }
      if (parts.length === 0) continue
      working.push(volumeL ? `V = ${fmt(volumeL * 1000, 4)} mL, ${volumeFrom}` : 'no compartment volume: concentrations need `compartment NAME VOLUME`')
      this.hintAt(node, {
        key: 'compartment.contents',
        label: `→ ${approx ? '≈ ' : ''}${parts.join(', ')} in ${comp.name}`,
        title: `Contents of ${comp.name}`,
        working,
      })
    }
  }

  /**
   * The area a current density refers to: all cathodes' areas added up, unless `on anode` or
   * `on separator` says otherwise (plating and electrowinning quote cathode current density; in
   * membrane cells the areas are usually equal). Undefined when that part has no area: there is
   * no silent fallback to another part's area.
   */
  referenceArea(on: 'anode' | 'cathode' | 'separator' = 'cathode'): { cm2: number; from: string; role: 'anode' | 'cathode' | 'separator' } | undefined {
    const parts =
      on === 'separator'
        ? this.m.separators.map((x) => ({ area: x.areaCm2, name: x.type.text }))
        : this.m.electrodes.filter((x) => x.role === on).map((x) => ({ area: x.areaCm2, name: x.material.text }))
    if (parts.length === 0 || parts.some((p) => p.area === undefined)) return undefined
    const cm2 = parts.reduce((sum, p) => sum + p.area!, 0)
    const from = parts.length === 1 ? `${on} ${parts[0].name}` : `${parts.length} ${on}s together`
    return { cm2, from, role: on }
  }

  step(n: Extract<LineNode, { kind: 'step' }>): void {
    // Every field written at once (one layout; the clauses fill it in).
    const s: StepFact = {
      line: n.line,
      label: n.label.text,
      span: n.span,
      efficiency: 1,
      hasCurrentClause: false,
      hasVoltageClause: false,
      hasDurationClause: false,
      currentText: undefined,
      currentA: undefined,
      densityAm2: undefined,
      usedArea: undefined,
      densityWithoutArea: undefined,
      voltageV: undefined,
      seconds: undefined,
      chargeC: undefined,
      heatJ: undefined,
    }
    const stepName = `step ${n.label.text}`
    for (const c of n.clauses) {
      switch (c.keyword.text) {
        case 'current': {
          s.hasCurrentClause = true
          s.currentText = c.expr.text
          const q = this.quantity(n, c.expr, `the current of ${stepName}`, CURRENT_KINDS, 'positive', c.keyword)
          if (q.number === undefined) break
          if (q.number <= 0) break // out of range: reported, and kept out of the totals
          if (q.kind === 'current') s.currentA = q.number
          else {
            s.densityAm2 = q.number
            const on = (c.on?.text ?? 'cathode') as 'anode' | 'cathode' | 'separator'
            const area = this.referenceArea(on)
            if (area) {
              s.usedArea = area
              s.currentA = q.number * area.cm2 * 1e-4
            } else s.densityWithoutArea = { span: spanOf(c.expr), on }
          }
          break
        }
        case 'voltage': {
          s.hasVoltageClause = true
          const q = this.quantity(n, c.expr, `the cell voltage of ${stepName}`, VOLTAGE_KINDS, 'positive', c.keyword)
          if (q.number !== undefined && q.number > 0) s.voltageV = q.number
          break
        }
        case 'for': {
          s.hasDurationClause = true
          const q = this.quantity(n, c.expr, `the duration of ${stepName}`, TIME_KINDS, 'positive', c.keyword)
          if (q.number !== undefined && q.number > 0) s.seconds = q.number
          break
        }
        case 'efficiency': {
          const q = this.quantity(n, c.expr, `the current efficiency of ${stepName}`, FRACTION_KINDS, 'fraction', c.keyword)
          if (q.number !== undefined && q.number > 0 && q.number <= 1) s.efficiency = q.number
          break
        }
      }
    }
    if (s.currentA !== undefined && s.seconds !== undefined) s.chargeC = s.currentA * s.seconds
    this.m.steps.push(s)
  }

  stepTotals(): void {
    const t = this.m.totals
    let energyKnown = true
    let energy = 0
    const charged = this.m.steps.filter((x) => x.chargeC !== undefined)
    const lastCharged = charged.at(-1)
    for (let idx = 0; idx < this.m.steps.length; idx++) {
      const s = this.m.steps[idx]
      if (s.seconds !== undefined) t.seconds += s.seconds
      if (s.chargeC === undefined) {
        energyKnown = false
        continue
      }
      const Q = s.chargeC
      const ne = Q / FARADAY
      const eff = Math.min(Math.max(s.efficiency, 0), 1)
      t.chargeC += Q
      t.electronMol += ne
      t.effectiveElectronMol += ne * eff
      const E = s.voltageV !== undefined ? s.voltageV * Q : undefined
      if (E !== undefined) energy += E
      else energyKnown = false
      // The last charged step's hover also sums the run (when there is more than one).
      if (s === lastCharged && charged.length > 1) this.runSum = { step: s, chargeC: t.chargeC, electronMol: t.electronMol }
      this.hintAt(s, {
        key: 'step.charge',
        label: stepChargeLabel,
        value: Q,
        unit: 'C',
        title: `Charge passed in step ${s.label}`,
        working: stepChargeWorking,
        inputs: s,
      })
    }
    if (energyKnown && this.m.steps.length > 0) t.energyJ = energy
    // The run line carries the whole run at a glance.
    const run = this.m.tree.lines.find((n) => n.kind === 'run')
    if (run && t.chargeC > 0) {
      const parts = [formatDuration(t.seconds), `${fmt(t.chargeC / 3600)} A·h`, `${fmt(t.electronMol)} mol e⁻`]
      if (t.energyJ !== undefined) parts.push(`${fmt(t.energyJ / 3600)} W·h`)
      const counted = charged.length
      this.hintAt(run, {
        key: 'run.totals',
        label: parts.join(' · '),
        value: t.chargeC,
        unit: 'C',
        title: 'The whole run',
        working: [
          `${counted} of ${this.m.steps.length} steps with a known charge`,
          `duration ${formatDuration(t.seconds)}; Q = ${fmt(t.chargeC / 3600, 4)} A·h = ${fmt(t.chargeC, 4)} C; n(e⁻) = Q/F = ${fmt(t.electronMol, 4)} mol`,
          ...(t.energyJ !== undefined ? [`E = Σ U·Q = ${fmt(t.energyJ / 3600, 4)} W·h`] : []),
        ],
      })
    }
  }

  /**
   * The same amount stated a second way: evaluate it and record both, so a rule can tell a slip
   * (`K2CO3 260 g (2.1 mol)`). Volumes mean water (by its density) or a gas (by `litresPerMol`).
   */
  alternate(n: LineNode, alt: Tok, firstMol: number | undefined, M: number, kinds: readonly Kind[], rhoW: number | undefined, what: string, litresPerMol?: number): void {
    const q = this.quantity(n, alt, `the second statement of ${what}`, kinds, 'positive')
    if (q.number === undefined || firstMol === undefined || !Number.isFinite(M)) return
    let second: number
    let suggestion: string
    if (q.kind === 'amount') {
      second = q.number
      suggestion = `${fmt(firstMol, 4)} mol`
    } else if (q.kind === 'mass') {
      second = q.number / M
      suggestion = `${fmt(firstMol * M, 4)} g`
    } else if (litresPerMol) {
      second = q.number / litresPerMol
      suggestion = `${fmt(firstMol * litresPerMol, 4)} L`
    } else if (rhoW) {
      second = (q.number * 1000 * rhoW) / M
      suggestion = `${fmt((firstMol * M) / rhoW, 4)} mL`
    } else return
    this.m.twoWays.push({ line: n.line, span: spanOf(alt), what, first: firstMol, second, suggestion })
  }

  /** Simulate the run step by step; show each step's state, its events and the end state. */
  simulation(efficiencyFloor: number): void {
    const m = this.m
    const e = m.engine
    if (!e?.anode || !e.cathode || e.anode.kind === 'stated' || e.cathode.kind === 'stated') return
    if (m.steps.every((x) => x.chargeC === undefined)) return
    const sepType = e.separator === 'cation-exchange' || e.separator === 'anion-exchange' || e.separator === 'diaphragm' ? e.separator : undefined
    const divided = e.anode.compartment !== e.cathode.compartment && !!sepType
    // Without a separator the two compartments are one solution.
    const merged = e.anode.compartment !== e.cathode.compartment && !divided
    const compartments = [...m.compartments.values()]
      .filter((c) => !merged || c.name !== e.cathode!.compartment)
      .map((c) => {
        const parts = merged && c.name === e.anode!.compartment ? [c, m.compartments.get(e.cathode!.compartment)!] : [c]
        return {
          name: c.name,
          waterG: parts.reduce((t, p) => t + p.waterG, 0),
          solutes: parts.flatMap((p) => [...p.solutes].map(([text, x]) => ({ formula: text, mol: x.mol }))),
        }
      })
    const cathode = merged ? { ...e.cathode, compartment: e.anode.compartment } : e.cathode
    const sep = m.separators.find((x) => x.between.includes(e.anode!.compartment) && x.between.includes(e.cathode!.compartment))
    const v = m.voltages
    const sim = simulationRuns.get({
      compartments,
      anode: e.anode,
      cathode,
      ...(divided ? { separator: { type: sepType!, ...(sep?.drag !== undefined ? { drag: sep.drag } : {}) } } : {}),
      // One layout for every step (absent values undefined, not missing).
      steps: m.steps.map((x) => ({
        line: x.line,
        // A step below the reversible voltage passes no faradaic current.
        currentA: x.currentA !== undefined && !(v && x.voltageV !== undefined && x.voltageV < v.reversible) ? x.currentA : undefined,
        seconds: x.seconds,
        efficiency: x.efficiency,
        voltageV: x.voltageV,
      })),
      temperatureK: m.temperatureK,
      cooled: m.handling.some((h) => h.type.text === 'cooling'),
      ...(v ? { thermoneutralV: v.thermoneutral } : {}),
      targets: m.targets,
      efficiencyFloor,
    })
    m.simulation = sim
    const clock = (t: number) => formatDuration(t)
    for (const st of sim.steps) {
      if (st.electronMol <= 0) continue
      this.hintAt(m.tree.lines[st.line], {
        key: 'step.sim',
        label: stepSimLabel,
        title: 'Simulated state at the end of this step',
        working: stepSimWorking,
        inputs: st,
      })
    }
    // The run line: the end state and the overall current efficiency.
    const run = m.tree.lines.find((x) => x.kind === 'run')
    const main = sim.mainProduct
    const electrons = sim.steps.reduce((t, x) => t + x.electronMol, 0)
    if (run && main && electrons > 0) {
      const formed = sim.steps.reduce((t, x) => t + (x.product?.mol ?? 0), 0)
      const end = sim.final.find((c) => c.name === main.compartment)?.main
      const overall = (formed * main.electrons) / electrons
      const last = sim.steps[sim.steps.length - 1]
      this.hintAt(run, {
        key: 'run.sim',
        label:
          `sim end: ` +
          [
            ...(end && main.formula !== 'H2' && main.formula !== 'Cl2' ? [`${fmt(end.wtPercent)} wt% ${prettyFormula(end.formula)} in ${main.compartment}`] : []),
            `CE ${fmt(overall * 100)} % overall`,
            ...(sim.events.length ? [`${sim.events.length} event${sim.events.length === 1 ? '' : 's'}`] : []),
          ].join(' · '),
        value: overall,
        unit: '1',
        title: 'The simulated run',
        working: [
          `${prettyFormula(main.formula)} formed: ${fmt(formed, 4)} mol over ${fmt(electrons, 4)} mol e⁻ → overall current efficiency ${fmt(overall * 100, 3)} %`,
          `gases: ${Object.entries(sim.gases).map(([g, x]) => `${fmt(x * this.litresPerMol(), 4)} L ${prettyFormula(g)}`).join(', ') || 'none'}`,
          ...(last ? [`end temperature ${fmt(last.temperatureK - ZERO_CELSIUS, 3)} °C`] : []),
          ...sim.events.map((e) => `⚑ ${formatDuration(e.time)}: ${e.message}`),
        ],
      })
    }
    for (const ev of sim.events) {
      const node = m.tree.lines[ev.line]
      this.hintAt(node, {
        key: 'sim.event',
        label: `⚑ ${clock(ev.time)}: ${ev.message}`,
        title: 'Simulation event',
        working: [`at ${clock(ev.time)} from the start: ${ev.message}`],
      })
    }
  }

  /** Compare planned and measured yields with the simulation: amounts, efficiency, targets. */
  simulatedYields(): void {
    const m = this.m
    const sim = m.simulation
    if (!sim?.mainProduct) return
    const main = sim.mainProduct
    const f = parseFormula(main.formula)
    const formed = sim.steps.reduce((t, x) => t + (x.product?.mol ?? 0), 0)
    const electrons = sim.steps.reduce((t, x) => t + x.electronMol, 0)
    this.simSums = { formed, electrons }
    const targetAt = new Map(m.targets.map((t) => [t.line, t]))
    for (let idx = 0; idx < m.yields.length; idx++) {
      const y = m.yields[idx]
      if (!sameSubstance(main.formula, y.formula.formula)) continue
      const node = m.tree.lines[y.line]
      const q = y.quantity
      if (q.kind === 'mass-fraction' || q.kind === 'molarity') {
        // A concentration is a target only where one may be planned (in a named compartment, for
        // what is not a gas); elsewhere wrong-unit reports it and the simulation has nothing to add.
        const target = targetAt.get(y.line)
        if (!target) continue
        const reached = sim.events.find((e) => e.kind === 'target-reached' && e.line >= 0 && e.message.includes(`${target.value} ${target.kind}`) && e.compartment === target.compartment)
        const end = sim.final.find((c) => c.name === target.compartment)?.main
        const endValue = end ? (target.kind === 'wt%' ? end.wtPercent : end.molPerL) : undefined
        this.hintAt(node, {
          key: 'expect.target',
          label: reached ? `sim: reached after ${formatDuration(reached.time)}` : `sim: not reached${endValue !== undefined ? ` (ends at ${fmt(endValue)} ${target.kind})` : ''}`,
          title: `Planned concentration of ${prettyFormula(main.formula)} (simulation)`,
          working: [reached ? `the simulation reaches ${target.value} ${target.kind} after ${formatDuration(reached.time)}` : `the simulation ends at ${endValue !== undefined ? fmt(endValue, 4) : '?'} ${target.kind}`],
        })
        continue
      }
      if (y.mol === undefined || q.kind === 'volume') continue
      this.hintAt(node, {
        key: y.kind === 'expect' ? 'expect.sim' : 'observe.sim',
        label: yieldSimLabel,
        value: y.kind === 'expect' ? (formed + y.initialMol) * f.molarMass : electrons > 0 ? (formed * main.electrons) / electrons : 0,
        unit: y.kind === 'expect' ? 'g' : '1',
        title: `${prettyFormula(main.formula)} in the simulation`,
        working: yieldSimWorking,
        inputs: y,
      })
    }
  }

  /** Run the chemistry engine; show each electrode's reaction and each step's products. */
  chemistry(): void {
    const m = this.m
    const run = (below?: number) =>
      engineRuns.get({
        compartments: [...m.compartments.values()].map((c) => ({
          name: c.name,
          ...(c.volumeL !== undefined ? { volumeL: c.volumeL } : {}),
          solutes: [...c.solutes.values()].map((x) => ({ formula: x.formula, mol: x.mol })),
        })),
        electrodes: m.electrodes.map((e) => ({ role: e.role, material: e.material.text, compartment: e.compartment })),
        separators: m.separators.map((x) => ({ type: x.type.text, between: x.between })),
        // A step held below the reversible voltage forms nothing.
        steps: m.steps.map((x) => ({
          line: x.line,
          chargeC: x.chargeC !== undefined && !(below !== undefined && x.voltageV !== undefined && x.voltageV < below) ? x.chargeC : undefined,
          efficiency: x.efficiency,
        })),
        stated: m.reactions
          .filter((r) => r.parsed.ok && r.check.balanced && r.electronSide === (r.role === 'anode' ? 'right' : 'left'))
          .map((r) => ({ role: r.role, text: r.equation.text, parsed: r.parsed })),
      })
    let engine = run()
    const v0 = engine.anode && engine.cathode ? cellVoltages(engine.anode, engine.cathode, engine.coupling === 'same') : undefined
    if (v0 && m.steps.some((x) => x.voltageV !== undefined && x.voltageV < v0.reversible)) engine = run(v0.reversible)
    m.engine = engine
    for (const r of [engine.anode, engine.cathode]) {
      if (!r) continue
      const e = m.electrodes.find((x) => x.role === r.role && x.compartment === r.compartment)!
      const node = m.tree.lines[e.line]
      this.hintAt(node, {
        key: `${r.role}.reaction`,
        label: r.equation,
        title: `${r.role === 'anode' ? 'Anode' : 'Cathode'} reaction`,
        working: [r.equation, `why: ${r.reason}`, ...(r.role === 'cathode' ? [`separator: ${couplingText(engine.coupling)}`] : [])],
      })
    }
    const v = v0
    if (v) {
      m.voltages = v
      const cell = m.tree.lines.find((x) => x.kind === 'cell')
      if (cell) {
        this.hintAt(cell, {
          key: 'cell.voltages',
          label: `E_rev ${fmt(v.reversible)} V · E_tn ${fmt(v.thermoneutral)} V`,
          value: v.reversible,
          unit: 'V',
          title: 'Reversible and thermoneutral cell voltage (standard states, 25 °C)',
          working: [
            `overall, per mole of electrons: ${v.overall}`,
            `E_rev = ΔG/F = ${fmt(v.reversible, 4)} V: below it the cell makes nothing`,
            `E_tn = ΔH/F = ${fmt(v.thermoneutral, 4)} V: above it the cell heats up, below it it cools`,
            'standard Gibbs energies and enthalpies of formation from the NBS tables (1982); concentrations and temperature not corrected for',
          ],
        })
      }
    }
    const stepAt = new Map(m.steps.map((x) => [x.line, x]))
    for (const sp of engine.steps) {
      const held = stepAt.get(sp.line)
      if (v && held?.voltageV !== undefined && held.chargeC !== undefined && held.voltageV < v.reversible) {
        const node = m.tree.lines[sp.line]
        this.hintAt(node, {
          key: 'step.products',
          label: '→ nothing forms below E_rev',
          title: 'Products of this step',
          working: [`${fmt(held.voltageV, 4)} V is below the reversible voltage ${fmt(v.reversible, 4)} V of the chosen reactions: no product is counted for this step`],
        })
        continue
      }
      if (sp.products.length === 0) continue
      // The heat of the step is kept on its fact (the energy balance reads it); the label and the
      // working are written when read.
      if (v && held?.voltageV !== undefined && held.chargeC !== undefined) held.heatJ = (held.voltageV - v.thermoneutral) * held.chargeC
      const node = m.tree.lines[sp.line]
      this.hintAt(node, {
        key: 'step.products',
        label: stepProductsLabel,
        title: 'Products of this step',
        working: stepProductsWorking,
        inputs: { sp, step: held },
      })
    }
  }

  /** The reaction that forms a product, as yields show it: one object per product, shared by its yield lines (read-only). */
  private reactionOf(p: Product): NonNullable<YieldFact['reaction']> {
    let r = this.reactions.get(p)
    if (!r) this.reactions.set(p, (r = { equation: p.equation, reason: p.reason, compartment: p.compartment, gas: p.gas, electrons: p.electrons }))
    return r
  }
  private readonly reactions = new Map<Product, NonNullable<YieldFact['reaction']>>()

  litresPerMol(): number {
    return ((GAS_CONSTANT * this.m.temperatureK) / this.m.pressurePa) * 1000
  }

  private ranOut: boolean | undefined
  /** Whether any step of the engine's bookkeeping ran out of a feed (worked out once, asked for every yield line). */
  private feedRanOut(): boolean {
    this.ranOut ??= !!this.m.engine?.steps.some((s) => s.notes.length > 0)
    return this.ranOut
  }

  yieldLine(n: Extract<LineNode, { kind: 'expect' | 'observe' }>): void {
    const ff = this.formula(n.line, n.formula)
    const f = ff.formula
    const compName = n.compartment?.text
    if (n.compartment) this.ref(n.line, n.compartment)
    const comp = compName ? this.m.compartments.get(compName) : undefined
    const engine = this.m.engine
    const cellKnown = !!engine?.anode && !!engine.cathode
    const formed = cellKnown ? pick(engine!.totals, isSubstance, f) : NONE
    // Without a described cell, fall back to the usual reaction for the product.
    const fallback = cellKnown ? undefined : productReaction(f, this.saltsIn(compName))
    const gas = formed.length ? formed[0].gas : fallback?.ok ? fallback.reaction.gas : KNOWN_GASES.has(ff.tok.text)
    const kinds = gas ? GAS_AMOUNT_KINDS : n.kind === 'expect' && compName ? PLANNED_AMOUNT_KINDS : AMOUNT_KINDS
    const q = this.quantity(n, n.quantity, `the ${n.kind === 'expect' ? 'planned' : 'measured'} amount of ${n.formula.text}`, kinds, 'non-negative')
    if ((q.kind === 'mass-fraction' || q.kind === 'molarity') && q.number !== undefined && compName) {
      // A planned concentration: the simulation reports when (and whether) it is reached.
      this.m.targets.push({ line: n.line, formula: ff.tok.text, compartment: compName, kind: q.kind === 'mass-fraction' ? 'wt%' : 'mol/L', value: q.number })
      this.m.yields.push({ line: n.line, kind: n.kind, formula: ff, quantity: q, initialMol: 0, ...(n.compartment ? { compartment: n.compartment } : {}) })
      return
    }
    // Every field written at once (one layout; the later assignments fill it in).
    const y: YieldFact = {
      line: n.line,
      kind: n.kind,
      formula: ff,
      quantity: q,
      initialMol: 0,
      compartment: n.compartment,
      litresPerMol: undefined,
      mol: undefined,
      reaction: undefined,
      noReaction: undefined,
      wrongCompartment: undefined,
      maxMolEff: undefined,
      maxMol100: undefined,
      feedLimited: undefined,
      formedMol: undefined,
    }
    this.m.yields.push(y)
    const M = f.molarMass
    const Vm = this.litresPerMol()
    if (gas && q.kind === 'volume') y.litresPerMol = Vm
    if (q.number !== undefined && q.number >= 0) y.mol = q.kind === 'mass' ? q.number / M : q.kind === 'amount' ? q.number : q.number / Vm
    if (n.alternate) {
      this.alternate(n, n.alternate, y.mol, M, kinds, gas ? undefined : waterDensity(MEASURING_CELSIUS), `${n.formula.text} ${n.kind === 'expect' ? 'planned' : 'measured'}`, gas ? Vm : undefined)
    }
    const pf = prettyFormula(ff.tok.text)
    let here: Product[] = formed
    if (cellKnown) {
      if (!f.ok) return
      const hypochlorite = engine!.anode!.kind === 'chlorine' && engine!.coupling === 'same' && ff.tok.text === 'Cl2'
      if (formed.length === 0 && hypochlorite) {
        const hypo = engine!.totals.find((p) => /ClO$/.test(p.formula))
        y.noReaction = `the chlorine made at the anode meets the hydroxide made at the cathode in the same solution and forms hypochlorite${hypo ? ` (${prettyFormula(hypo.formula)})` : ''}; plan that instead, or divide the cell`
        return
      }
      if (formed.length === 0) {
        y.noReaction = `nothing in this cell forms ${pf}: the anode runs ${engine!.anode!.equation} (${engine!.anode!.reason}); the cathode runs ${engine!.cathode!.equation} (${engine!.cathode!.reason})`
        return
      }
      if (comp) {
        here = pick(formed, formedIn, comp.name)
        if (here.length === 0) {
          y.wrongCompartment = { formedIn: [...new Set(formed.map((p) => p.compartment))] }
          here = formed
        }
      }
      y.reaction = this.reactionOf(here[0])
      let maxMolEff = 0
      for (let i = 0; i < here.length; i++) maxMolEff = maxMolEff + here[i].mol
      y.maxMolEff = maxMolEff
      // Current efficiency is measured against Faraday's law for the whole charge (n(e⁻)/z),
      // whatever the feed allowed.
      y.maxMol100 = this.m.totals.electronMol / here[0].electrons
      // Only the run's main products are capped by a feed; hydrogen and oxygen take the rest of the current.
      const side = here[0].formula === 'H2' || here[0].formula === 'O2'
      y.feedLimited = !side && this.feedRanOut()
    } else {
      if (!fallback || !fallback.ok) {
        if (f.ok && fallback) y.noReaction = fallback.why
        return
      }
      const r = fallback.reaction
      y.reaction = { equation: r.equation, reason: `${r.reason}; no anode and cathode are described, so the usual reaction is assumed`, gas: r.gas, electrons: r.electrons }
      if (this.m.totals.electronMol > 0) {
        y.maxMol100 = this.m.totals.electronMol / r.electrons
        y.maxMolEff = (r.fromWater ? this.m.totals.electronMol : this.m.totals.effectiveElectronMol) / r.electrons
      }
    }
    // The stated amount is what is there after the run: what was charged of the same substance
    // into that compartment is not formed by the run. (Gases leave the cell, so none is counted.)
    const where = comp ?? (y.reaction.compartment ? this.m.compartments.get(y.reaction.compartment) : undefined)
    if (!gas && where) y.initialMol = chargedMol(where, f)
    if (y.mol !== undefined) y.formedMol = y.mol - y.initialMol
    if (y.maxMolEff === undefined || y.maxMol100 === undefined || this.m.totals.electronMol === 0) return
    // The label and the working are written when read (see the yield writers): what they use is
    // fixed here, in the yield fact and the few values below.
    const inputs: YieldHint = { y, M, Vm, gas, pf, where }
    const formedMol = y.formedMol
    if (n.kind === 'expect') {
      this.hintAt(n, {
        key: 'expect.max',
        label: expectMaxLabel,
        value: (y.initialMol + y.maxMolEff) * M,
        unit: 'g',
        title: `Theoretical ${pf} (Faraday's law)`,
        working: yieldWorking,
        inputs,
      })
    } else if (formedMol !== undefined && y.maxMol100 > 0) {
      this.hintAt(n, {
        key: 'observe.efficiency',
        label: observeEfficiencyLabel,
        value: formedMol / y.maxMol100,
        unit: '1',
        title: `Current efficiency for ${pf}`,
        working: observeEfficiencyWorking,
        inputs,
      })
    }
  }

  /** Salts (formula texts) charged into a compartment, or anywhere when no compartment is named. */
  private saltsIn(comp: string | undefined): string[] {
    const out: string[] = []
    for (let idx = 0; idx < this.m.tree.lines.length; idx++) {
      const n = this.m.tree.lines[idx]
      if (n.kind !== 'charge') continue
      if (comp && n.compartment.text !== comp) continue
      for (const it of n.items) if (!WATER_NAMES.has(it.formula.text)) out.push(it.formula.text)
    }
    if (out.length === 0 && comp) return this.saltsIn(undefined)
    return out
  }
}

/** The one empty list that `pick` and a yield without a described cell share (frozen: only read). */
const NONE: never[] = Object.freeze([]) as unknown as never[]

/**
 * The entries of `xs` that pass `test` (given `arg`), in order: a list at its size, made by loops
 * with a module-level test (this runs for every yield line: no closure, no list grown by push), or
 * one shared empty list when none pass.
 */
function pick<T, A>(xs: readonly T[], test: (x: T, arg: A) => boolean, arg: A): T[] {
  let n = 0
  for (let i = 0; i < xs.length; i++) if (test(xs[i], arg)) n++
  if (n === 0) return NONE
  const out: T[] = new Array(n)
  for (let i = 0, j = 0; i < xs.length; i++) if (test(xs[i], arg)) out[j++] = xs[i]
  return out
}
/** A product that is this substance (same elements and charge). */
const isSubstance = (p: Product, f: Formula) => sameSubstance(p.formula, f)
/** A product formed in this compartment. */
const formedIn = (p: Product, compartment: string) => p.compartment === compartment

/** The product a step is run for: a deposited metal or a follow-on product (hydroxide, acid), else chlorine, else hydrogen. */
function mainProduct(products: Product[]): Product | undefined {
  return (
    products.find((p) => p.origin === 'cathode' && !p.gas) ??
    products.find((p) => p.origin === 'follow-on' && !p.gas) ??
    products.find((p) => p.formula === 'Cl2') ??
    products.find((p) => p.formula === 'H2')
  )
}

function couplingText(c: EngineResult['coupling']): string {
  switch (c) {
    case 'same':
      return 'anode and cathode share one solution: acid and base neutralise, chlorine meets hydroxide'
    case 'cation':
      return 'cations cross from the anode side to the cathode side'
    case 'anion':
      return 'anions cross from the cathode side to the anode side'
    default:
      return 'not known'
  }
}

/** A product amount as a chemist reads it: gases in litres at the run's conditions, the rest in grams. */
function amountText(p: Product, mol: number, litresPerMol: number, sig = 3): string {
  if (p.gas) return gasVolumeText(mol * litresPerMol, sig)
  const M = parseFormula(p.formula).molarMass
  return Number.isFinite(M) ? `${fmt(mol * M, sig)} g` : `${fmt(mol, sig)} mol`
}

function statedReaction(n: Extract<LineNode, { kind: 'reaction' }>): StatedReaction {
  const parsed = parseReaction(n.equation.text)
  const check = checkBalance(parsed)
  const left = parsed.left.some((t) => t.isElectron)
  const right = parsed.right.some((t) => t.isElectron)
  const r: StatedReaction = {
    line: n.line,
    role: n.role.text as 'anode' | 'cathode',
    equation: n.equation,
    parsed,
    check,
    electronSide: left && right ? 'both' : left ? 'left' : right ? 'right' : 'none',
  }
  if (parsed.ok && !check.balanced) r.balanced = balance(parsed)
  return r
}

interface ItemResult {
  mol?: number
  waterG?: number
  volumeL?: number
  approximate: boolean
  label: string
  working: string[]
}

let waterM: number | undefined
function WATER_M(): number {
  waterM ??= parseFormula('H2O').molarMass
  return waterM
}

/** Moles of a substance (same elements and charge) charged into a compartment. */
function chargedMol(c: Compartment, f: Formula): number {
  let mol = 0
  for (const s of c.solutes.values()) {
    if (s.formula.charge !== f.charge || s.formula.counts.size !== f.counts.size) continue
    let same = true
    for (const el of f.counts.keys()) if (s.formula.counts.get(el) !== f.counts.get(el)) same = false
    if (same) mol += s.mol
  }
  return mol
}

/** The anhydrous part of a hydrate, as the solute. */
function anhydrousKey(f: Formula): { text: string; formula: Formula; mass: number } {
  if (f.hydrateWater <= 0) return { text: f.text, formula: f, mass: f.molarMass }
  const base = f.text.split(/[·•*.]/)[0]
  const bf = parseFormula(base)
  if (bf.ok) return { text: base, formula: bf, mass: f.molarMass - f.hydrateWater * WATER_M() }
  return { text: f.text, formula: f, mass: f.molarMass }
}

function formatDuration(s: number): string {
  if (s >= 3600) return `${fmt(s / 3600, 4)} h`
  if (s >= 60) return `${fmt(s / 60, 4)} min`
  return `${fmt(s, 4)} s`
}
