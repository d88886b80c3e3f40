// The chemistry engine: what is in each compartment, which reaction runs at each electrode (and
// why), and what each step forms: products and by-products with their amounts, step by step, so
// that a feed that runs out hands the current to the next reaction.
//
// The model is stoichiometric bookkeeping, not a simulation of concentrations over time (that
// comes with the cell simulation). Its rules:
// - Anode: a soluble metal anode dissolves (nickel and iron/steel are passive in alkali and evolve
//   oxygen there); else chlorine from chloride at or above CHLORIDE_FOR_CHLORINE mol/L; else oxygen
//   (acid or alkaline form by the compartment's pH).
// - Cathode: the most noble reducible metal ion present deposits; else hydrogen from water
//   (alkaline or neutral) or from acid.
// - A step's efficiency is the share of its charge that makes the cell's main product: the metal
//   deposited, the chlorine, or the ions carried through the separator that pair with the
//   hydroxide and acid formed. The rest goes to hydrogen (cathode) or oxygen (anode), or is carried
//   by H⁺/OH⁻ back through the separator.
// - Through a cation-exchange separator (or a diaphragm) cations of the anode side cross; through an
//   anion-exchange one anions of the cathode side cross. In one compartment the acid made at the
//   anode and the base made at the cathode neutralise; chlorine meets hydroxide and forms
//   hypochlorite.
// - Protons made in a carbonate feed first turn carbonate into bicarbonate, then release CO2.
import { FARADAY } from './constants'
import { ratToNumber, type ParsedReaction, type ReactionTerm } from './balance'
import { ANIONS, DEPOSITABLE, KNOWN_GASES, materialIsMetal, metalOxidationState, saltIons, superscriptCharge } from './chemistry'
import { potentialFor } from './data/potentials'
import { ELEMENT_NAMES } from './elements'
import { parseFormula, prettyFormula, type Formula } from './formula'

/** Chloride concentration from which an inert anode evolves mainly chlorine rather than oxygen. */
export const CHLORIDE_FOR_CHLORINE = 0.05 // mol/L; common practice, no source: on-site hypochlorite generators run 3 % brine (0.5 mol/L) and seawater; much more dilute chloride gives mostly oxygen

/** Order of nobility for deposition: the first one present deposits first (standard potentials, CRC electrochemical series, from memory). */
const NOBILITY = ['Au', 'Pt', 'Pd', 'Ag', 'Rh', 'Cu', 'Bi', 'Sb', 'Pb', 'Sn', 'Ni', 'Co', 'Cd', 'In', 'Fe', 'Cr', 'Zn', 'Mn']

/** Metals that dissolve as an anode, with the charge of the ion they form. */
const SOLUBLE_ANODES: Record<string, number> = { Cu: 2, Ni: 2, Zn: 2, Ag: 1, Sn: 2, Cd: 2, Fe: 2, Co: 2, Pb: 2 }
/** Anode materials made of iron (steels). */
const IRON_MATERIALS = /^(iron|steel|mild-steel|carbon-steel|cast-iron)/i
/** Stainless steels: passive; they evolve oxygen, with transpassive dissolution that releases chromate. */
const STAINLESS = /\bstainless\b|^(ss|sus)[- ]?\d{3}l?\b|^aisi[- ]?[34]\d\dl?\b|^3[01]\dl?\b/i
/** Metals passive as anodes in alkaline solution (they evolve oxygen there). */
const PASSIVE_IN_ALKALI = new Set(['Ni', 'Fe', 'Co'])
/** Lead anodes form PbO2 and evolve oxygen in sulfate/sulfuric acid (electrowinning practice). */

export interface Ions {
  /** Cations by element symbol (H for protons), mol. */
  cations: Map<string, { mol: number; charge: number }>
  /** Anions by name from ANIONS (SO4, Cl, OH, CO3, HCO3...), mol. */
  anions: Map<string, { mol: number; charge: number }>
}

export type Ph = 'acidic' | 'neutral' | 'alkaline'

export interface CompartmentInput {
  name: string
  volumeL?: number
  /** Solutes charged, by formula (anhydrous), mol. */
  solutes: { formula: Formula; mol: number }[]
}

export interface ElectrodeInput {
  role: 'anode' | 'cathode'
  material: string
  compartment: string
}

export interface SeparatorInput {
  type: string
  between: [string, string]
}

export interface StepInput {
  line: number
  chargeC?: number
  efficiency: number
}

export type ReactionKind = 'chlorine' | 'oxygen' | 'hydrogen' | 'deposition' | 'dissolution' | 'stated'

export interface ElectrodeReaction {
  role: 'anode' | 'cathode'
  compartment: string
  material: string
  kind: ReactionKind
  /** Half-reaction as text, e.g. "2 Cl⁻ → Cl₂ + 2 e⁻". */
  equation: string
  /** Why this reaction was chosen. */
  reason: string
  /** For deposition and dissolution: the metal and its ion charge. */
  metal?: { element: string; charge: number }
  /** For oxygen and hydrogen: which form. */
  form?: 'acid' | 'alkaline'
  /** For a stated reaction: what it forms per mole of electrons (water, H⁺ and OH⁻ aside). */
  stated?: { formula: string; perElectron: number; gas: boolean }[]
  /** For a stated reaction: OH⁻ made (cathode) or H⁺ made (anode) per mole of electrons. */
  statedIons?: number
  /** For a stated reaction: the ions it draws from the solution, per mole of electrons. */
  statedUses?: { kind: 'cation' | 'anion'; key: string; perElectron: number }[]
}

export interface Product {
  formula: string
  /** Electrons one formula unit takes to form (its share of the charge): Faraday's law for it. */
  electrons: number
  compartment: string
  /** Where it comes from: the electrode, or a follow-on reaction in the compartment. */
  origin: 'anode' | 'cathode' | 'follow-on'
  gas: boolean
  /** Formed with the steps' efficiencies, mol. */
  mol: number
  /** Formed if every step ran at 100 % efficiency, mol. */
  mol100: number
  equation: string
  reason: string
}

export interface StepProducts {
  line: number
  products: Product[]
  /** Events in this step: a feed that ran out, the reaction that took over. */
  notes: string[]
}

export interface EngineResult {
  ions: Map<string, Ions>
  ph: Map<string, Ph>
  anode?: ElectrodeReaction
  cathode?: ElectrodeReaction
  /** How the two sides are joined. */
  coupling: 'same' | 'cation' | 'anion' | 'none'
  /** The separator between the electrodes, when there is one (`diaphragm` is not ion-selective). */
  separator?: string
  steps: StepProducts[]
  totals: Product[]
}

/** The ions a formula gives in water, per formula unit; undefined for a molecule or an unknown. */
type IonsOf = { cation: string; cationCharge: number; cationCount: number; anion: string; anionCharge: number; anionCount: number }
const ionsOfCache = new WeakMap<Formula, IonsOf | null>()

export function ionsOf(f: Formula): IonsOf | undefined {
  let known = ionsOfCache.get(f)
  if (known === undefined) ionsOfCache.set(f, (known = ionsOfUncached(f) ?? null))
  return known ?? undefined
}

function ionsOfUncached(f: Formula): IonsOf | undefined {
  const s = saltIons(f)
  if (s) return s
  // Acids HnX with a known anion.
  const h = f.counts.get('H') ?? 0
  if (!f.ok || f.charge !== 0 || h === 0) return undefined
  for (const a of ANIONS) {
    const need = new Map(Object.entries(a.counts))
    const aH = need.get('H') ?? 0
    const rest = new Map(f.counts)
    rest.set('H', h - aH)
    const protons = rest.get('H')!
    if (protons <= 0) continue
    rest.delete('H')
    if (need.has('H')) need.delete('H')
    if (rest.size !== need.size) continue
    let k = 0
    let ok = true
    for (const [el, n] of need) {
      const got = rest.get(el)
      if (got === undefined || got % n !== 0) ok = false
      else if (k === 0) k = got / n
      else if (got / n !== k) ok = false
    }
    if (!ok || k === 0 || protons !== -a.charge * k) continue
    return { cation: 'H', cationCharge: 1, cationCount: protons, anion: a.name, anionCharge: a.charge, anionCount: k }
  }
  return undefined
}

function compartmentIons(c: CompartmentInput): Ions {
  const ions: Ions = { cations: new Map(), anions: new Map() }
  const addCation = (el: string, mol: number, charge: number) => {
    const ca = ions.cations.get(el)
    ions.cations.set(el, { mol: (ca?.mol ?? 0) + mol, charge })
  }
  for (const s of c.solutes) {
    const i = ionsOf(s.formula)
    if (i) {
      addCation(i.cation, s.mol * i.cationCount, i.cationCharge)
      const an = ions.anions.get(i.anion)
      ions.anions.set(i.anion, { mol: (an?.mol ?? 0) + s.mol * i.anionCount, charge: i.anionCharge })
    }
    // A depositable metal held in an oxide, an oxo-anion or a complex (CrO3, K2Cr2O7, HAuCl4,
    // H2PtCl6) is reducible from its oxidation state in that compound.
    for (const [el, n] of s.formula.counts) {
      if (!(el in DEPOSITABLE) || el === i?.cation) continue
      const ox = metalOxidationState(s.formula, el)
      if (ox !== undefined && ox > 0) addCation(el, s.mol * n, ox)
    }
  }
  return ions
}

function phOf(ions: Ions): Ph {
  if ((ions.cations.get('H')?.mol ?? 0) > 0) return 'acidic'
  if ((ions.anions.get('OH')?.mol ?? 0) > 0 || (ions.anions.get('CO3')?.mol ?? 0) > 0) return 'alkaline'
  return 'neutral'
}

const sup = superscriptCharge

/** The metal a soluble anode is made of, if it is one. */
export function anodeMetal(material: string): string | undefined {
  if (IRON_MATERIALS.test(material)) return 'Fe'
  for (const el of Object.keys(SOLUBLE_ANODES)) if (materialIsMetal(material, el)) return el
  return undefined
}

export function chooseAnode(material: string, compartment: string, ions: Ions, ph: Ph, volumeL: number | undefined): ElectrodeReaction {
  const base = { role: 'anode' as const, compartment, material }
  const metal = anodeMetal(material)
  const stainless = STAINLESS.test(material)
  if (stainless && (ions.anions.get('Cl')?.mol ?? 0) > 0 && ph !== 'alkaline') {
    return {
      ...base,
      kind: 'dissolution',
      metal: { element: 'Fe', charge: 2 },
      equation: 'Fe → Fe²⁺ + 2 e⁻',
      reason: 'chloride breaks the passive film of a stainless anode: it pits and dissolves, releasing chromium as chromate, Cr(VI)',
    }
  }
  if (metal && !(ph === 'alkaline' && PASSIVE_IN_ALKALI.has(metal)) && metal !== 'Pb') {
    const z = SOLUBLE_ANODES[metal]
    return {
      ...base,
      kind: 'dissolution',
      metal: { element: metal, charge: z },
      equation: `${metal} → ${metal}${sup(z)} + ${z} e⁻`,
      reason: `a ${material} anode is soluble: it dissolves instead of evolving gas`,
    }
  }
  const cl = ions.anions.get('Cl')?.mol ?? 0
  const clConc = volumeL ? cl / volumeL : undefined
  if (cl > 0 && (clConc === undefined || clConc >= CHLORIDE_FOR_CHLORINE)) {
    return {
      ...base,
      kind: 'chlorine',
      equation: '2 Cl⁻ → Cl₂ + 2 e⁻',
      reason: `chloride ${clConc !== undefined ? `${clConc.toPrecision(3)} mol/L ` : ''}at an inert ${material} anode evolves chlorine`,
    }
  }
  const passive = stainless
    ? ` (stainless steel is passive and evolves oxygen, but dissolves transpassively and releases chromate, Cr(VI))`
    : metal === 'Pb'
      ? ' (a lead anode forms PbO₂ and evolves oxygen)'
      : metal
        ? ` (${material} is passive in alkaline solution)`
        : ''
  const dilute = cl > 0 ? ` (chloride below ${CHLORIDE_FOR_CHLORINE} mol/L gives mostly oxygen)` : ''
  if (ph === 'alkaline') {
    return { ...base, kind: 'oxygen', form: 'alkaline', equation: '4 OH⁻ → O₂ + 2 H₂O + 4 e⁻', reason: `oxygen from the alkaline ${compartment}${passive}${dilute}` }
  }
  return { ...base, kind: 'oxygen', form: 'acid', equation: '2 H₂O → O₂ + 4 H⁺ + 4 e⁻', reason: `oxygen from water in the ${ph} ${compartment}${passive}${dilute}` }
}

export function chooseCathode(material: string, compartment: string, ions: Ions, ph: Ph): ElectrodeReaction {
  const base = { role: 'cathode' as const, compartment, material }
  // The most noble reducible ion deposits first: by standard potential where the table has the
  // couple (data/potentials.ts), else by the usual order of nobility.
  const present = NOBILITY.filter((el) => (ions.cations.get(el)?.mol ?? 0) > 0 && el in DEPOSITABLE)
  const e0 = (el: string) => {
    const z = ions.cations.get(el)!.charge
    return potentialFor(`${el}^${z === 1 ? '' : z}+/${el}`)?.e0
  }
  const ordered = present.every((el) => e0(el) !== undefined) ? [...present].sort((x, y) => e0(y)! - e0(x)!) : present
  for (const el of ordered) {
    const c = ions.cations.get(el)!
    const pot = e0(el)
    return {
      ...base,
      kind: 'deposition',
      metal: { element: el, charge: c.charge },
      equation: `${el}${sup(c.charge)} + ${c.charge} e⁻ → ${el}`,
      reason:
        `${ELEMENT_NAMES[el] ?? el} ions (${el}${sup(c.charge)}${pot !== undefined ? `, E° = ${pot > 0 ? '+' : ''}${pot} V` : ''}) are the most noble reducible ions in ${compartment}` +
        (present.length > 1 ? `; ${present.filter((x) => x !== el).join(', ')} stay in solution` : ''),
    }
  }
  if (ph === 'acidic') {
    return { ...base, kind: 'hydrogen', form: 'acid', equation: '2 H⁺ + 2 e⁻ → H₂', reason: `hydrogen from the acid in ${compartment} (no reducible metal ion)` }
  }
  return {
    ...base,
    kind: 'hydrogen',
    form: 'alkaline',
    equation: '2 H₂O + 2 e⁻ → H₂ + 2 OH⁻',
    reason: `hydrogen from water in the ${ph} ${compartment} (no reducible metal ion)`,
  }
}

function hydroxideFormula(el: string, z: number): string {
  return z === 1 ? `${el}OH` : `${el}(OH)${z}`
}

function acidFormula(anion: string, charge: number): string {
  const n = -charge
  const a = ANIONS.find((x) => x.name === anion)
  const hasH = a && 'H' in a.counts
  if (hasH) {
    // HSO4 + H -> H2SO4: fold the protons into the anion's own H count.
    const total = n + (a!.counts.H ?? 0)
    return `H${total}${anion.replace(/^H\d*/, '')}`
  }
  return `${n === 1 ? 'H' : `H${n}`}${anion}`
}

/** Amounts for one run of the bookkeeping (stated efficiencies, or all at 100 %). */
class Ledger {
  /** One entry per substance and compartment, in the order first formed. A ledger holds a few: found by a scan. */
  readonly products: Product[] = []
  constructor(private readonly key: 'mol' | 'mol100') {}

  add(p: Omit<Product, 'mol' | 'mol100'>, mol: number): void {
    if (!(mol > 0)) return
    let cur: Product | undefined
    for (let i = 0; i < this.products.length; i++) {
      const x = this.products[i]
      if (x.formula === p.formula && x.compartment === p.compartment) {
        cur = x
        break
      }
    }
    if (!cur) {
      // Written out (not spread): one object shape for every product keeps this hot path fast.
      cur = { formula: p.formula, electrons: p.electrons, compartment: p.compartment, origin: p.origin, gas: p.gas, equation: p.equation, reason: p.reason, mol: 0, mol100: 0 }
      this.products.push(cur)
    }
    if (this.key === 'mol') cur.mol += mol
    else cur.mol100 += mol
  }

  /** The products by `FORMULA@COMPARTMENT`, in the order first formed. */
  formed(): Map<string, Product> {
    return new Map(this.products.map((p) => [p.formula + '@' + p.compartment, p]))
  }
}

export interface EngineInput {
  compartments: CompartmentInput[]
  electrodes: ElectrodeInput[]
  separators: SeparatorInput[]
  steps: StepInput[]
  /** Balanced half-reactions the protocol states; they replace the engine's choice for that electrode. */
  stated?: { role: 'anode' | 'cathode'; text: string; parsed: ParsedReaction }[]
}

const GAS_STATE = /\(g\)$/

/** An electrode reaction from a stated, balanced half-reaction. */
function statedReaction(role: 'anode' | 'cathode', text: string, parsed: ParsedReaction, compartment: string, material: string): ElectrodeReaction {
  const coef = (t: ReactionTerm) => (t.coefficient ? ratToNumber(t.coefficient) : 1)
  const electrons = [...parsed.left, ...parsed.right].filter((t) => t.isElectron).reduce((sum, t) => sum + coef(t), 0)
  const products: { formula: string; perElectron: number; gas: boolean }[] = []
  let ionsMade = 0
  for (const t of parsed.right) {
    if (t.isElectron) continue
    const per = coef(t) / electrons
    if (t.formula === (role === 'anode' ? 'H^+' : 'OH^-') || t.formula === (role === 'anode' ? 'H+' : 'OH-')) ionsMade += per
    else if (t.formula !== 'H2O' && t.formula !== 'H^+' && t.formula !== 'OH^-' && t.formula !== 'H+' && t.formula !== 'OH-') {
      products.push({ formula: t.formula, perElectron: per, gas: GAS_STATE.test(t.species) || KNOWN_GASES.has(t.formula) })
    }
  }
  // The ions on the left that the solution must supply (water, H⁺ and OH⁻ aside).
  const uses: { kind: 'cation' | 'anion'; key: string; perElectron: number }[] = []
  for (const t of parsed.left) {
    if (t.isElectron) continue
    const f = parseFormula(t.formula)
    if (!f.ok || f.charge === 0) continue
    const per = coef(t) / electrons
    if (f.charge > 0 && f.counts.size === 1 && !f.counts.has('H')) uses.push({ kind: 'cation', key: [...f.counts.keys()][0], perElectron: per })
    else if (f.charge < 0) {
      const a = ANIONS.find((x) => x.charge === f.charge && Object.keys(x.counts).length === f.counts.size && Object.entries(x.counts).every(([el, n]) => f.counts.get(el) === n))
      if (a && a.name !== 'OH') uses.push({ kind: 'anion', key: a.name, perElectron: per })
    }
  }
  return { role, compartment, material, kind: 'stated', equation: text, reason: 'stated in the protocol', stated: products, statedIons: ionsMade, statedUses: uses }
}

export function runEngine(input: EngineInput): EngineResult {
  const ions = new Map<string, Ions>()
  const ph = new Map<string, Ph>()
  const volumes = new Map<string, number | undefined>()
  for (const c of input.compartments) {
    const i = compartmentIons(c)
    ions.set(c.name, i)
    ph.set(c.name, phOf(i))
    volumes.set(c.name, c.volumeL)
  }
  const anodeIn = input.electrodes.find((e) => e.role === 'anode' && ions.has(e.compartment))
  const cathodeIn = input.electrodes.find((e) => e.role === 'cathode' && ions.has(e.compartment))
  const result: EngineResult = { ions, ph, coupling: 'none', steps: [], totals: [] }
  if (!anodeIn || !cathodeIn) return result
  const aComp = anodeIn.compartment
  const cComp = cathodeIn.compartment
  const statedAnode = input.stated?.find((x) => x.role === 'anode')
  const statedCathode = input.stated?.find((x) => x.role === 'cathode')
  result.anode = statedAnode
    ? statedReaction('anode', statedAnode.text, statedAnode.parsed, aComp, anodeIn.material)
    : chooseAnode(anodeIn.material, aComp, ions.get(aComp)!, ph.get(aComp)!, volumes.get(aComp))
  result.cathode = statedCathode
    ? statedReaction('cathode', statedCathode.text, statedCathode.parsed, cComp, cathodeIn.material)
    : chooseCathode(cathodeIn.material, cComp, ions.get(cComp)!, ph.get(cComp)!)
  if (aComp === cComp) result.coupling = 'same'
  else {
    const sep = input.separators.find((s) => s.between.includes(aComp) && s.between.includes(cComp))
    if (sep) result.separator = sep.type
    // A diaphragm is not ion-selective: with hydroxide on the anode side, hydroxide carries the
    // current back and nothing is transferred (alkaline water electrolysis); with a salt feed the
    // brine's cations reach the cathode side with the flow through it, much as through a membrane.
    const diaphragmInAlkali = sep?.type === 'diaphragm' && (ions.get(aComp)!.anions.get('OH')?.mol ?? 0) > 0
    result.coupling = !sep || sep.type === 'none' || diaphragmInAlkali ? 'same' : sep.type === 'anion-exchange' ? 'anion' : 'cation'
  }
  const withEff = bookkeep(input, result, false)
  const at100 = bookkeep(input, result, true)
  // Merge the two ledgers: every product with both amounts.
  const merged = new Map<string, Product>()
  for (const [k, p] of withEff.total.formed()) merged.set(k, { ...p })
  for (const [k, p] of at100.total.formed()) {
    const m = merged.get(k)
    if (m) m.mol100 = p.mol100
    else merged.set(k, { ...p, mol: 0 })
  }
  result.totals = [...merged.values()]
  result.steps = withEff.steps
  return result
}

/** The notes of a step without any, shared (results are read-only: see memo.ts). */
const NO_NOTES = Object.freeze([]) as unknown as string[]

interface Book {
  total: Ledger
  /** Each step's products and notes (empty for the bookkeeping at 100 %, of which only the totals are used). */
  steps: StepProducts[]
}

/**
 * The key of the most plentiful ion of a side that may cross a separator: of the cations (`cations`)
 * neither the proton nor a depositable metal, of the anions any but hydroxide. On a tie the first in
 * the map's order (as a stable sort by amount, largest first, would give); undefined when none is
 * left. One scan of the map (forEach), not a sort, and the key rather than a [key, value] pair:
 * this runs for every step.
 */
function mostPlentiful(ions: Map<string, { mol: number }>, cations: boolean): string | undefined {
  let bestKey: string | undefined
  let best = 0
  ions.forEach((v, k) => {
    if ((cations ? k === 'H' || k in DEPOSITABLE : k === 'OH') || !(v.mol > 1e-15)) return
    if (bestKey === undefined || v.mol > best) {
      bestKey = k
      best = v.mol
    }
  })
  return bestKey
}

/** Walk the steps, forming products and drawing on the feeds; `full`: every step at 100 %. */
function bookkeep(input: EngineInput, r: EngineResult, full: boolean): Book {
  const key = full ? 'mol100' : 'mol'
  const total = new Ledger(key)
  const steps: StepProducts[] = []
  const anode = r.anode!
  const cathode = r.cathode!
  const aIons = cloneIons(r.ions.get(anode.compartment)!)
  const cIons = anode.compartment === cathode.compartment ? aIons : cloneIons(r.ions.get(cathode.compartment)!)
  const a = anode.compartment
  const c = cathode.compartment
  // The cation that crosses a cation-exchange separator: the most plentiful non-proton cation of the
  // anode side (see mostPlentiful); the anion that crosses an anion-exchange one likewise.
  const crossing = (side: Ions) => mostPlentiful(side.cations, true)
  const crossingAnion = (side: Ions) => mostPlentiful(side.anions, false)
  // What a product is (all but its amount) is the same on every step: made once per bookkeeping and
  // shared by the steps' ledgers, not written again (with its equation and reason) for each step.
  type Described = Omit<Product, 'mol' | 'mol100'>
  const hydrogenAfter = new Map<string, Described>()
  const oxygenAfter = new Map<string, Described>()
  const hydroxideOf = new Map<string, Map<number, Described>>()
  let hydrogenAtCathode: Described | undefined
  let oxygenAtAnode: Described | undefined
  // The ledger and the notes of the step being booked, and the helpers that write into them (made
  // once, not again for every step).
  let ledger: Ledger | undefined
  let notes: string[] | undefined
  const note = (text: string) => (notes ??= []).push(text)
  const put = (p: Omit<Product, 'mol' | 'mol100'>, mol: number) => {
    ledger?.add(p, mol)
    total.add(p, mol)
  }
  /** Hydrogen (cathode) or oxygen (anode) from water takes the electrons the main reaction leaves. */
  const sideHydrogen = (electrons: number, main: string) => {
    let d = hydrogenAfter.get(main)
    if (!d) hydrogenAfter.set(main, (d = { formula: 'H2', electrons: 2, compartment: c, origin: 'cathode', gas: true, equation: '2 H₂O + 2 e⁻ → H₂ + 2 OH⁻', reason: `hydrogen takes the current ${main} leaves` }))
    put(d, electrons / 2)
  }
  const sideOxygen = (electrons: number, main: string) => {
    let d = oxygenAfter.get(main)
    if (!d) oxygenAfter.set(main, (d = { formula: 'O2', electrons: 4, compartment: a, origin: 'anode', gas: true, equation: '2 H₂O → O₂ + 4 H⁺ + 4 e⁻', reason: `oxygen takes the current ${main} leaves` }))
    put(d, electrons / 4)
  }

  /** Mol of electrons a stated reaction takes, up to `wanted`, as far as the ions it uses last; draws them down. */
  function statedShare(r: ElectrodeReaction, side: Ions, wanted: number, where: string): number {
    let share = wanted
    for (const u of r.statedUses ?? []) {
      const ion = (u.kind === 'cation' ? side.cations : side.anions).get(u.key)
      share = Math.min(share, (ion?.mol ?? 0) / u.perElectron)
    }
    for (const u of r.statedUses ?? []) {
      const ion = (u.kind === 'cation' ? side.cations : side.anions).get(u.key)
      if (ion) ion.mol -= share * u.perElectron
    }
    if (share < wanted - 1e-15) note(`the ions the stated ${r.role} reaction uses in ${where} ran out; ${r.role === 'anode' ? 'oxygen' : 'hydrogen'} takes the rest of the current`)
    return Math.max(0, share)
  }

  /** Protons left in the anode compartment: carbonate takes them first, then they stay as acid. */
  function anodeAcid(h: number) {
    let left = h
    const co3 = aIons.anions.get('CO3')
    if (co3 && co3.mol > 0 && left > 0) {
      const t = Math.min(co3.mol, left)
      co3.mol -= t
      const hco3 = aIons.anions.get('HCO3') ?? { mol: 0, charge: -1 }
      hco3.mol += t
      aIons.anions.set('HCO3', hco3)
      left -= t
      if (co3.mol <= 1e-15 && t > 0) note(`the carbonate in ${a} has turned to bicarbonate; CO₂ comes off from here on`)
    }
    const hco3 = aIons.anions.get('HCO3')
    if (hco3 && hco3.mol > 0 && left > 0) {
      const t = Math.min(hco3.mol, left)
      hco3.mol -= t
      left -= t
      put({ formula: 'CO2', electrons: 1, compartment: a, origin: 'follow-on', gas: true, equation: 'H⁺ + HCO₃⁻ → CO₂ + H₂O', reason: `the protons made at the anode acidify the bicarbonate in ${a}` }, t)
      if (hco3.mol <= 1e-15) note(`the bicarbonate in ${a} is used up; the ${a} turns acidic`)
    }
    if (left > 0) {
      const anKey = crossingAnion(aIons)
      const an = anKey === undefined ? undefined : aIons.anions.get(anKey)!
      if (anKey !== undefined && an && anKey !== 'HCO3' && anKey !== 'CO3') {
        const acid = acidFormula(anKey, an.charge)
        put({ formula: acid, electrons: -an.charge, compartment: a, origin: 'follow-on', gas: false, equation: `${-an.charge === 1 ? '' : -an.charge + ' '}H⁺ + ${anKey}${sup(an.charge)} → ${acid}`, reason: `the protons made at the anode stay in ${a} with its ${anKey}${sup(an.charge)}` }, left / -an.charge)
      }
      const hIon = aIons.cations.get('H') ?? { mol: 0, charge: 1 }
      hIon.mol += left
      aIons.cations.set('H', hIon)
    }
  }
  for (const s of input.steps) {
    // At 100 % (full) only the totals are used: no ledger per step.
    ledger = full ? undefined : new Ledger(key)
    notes = undefined
    if (s.chargeC === undefined || !(s.chargeC > 0)) {
      if (!full) steps.push({ line: s.line, products: [], notes: NO_NOTES })
      continue
    }
    const ne = s.chargeC / FARADAY
    const eta = full ? 1 : Math.min(1, Math.max(0, s.efficiency))
    // --- cathode
    let hydroxide = 0 // mol OH⁻ made at the cathode
    let protonsUsed = 0 // mol H⁺ consumed at the cathode (acid form)
    if (cathode.kind === 'deposition') {
      const m = cathode.metal!
      const ion = cIons.cations.get(m.element)!
      const soluble = anode.kind === 'dissolution' && anode.metal?.element === m.element && a === c
      const wanted = (eta * ne) / m.charge
      const dep = soluble ? wanted : Math.min(wanted, ion.mol)
      if (!soluble) ion.mol -= dep
      if (dep < wanted - 1e-15) note(`${m.element}${sup(m.charge)} in ${c} ran out; the rest of the current evolves hydrogen`)
      put({ formula: m.element, electrons: m.charge, compartment: c, origin: 'cathode', gas: false, equation: cathode.equation, reason: cathode.reason }, dep)
      const h2e = ne - dep * m.charge
      sideHydrogen(h2e, 'the deposition')
      hydroxide += h2e
    } else if (cathode.kind === 'stated') {
      const used = statedShare(cathode, cIons, eta * ne, c)
      for (const p of cathode.stated!) put({ formula: p.formula, electrons: 1 / p.perElectron, compartment: c, origin: 'cathode', gas: p.gas, equation: cathode.equation, reason: cathode.reason }, used * p.perElectron)
      sideHydrogen(ne - used, 'the stated reaction')
      hydroxide = used * cathode.statedIons! + (ne - used)
    } else {
      hydrogenAtCathode ??= { formula: 'H2', electrons: 2, compartment: c, origin: 'cathode', gas: true, equation: cathode.equation, reason: cathode.reason }
      put(hydrogenAtCathode, ne / 2)
      if (cathode.form === 'acid') protonsUsed = ne
      else hydroxide = ne
    }
    // --- anode
    let protons = 0 // mol H⁺ made at the anode
    let chlorine = 0
    if (anode.kind === 'dissolution') {
      const m = anode.metal!
      put({ formula: `${m.element}${'^' + m.charge + '+'}`, electrons: m.charge, compartment: a, origin: 'anode', gas: false, equation: anode.equation, reason: anode.reason }, ne / m.charge)
      if (!(cathode.kind === 'deposition' && cathode.metal?.element === m.element)) {
        const ion = aIons.cations.get(m.element)
        aIons.cations.set(m.element, { mol: (ion?.mol ?? 0) + ne / m.charge, charge: m.charge })
      }
    } else if (anode.kind === 'chlorine') {
      const cl = aIons.anions.get('Cl')!
      const wanted = (eta * ne) / 2
      // In one solution with a hydroxide-making cathode the chlorine turns to hypochlorite, which
      // gives one chloride back: net one Cl⁻ per Cl₂ formed instead of two.
      const clPerCl2 = r.coupling === 'same' && cathode.kind === 'hydrogen' && cathode.form === 'alkaline' ? 1 : 2
      chlorine = Math.min(wanted, cl.mol / clPerCl2)
      cl.mol -= clPerCl2 * chlorine
      if (chlorine < wanted - 1e-15) note(`chloride in ${a} ran out; the rest of the current evolves oxygen`)
      const o2e = ne - 2 * chlorine
      sideOxygen(o2e, 'the chlorine')
      protons = o2e
    } else if (anode.kind === 'stated') {
      const used = statedShare(anode, aIons, eta * ne, a)
      for (const p of anode.stated!) put({ formula: p.formula, electrons: 1 / p.perElectron, compartment: a, origin: 'anode', gas: p.gas, equation: anode.equation, reason: anode.reason }, used * p.perElectron)
      sideOxygen(ne - used, 'the stated reaction')
      protons = used * anode.statedIons! + (ne - used)
    } else {
      oxygenAtAnode ??= { formula: 'O2', electrons: 4, compartment: a, origin: 'anode', gas: true, equation: anode.equation, reason: anode.reason }
      put(oxygenAtAnode, ne / 4)
      protons = ne
    }
    // --- what the separator carries, and what pairs up in each compartment
    if (r.coupling === 'same') {
      // Acid and base made in one solution neutralise (an acid cathode consuming H⁺ counts as base);
      // chlorine meets the hydroxide as hypochlorite; protons left over make acid with the anion
      // present (electrowinning regenerates its sulfuric acid).
      const base = hydroxide + protonsUsed - protons
      // Hypochlorite needs hydroxide itself, in a solution with no free acid left.
      const freeBase = hydroxide - protons
      const acidLeft = (cIons.cations.get('H')?.mol ?? 0) - protonsUsed
      if (chlorine > 0 && freeBase > 0 && acidLeft <= 0) {
        const cat = crossing(cIons)
        const hypo = Math.min(chlorine, freeBase / 2)
        const name = cat !== undefined ? `${cat}ClO` : 'ClO^-'
        put({ formula: name, electrons: 2, compartment: c, origin: 'follow-on', gas: false, equation: 'Cl₂ + 2 OH⁻ → ClO⁻ + Cl⁻ + H₂O', reason: 'in one compartment the chlorine meets the hydroxide made at the cathode' }, hypo)
        chlorine -= hypo
      }
      if (chlorine > 0) put({ formula: 'Cl2', electrons: 2, compartment: a, origin: 'anode', gas: true, equation: anode.equation, reason: anode.reason }, chlorine)
      if (base < 0) anodeAcid(-base)
    } else {
      if (chlorine > 0) put({ formula: 'Cl2', electrons: 2, compartment: a, origin: 'anode', gas: true, equation: anode.equation, reason: anode.reason }, chlorine)
      const carried = eta * ne // charge carried by the intended ions; the rest by H⁺ or OH⁻
      if (r.coupling === 'cation') {
        const el = crossing(aIons)
        const v = el === undefined ? undefined : aIons.cations.get(el)!
        let moved = 0
        if (el !== undefined && v) {
          moved = Math.min(carried / v.charge, v.mol)
          v.mol -= moved
          if (moved * v.charge < carried - 1e-15) note(`${el}${sup(v.charge)} in ${a} ran out; protons carry the rest of the current and the hydroxide stops growing`)
          const formed = Math.min(moved, hydroxide / v.charge)
          let byCharge = hydroxideOf.get(el)
          if (!byCharge) hydroxideOf.set(el, (byCharge = new Map()))
          let d = byCharge.get(v.charge)
          if (!d) {
            d = {
              formula: hydroxideFormula(el, v.charge),
              electrons: v.charge,
              compartment: c,
              origin: 'follow-on',
              gas: false,
              equation: `${el}${sup(v.charge)} (through the separator) + ${v.charge === 1 ? '' : v.charge + ' '}OH⁻ → ${hydroxideFormula(el, v.charge)}`,
              reason: `${el}${sup(v.charge)} crosses the cation-exchange separator from ${a} and pairs with the hydroxide made at the cathode`,
            }
            byCharge.set(v.charge, d)
          }
          put(d, formed)
        }
        // The charge not carried by the crossing cations is carried by protons from the anode side;
        // the protons that stay behind acidify it.
        const kept = Math.max(0, protons - (ne - moved * (v ? v.charge : 0)))
        anodeAcid(kept)
      } else {
        const name = crossingAnion(cIons)
        const v = name === undefined ? undefined : cIons.anions.get(name)!
        let moved = 0
        if (name !== undefined && v) {
          const z = -v.charge
          moved = Math.min(carried / z, v.mol)
          v.mol -= moved
          if (moved * z < carried - 1e-15) note(`${name}${sup(v.charge)} in ${c} ran out; hydroxide carries the rest of the current`)
          const catKey = crossing(cIons)
          const cat = catKey === undefined ? undefined : cIons.cations.get(catKey)!
          if (catKey !== undefined && cat) put({ formula: hydroxideFormula(catKey, cat.charge), electrons: cat.charge, compartment: c, origin: 'follow-on', gas: false, equation: 'the cations left behind pair with the hydroxide made at the cathode', reason: `${name}${sup(v.charge)} leaves ${c} through the anion-exchange separator` }, (moved * z) / cat.charge)
          const acid = acidFormula(name, v.charge)
          put({ formula: acid, electrons: z, compartment: a, origin: 'follow-on', gas: false, equation: `${name}${sup(v.charge)} (through the separator) + ${z === 1 ? '' : z + ' '}H⁺ → ${acid}`, reason: `${name}${sup(v.charge)} crosses the anion-exchange separator from ${c} and pairs with the protons made at the anode` }, Math.min(moved, protons / z))
        }
      }
    }
    // The products as a list at its size (the ledger's, grown by push, keeps room for 16 more).
    if (ledger) steps.push({ line: s.line, products: ledger.products.slice(), notes: notes ?? NO_NOTES })
  }
  return { total, steps }
}

function cloneIons(i: Ions): Ions {
  return {
    cations: new Map([...i.cations].map(([k, v]) => [k, { ...v }])),
    anions: new Map([...i.anions].map(([k, v]) => [k, { ...v }])),
  }
}

/** Does a product's formula mean the same substance as `f` (same elements and charge)? */
export function sameSubstance(productFormula: string, f: Formula): boolean {
  const p = parseFormula(productFormula)
  if (!p.ok || !f.ok || p.charge !== f.charge || p.counts.size !== f.counts.size) return false
  for (const el of f.counts.keys()) {
    const n = f.counts.get(el)!
    if (p.counts.get(el) !== n) return false
  }
  return true
}

export { prettyFormula }
