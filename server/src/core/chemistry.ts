// Electrode chemistry of Cellrun v1: which electrode reaction forms a product named in an
// `expect` or `observe` line, and how many electrons one formula unit of it takes.
//
// v1 knows: hydrogen + hydroxide at a cathode in water, oxygen or chlorine at an anode, acid formed
// at an anode (H+ with the anion present), and metal deposition from a metal ion present. Charges
// of metal ions come from the salts charged into the cell (CuSO4 -> Cu^2+), else from a table of
// common ions.
import { ATOMIC_WEIGHTS, ELEMENT_NAMES } from './elements'
import { parseFormula, type Formula } from './formula'

export interface Reaction {
  electrode: 'anode' | 'cathode'
  /** Electrons per formula unit of the product. */
  electrons: number
  /** Half-reaction (and follow-on reaction) as text. */
  equation: string
  /** Whether the product is a gas (volumes apply). */
  gas: boolean
  /**
   * Hydrogen or oxygen from water: it takes whatever current the other reactions at its electrode
   * leave, so its bound is the full charge and the steps' efficiencies are not applied to it.
   */
  fromWater?: boolean
  /** Why this reaction was chosen. */
  reason: string
  /** For a metal: its symbol. For a hydroxide: the cation. */
  element?: string
}

export type ReactionLookup = { ok: true; reaction: Reaction } | { ok: false; why: string }

/** Common anions: formula, element counts and charge. */
export const ANIONS: { name: string; counts: Record<string, number>; charge: number }[] = [
  { name: 'SO4', counts: { S: 1, O: 4 }, charge: -2 },
  { name: 'HSO4', counts: { H: 1, S: 1, O: 4 }, charge: -1 },
  { name: 'NO3', counts: { N: 1, O: 3 }, charge: -1 },
  { name: 'NO2', counts: { N: 1, O: 2 }, charge: -1 },
  { name: 'CO3', counts: { C: 1, O: 3 }, charge: -2 },
  { name: 'HCO3', counts: { H: 1, C: 1, O: 3 }, charge: -1 },
  { name: 'OH', counts: { O: 1, H: 1 }, charge: -1 },
  { name: 'Cl', counts: { Cl: 1 }, charge: -1 },
  { name: 'Br', counts: { Br: 1 }, charge: -1 },
  { name: 'I', counts: { I: 1 }, charge: -1 },
  { name: 'F', counts: { F: 1 }, charge: -1 },
  { name: 'ClO3', counts: { Cl: 1, O: 3 }, charge: -1 },
  { name: 'ClO4', counts: { Cl: 1, O: 4 }, charge: -1 },
  { name: 'ClO', counts: { Cl: 1, O: 1 }, charge: -1 },
  { name: 'PO4', counts: { P: 1, O: 4 }, charge: -3 },
  { name: 'HPO4', counts: { H: 1, P: 1, O: 4 }, charge: -2 },
  { name: 'H2PO4', counts: { H: 2, P: 1, O: 4 }, charge: -1 },
  { name: 'CN', counts: { C: 1, N: 1 }, charge: -1 },
  { name: 'BF4', counts: { B: 1, F: 4 }, charge: -1 },
  { name: 'NH2SO3', counts: { N: 1, H: 2, S: 1, O: 3 }, charge: -1 },
  { name: 'CH3COO', counts: { C: 2, H: 3, O: 2 }, charge: -1 },
  { name: 'CrO4', counts: { Cr: 1, O: 4 }, charge: -2 },
  { name: 'Cr2O7', counts: { Cr: 2, O: 7 }, charge: -2 },
]

/** Gases a protocol may state by volume even where v1 knows no reaction forming them. */
export const KNOWN_GASES = new Set(['H2', 'O2', 'Cl2', 'CO2', 'N2', 'NH3', 'SO2', 'NO2', 'NO', 'N2O', 'CH4', 'CO', 'O3', 'ClO2'])

/** Metals whose ions are reduced to metal from water at a practical efficiency; usual ion charge. */
export const DEPOSITABLE: Record<string, number> = {
  Cu: 2,
  Ni: 2,
  Zn: 2,
  Ag: 1,
  Au: 1,
  Pb: 2,
  Sn: 2,
  Fe: 2,
  Co: 2,
  Cd: 2,
  Cr: 3,
  Mn: 2,
  In: 3,
  Bi: 3,
  Sb: 3,
  Pd: 2,
  Pt: 2,
  Rh: 3,
}

/** Metals that form hydroxides at a cathode but cannot be deposited from water. */
export const ALKALI_LIKE = new Set(['Li', 'Na', 'K', 'Rb', 'Cs', 'Mg', 'Ca', 'Sr', 'Ba', 'Al'])

/** Elements that are never the cation of a salt (boric acid is not B³⁺ + 3 OH⁻). */
const NON_METALS = new Set(['H', 'He', 'B', 'C', 'N', 'O', 'F', 'Ne', 'Si', 'P', 'S', 'Cl', 'Ar', 'As', 'Se', 'Br', 'Kr', 'Te', 'I', 'Xe', 'At', 'Rn'])

export interface SaltIons {
  cation: string
  cationCount: number
  cationCharge: number
  anion: string
  anionCount: number
  anionCharge: number
}

/** Split a neutral salt into its ions (hydrate water ignored): CuSO4·5H2O -> Cu^2+ + SO4^2-. */
export function saltIons(f: Formula): SaltIons | undefined {
  // Formulas are shared, unchanging objects (see formula.ts): their ions are read once.
  let known = saltIonsOf.get(f)
  if (known === undefined) saltIonsOf.set(f, (known = saltIonsUncached(f) ?? null))
  return known ?? undefined
}

const saltIonsOf = new WeakMap<Formula, SaltIons | null>()

function saltIonsUncached(f: Formula): SaltIons | undefined {
  if (!f.ok || f.charge !== 0) return undefined
  const counts = new Map(f.counts)
  if (f.hydrateWater > 0) {
    counts.set('H', (counts.get('H') ?? 0) - 2 * f.hydrateWater)
    counts.set('O', (counts.get('O') ?? 0) - f.hydrateWater)
    for (const [k, v] of [...counts]) if (v === 0) counts.delete(k)
  }
  for (const anion of ANIONS) {
    const per = Object.entries(anion.counts)
    let k = Infinity
    for (const [el, n] of per) k = Math.min(k, Math.floor((counts.get(el) ?? 0) / n))
    if (!Number.isFinite(k) || k < 1) continue
    const rest = new Map(counts)
    for (const [el, n] of per) rest.set(el, (rest.get(el) ?? 0) - n * k)
    const left = [...rest].filter(([, v]) => v !== 0)
    // Ammonium salts: what is left is n N with 4n H, the NH4⁺ cation.
    const nN = rest.get('N') ?? 0
    if (left.length === 2 && nN > 0 && rest.get('H') === 4 * nN && k * -anion.charge === nN) {
      return { cation: 'NH4', cationCount: nN, cationCharge: 1, anion: anion.name, anionCount: k, anionCharge: anion.charge }
    }
    if (left.length !== 1 || left[0][1] <= 0) continue
    const [cation, cationCount] = left[0]
    if (NON_METALS.has(cation) || !(cation in ATOMIC_WEIGHTS)) continue
    const charge = (k * -anion.charge) / cationCount
    if (!Number.isInteger(charge) || charge <= 0 || charge > 4) continue
    return { cation, cationCount, cationCharge: charge, anion: anion.name, anionCount: k, anionCharge: anion.charge }
  }
  return undefined
}

/** Usual oxidation states of the partners a metal compound is often written with. */
const PARTNER_STATE: Record<string, number> = { H: 1, O: -2, F: -1, Cl: -1, Br: -1, I: -1, Li: 1, Na: 1, K: 1 }

/**
 * The oxidation state of metal `el` in a compound: from its ions when the compound is a simple salt
 * (CuSO4 -> +2), else from the usual states of its partners when they are only H, O, halogens and
 * alkali metals (CrO3 -> +6, K2Cr2O7 -> +6, HAuCl4 -> +3, H2PtCl6 -> +4). Undefined when unknown.
 */
export function metalOxidationState(f: Formula, el: string): number | undefined {
  const ions = saltIons(f)
  if (ions && ions.cation === el) return ions.cationCharge
  const n = f.counts.get(el)
  if (!f.ok || !n) return undefined
  let others = 0
  for (const [e, k] of f.counts) {
    if (e === el) continue
    const st = PARTNER_STATE[e]
    if (st === undefined) return undefined
    others += st * k
  }
  // Hydrate water adds H +1 ×2 and O −2: net zero, so it needs no special case.
  const ox = (f.charge - others) / n
  return Number.isInteger(ox) ? ox : undefined
}

/** Is this formula exactly one element (a metal or an element gas like Cl2)? */
function singleElement(f: Formula): string | undefined {
  if (f.counts.size !== 1 || f.charge !== 0) return undefined
  return [...f.counts.keys()][0]
}

/**
 * The electrode reaction that forms `product`, given the salts present in the compartment where it
 * is expected (formulas as written in `charge` lines).
 */
export function productReaction(product: Formula, saltsPresent: readonly string[]): ReactionLookup {
  if (!product.ok) return { ok: false, why: 'the formula has errors' }
  const el = singleElement(product)
  const count = el ? product.counts.get(el) : 0
  if (el === 'H' && count === 2) {
    return {
      ok: true,
      reaction: {
        electrode: 'cathode',
        electrons: 2,
        gas: true,
        fromWater: true,
        equation: '2 H₂O + 2 e⁻ → H₂ + 2 OH⁻',
        reason: 'hydrogen is evolved from water at the cathode',
      },
    }
  }
  if (el === 'O' && count === 2) {
    return {
      ok: true,
      reaction: {
        electrode: 'anode',
        electrons: 4,
        gas: true,
        fromWater: true,
        equation: '2 H₂O → O₂ + 4 H⁺ + 4 e⁻  (alkaline: 4 OH⁻ → O₂ + 2 H₂O + 4 e⁻)',
        reason: 'oxygen is evolved from water at the anode',
      },
    }
  }
  if (el === 'Cl' && count === 2) {
    return {
      ok: true,
      reaction: { electrode: 'anode', electrons: 2, gas: true, equation: '2 Cl⁻ → Cl₂ + 2 e⁻', reason: 'chlorine is evolved from chloride at the anode' },
    }
  }
  if (el && count === 1) {
    if (ALKALI_LIKE.has(el)) {
      return { ok: false, why: `${ELEMENT_NAMES[el] ?? el} metal cannot be deposited from water: its ion is not reduced before water is` }
    }
    // Metal deposition: the metal's oxidation state in a salt present, else the usual ion.
    let z: number | undefined
    let from = ''
    let unclear = ''
    for (const text of saltsPresent) {
      const salt = parseFormula(text)
      if (!salt.counts.has(el)) continue
      const ox = metalOxidationState(salt, el)
      if (ox !== undefined && ox > 0) {
        z = ox
        from = text
        break
      }
      unclear ||= text
    }
    if (z === undefined && el in DEPOSITABLE) z = DEPOSITABLE[el]
    if (z === undefined) return { ok: false, why: `no deposition reaction is known for ${el}` }
    return {
      ok: true,
      reaction: {
        electrode: 'cathode',
        electrons: z,
        gas: false,
        element: el,
        equation: `${el}${superscriptCharge(z)} + ${z} e⁻ → ${el}`,
        reason: from
          ? `${el}${superscriptCharge(z)} comes from ${from} in the charge`
          : unclear
            ? `the charge of ${el} in ${unclear} could not be told; ${el}${superscriptCharge(z)}, its usual ion, is assumed`
            : `${el}${superscriptCharge(z)} is its usual ion (no ${el} salt is charged)`,
      },
    }
  }
  // Hydroxides M(OH)n: hydroxide from water reduction at the cathode, paired with the cation.
  const ions = saltIons(product)
  if (ions && ions.anion === 'OH') {
    const n = ions.anionCount / ions.cationCount
    return {
      ok: true,
      reaction: {
        electrode: 'cathode',
        electrons: n,
        gas: false,
        element: ions.cation,
        equation: `2 H₂O + 2 e⁻ → H₂ + 2 OH⁻;  ${ions.cation}${superscriptCharge(ions.cationCharge)} + ${n === 1 ? '' : n + ' '}OH⁻ → ${product.text}`,
        reason: `hydroxide forms at the cathode and pairs with ${ions.cation}${superscriptCharge(ions.cationCharge)}`,
      },
    }
  }
  // Acids HnX: protons from water oxidation at the anode, paired with the anion present.
  const h = product.counts.get('H') ?? 0
  if (h > 0 && product.charge === 0) {
    const rest = new Map(product.counts)
    rest.delete('H')
    const anion = ANIONS.find(
      (a) => -a.charge === h && Object.keys(a.counts).length === rest.size && Object.entries(a.counts).every(([e, n]) => rest.get(e) === n),
    )
    if (anion && anion.name !== 'OH' && anion.name !== 'Cl') {
      return {
        ok: true,
        reaction: {
          electrode: 'anode',
          electrons: h,
          gas: false,
          equation: `2 H₂O → O₂ + 4 H⁺ + 4 e⁻;  ${h === 1 ? '' : h + ' '}H⁺ + ${anion.name}${superscriptCharge(anion.charge)} → ${product.text}`,
          reason: `acid forms at the anode as protons pair with ${anion.name}${superscriptCharge(anion.charge)}`,
        },
      }
    }
  }
  return { ok: false, why: `Cellrun v1 knows no electrode reaction that forms ${product.text}` }
}

export function superscriptCharge(z: number): string {
  const sup: Record<string, string> = { '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' }
  const a = Math.abs(z)
  const digits = a === 1 ? '' : String(a).replace(/\d/g, (d) => sup[d])
  return digits + (z < 0 ? '⁻' : '⁺')
}

/** Does an electrode material name mean a soluble anode of this metal (e.g. `copper` for Cu)? */
export function materialIsMetal(material: string, element: string): boolean {
  const name = (ELEMENT_NAMES[element] ?? element).toLowerCase()
  const m = material.toLowerCase()
  return m === name || m === element.toLowerCase() || m.startsWith(name + '-') || m === 'oxygen-free-' + name
}
