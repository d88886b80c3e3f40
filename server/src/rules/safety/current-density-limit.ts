// current-density-limit: a step drives more current through an anode or a separator than that part
// usually tolerates (anode coatings wear off, graphite burns away, lead and copper anodes passivate,
// membranes blister and heat up).
import type { Diagnostic } from '../../core/diagnostics'
import { fix } from '../../core/diagnostics'
import type { Model } from '../../core/model'
import { type Span, spanOf } from '../../core/positions'
import { fmt, fmtDown } from '../../core/units'
import type { Rule } from '../rule'

/** A typical maximum current density for a part, mA/cm². */
interface Limit {
  /** What such parts are called in messages (plural). */
  name: string
  mAcm2: number
  /** Where the figure comes from. */
  source: string
  /** Why going past it matters. */
  why: string
}

interface MaterialLimit extends Limit {
  match: (material: string, alkaline: boolean) => boolean
}

const FROM_PRACTICE = 'common practice, no source'

/**
 * Anode materials, first match wins. Only anodes are listed: at a cathode these materials take far
 * higher current densities (nickel and steel cathodes of membrane cells run at 6 kA/m²), and what
 * limits a cathode is the deposit, not the part.
 */
export const ANODE_LIMITS: readonly MaterialLimit[] = [
  {
    name: 'mixed-metal-oxide (MMO/DSA) titanium anodes',
    mAcm2: 600,
    source: 'membrane chlor-alkali cells run their MMO anodes at about 3-6 kA/m² (EU BREF for the chlor-alkali industry, 2014, from memory)',
    why: 'the oxide coating wears faster and the anode passivates',
    match: (m) => /(^|[^a-z])(mmo|dsa|mixed-metal-oxide|ruo2|iro2)([^a-z]|$)/i.test(m),
  },
  {
    name: 'platinum and platinised-titanium anodes',
    mAcm2: 500,
    source: FROM_PRACTICE,
    why: 'a thin platinum layer wears through and the titanium beneath passivates',
    match: (m) => /platini[sz]ed|platinum|(^|[^a-z])pt([^a-z]|$)/i.test(m),
  },
  {
    name: 'lead and lead-dioxide anodes',
    mAcm2: 50,
    source: `${FROM_PRACTICE} (electrowinning tankhouses run about 200-600 A/m²)`,
    why: 'the dioxide layer sheds and lead contaminates the bath and the deposit',
    match: (m) => /(^|[^a-z])(lead|pbo2)/i.test(m),
  },
  {
    name: 'graphite and carbon anodes',
    mAcm2: 100,
    source: `${FROM_PRACTICE} (50-150 mA/cm² is usual; graphite oxidises to CO₂ and crumbles faster above it)`,
    why: 'the graphite oxidises and crumbles, fouling the solution and the separator',
    match: (m) => /graphite|(^|[^a-z])carbon(?!-steel)/i.test(m),
  },
  {
    name: 'stainless-steel anodes',
    mAcm2: 300,
    source: FROM_PRACTICE,
    why: 'it dissolves transpassively, releasing chromate, Cr(VI)',
    match: (m) => /stainless|^ss-?\d*$|^aisi-?\d+$|^\d{3}l?$/i.test(m),
  },
  {
    name: 'nickel anodes in alkali',
    mAcm2: 500,
    source: `${FROM_PRACTICE} (alkaline water electrolysers run about 200-500 mA/cm²)`,
    why: 'the anode heats and its oxide layer degrades',
    match: (m, alkaline) => alkaline && /^nickel([^a-z]|$)/i.test(m),
  },
  {
    name: 'soluble copper anodes',
    mAcm2: 30,
    source: FROM_PRACTICE,
    why: 'the anode passivates: the cell voltage climbs and oxygen evolves at it',
    match: (m) => /^(copper|oxygen-free-copper|phosphorised-copper|phosphorized-copper)([^a-z]|$)/i.test(m),
  },
]

/** Separators: each carries the whole cell current through its own area. */
export const SEPARATOR_LIMITS: Readonly<Record<string, Limit>> = {
  'cation-exchange': {
    name: 'perfluorinated cation-exchange membranes',
    mAcm2: 600,
    source: 'membrane chlor-alkali cells run at up to about 6 kA/m² (EU BREF for the chlor-alkali industry, 2014, from memory)',
    why: 'the membrane overheats and blisters',
  },
  'anion-exchange': {
    name: 'anion-exchange membranes',
    mAcm2: 500,
    source: FROM_PRACTICE,
    why: 'the membrane overheats and degrades (anion-exchange membranes are less stable than cation-exchange ones)',
  },
  diaphragm: {
    name: 'diaphragms',
    mAcm2: 300,
    source: FROM_PRACTICE,
    why: 'the cell heats and gas is pushed through it, mixing hydrogen into the anode gas',
  },
}

interface Over {
  part: string
  areaCm2: number
  jmAcm2: number
  limit: Limit
}

/** The parts with a current density limit, each with the area the current passes through. */
interface Limited {
  part: string
  areaCm2: number
  limit: Limit
}

/** The anodes (sharing the current in proportion to their areas; all need one) and separators that have a limit, in that order. */
function limitedParts(model: Model): Limited[] {
  const out: Limited[] = []
  const anodes = model.electrodes.filter((e) => e.role === 'anode')
  if (anodes.length > 0 && anodes.every((e) => e.areaCm2 !== undefined)) {
    const total = anodes.reduce((t, e) => t + e.areaCm2!, 0)
    for (const e of anodes) {
      const alkaline = model.engine?.ph.get(e.compartment) === 'alkaline'
      const limit = ANODE_LIMITS.find((l) => l.match(e.material.text, alkaline))
      if (!limit) continue
      const part = anodes.length === 1 ? `the ${e.material.text} anode` : `the ${e.material.text} anode (${anodes.length} anodes share the current)`
      out.push({ part, areaCm2: total, limit })
    }
  }
  for (const s of model.separators) {
    const limit = SEPARATOR_LIMITS[s.type.text]
    if (!limit || s.areaCm2 === undefined) continue
    out.push({ part: `the ${s.type.text} separator between ${s.between[0]} and ${s.between[1]}`, areaCm2: s.areaCm2, limit })
  }
  return out
}

/** The parts a current drives above their limit. */
function overLimits(parts: readonly Limited[], currentA: number): Over[] {
  const out: Over[] = []
  for (const p of parts) {
    const j = (currentA * 1000) / p.areaCm2
    if (j > p.limit.mAcm2 * (1 + 1e-9)) out.push({ part: p.part, areaCm2: p.areaCm2, jmAcm2: j, limit: p.limit })
  }
  return out
}

export const currentDensityLimit: Rule = {
  code: 'current-density-limit',
  severity: 'warning',
  category: 'safety',
  summary: 'A step drives a current density through an anode or a separator above what that part usually tolerates.',
  details:
    'Each anode material and separator has a current density it is usually run at; above it, anode coatings wear off, graphite crumbles, lead and copper anodes passivate, and membranes overheat and blister, so the cell heats and may fail during the run. The current density is the step current over the anodes\' area (together) and over each separator\'s area. Lower the current or use larger parts, and check the maker\'s rating.',
  source:
    'Typical maxima, mA/cm²: MMO/DSA anode 600 and perfluorinated cation-exchange membrane 600 (membrane chlor-alkali cells run at about 3-6 kA/m²: EU BREF for the chlor-alkali industry, 2014, from memory); platinum 500, nickel in alkali 500, stainless steel 300, graphite 100, lead 50, soluble copper 30, anion-exchange membrane 500, diaphragm 300: common practice, no source.',
  caution:
    "Run electrodes and membranes within their maker's rated current density, raise the current in steps while watching the cell voltage and temperature, and stop if either climbs. Follow the maker's data, your local codes, the safety data sheets and your institution's licensed practice.",
  check({ model }) {
    const out: Diagnostic[] = []
    // The parts and their limits are the same for every step: found once.
    const limited = limitedParts(model)
    if (limited.length === 0) return out
    for (let idx = 0; idx < model.steps.length; idx++) {
      const s = model.steps[idx]
      if (s.currentA === undefined || !(s.currentA > 0)) continue
      const over = overLimits(limited, s.currentA)
      if (over.length === 0) continue
      const node = model.tree.lines[s.line]
      const clause = node.kind === 'step' ? node.clauses.find((c) => c.keyword.text === 'current') : undefined
      const span: Span = clause ? spanOf(clause.expr) : s.span
      const parts = over.map(
        (o) =>
          `${fmt(o.jmAcm2)} mA/cm² on ${o.part} (${fmt(s.currentA!)} A over ${fmt(o.areaCm2)} cm²), above the ${fmt(o.limit.mAcm2)} mA/cm² ${o.limit.name} usually take: ${o.limit.why}`,
      )
      // With a plain current written, offer the largest current every part takes (rounded down).
      const maxA = Math.min(...over.map((o) => (o.limit.mAcm2 * o.areaCm2) / 1000))
      const plain = s.densityAm2 === undefined && clause
      out.push({
        code: 'current-density-limit',
        severity: 'warning',
        message: `step ${s.label}: ${parts.join('; ')}`,
        span,
        fixes: plain ? [fix(`Lower the current to ${fmtDown(maxA)} A`, span, `${fmtDown(maxA)} A`)] : [],
      })
    }
    return out
  },
}
