// undivided-chloride: a chloride solution electrolysed at a chlorine anode with the cathode in the
// same solution. The chlorine meets the hydroxide made at the cathode and forms hypochlorite, and
// warm hypochlorite turns to chlorate; acid releases the chlorine again; ammonium gives nitrogen
// trichloride; chlorate with organics is an explosion hazard.
import type { Diagnostic } from '../../core/diagnostics'
import { CHLORIDE_FOR_CHLORINE, ionsOf } from '../../core/engine'
import { parseFormula, prettyFormula } from '../../core/formula'
import type { Model } from '../../core/model'
import { ZERO_CELSIUS } from '../../core/constants'
import type { Span } from '../../core/positions'
import { fmt } from '../../core/units'
import type { Rule } from '../rule'
import { cellSpan, peakTemperature } from './facts'

/** From this temperature hypochlorite turns to chlorate at a useful rate (the simulation's own threshold; common practice, no source). */
const WARM_CELSIUS = 40
const STRONG_ACID_ANIONS = new Set(['Cl', 'SO4', 'HSO4', 'NO3', 'Br', 'I', 'ClO4'])
const INORGANIC_CARBON = new Set(['CO3', 'HCO3', 'CN'])

export type Kind = 'ammonium' | 'organic' | 'acid' | 'reducing'

/** What a charged substance means in a hypochlorite/chlorate solution, if anything. */
export function classify(text: string): Kind | undefined {
  const bare = text.replace(/\((aq|s|l|g)\)$/, '')
  const f = parseFormula(bare)
  if (!f.ok) return undefined
  const els = [...f.counts.keys()]
  const i = ionsOf(f)
  const onlyNH = els.length === 2 && f.counts.has('N') && f.counts.has('H')
  if (/NH4/.test(bare) || (onlyNH && f.counts.get('N') === 1 && f.counts.get('H') === 3)) return 'ammonium'
  if (f.counts.has('C') && f.counts.has('H') && !(i && INORGANIC_CARBON.has(i.anion))) return 'organic'
  if (i && i.cation === 'H' && STRONG_ACID_ANIONS.has(i.anion)) return 'acid'
  // Nitrite, hydrazine, sulfite/bisulfite/metabisulfite/thiosulfate/dithionite, sulfide, hydrogen peroxide.
  if (i?.anion === 'NO2' || onlyNH) return 'reducing'
  const S = f.counts.get('S') ?? 0
  const O = f.counts.get('O') ?? 0
  if (S > 0 && !f.counts.has('C') && !f.counts.has('N') && O - f.hydrateWater < 4 * S) return 'reducing'
  if (els.length === 2 && f.counts.get('H') === 2 && O === 2) return 'reducing'
  return undefined
}

interface Item {
  span: Span
  formula: string
  compartment: string
  kind: Kind
}

/** Chloride in a compartment, mol/L, from every chloride charged (ammonium chloride included); 0 without a volume. */
function chlorideMolar(model: Model, name: string): number {
  const c = model.compartments.get(name)
  if (!c?.volumeL) return 0
  let mol = 0
  for (const s of c.solutes.values()) {
    const f = s.formula
    // A chloride: chlorine with no oxygen beyond hydrate water (not hypochlorite, chlorate, perchlorate).
    if (f.ok && f.counts.has('Cl') && (f.counts.get('O') ?? 0) - f.hydrateWater === 0) mol += s.mol * f.counts.get('Cl')!
  }
  return mol / c.volumeL
}

function itemsIn(model: Model, compartments: Set<string>): Item[] {
  const out: Item[] = []
  for (let li = 0; li < model.tree.lines.length; li++) {
    const n = model.tree.lines[li]
    if (n.kind !== 'charge' || !compartments.has(n.compartment.text)) continue
    for (const it of n.items) {
      const kind = classify(it.formula.text)
      if (kind) out.push({ span: it.span, formula: it.formula.text, compartment: n.compartment.text, kind })
    }
  }
  return out
}

export const undividedChloride: Rule = {
  code: 'undivided-chloride',
  severity: 'warning',
  category: 'safety',
  summary: 'A chloride solution at a chlorine anode with the cathode in the same solution: hypochlorite and chlorate form; acid releases chlorine; ammonium or organics make it explosive.',
  details:
    'Without a separator the chlorine made at the anode meets the hydroxide made at the cathode and forms hypochlorite; from about 40 °C the hypochlorite turns to chlorate. ' +
    'Warm solution holds less chlorine, and any acid added releases chlorine gas from the hypochlorite and chloride; reducing agents react with it, with heat. ' +
    'Ammonium salts or ammonia with chlorine form nitrogen trichloride, which explodes, and chlorate with organics (sugars, alcohols, acetate) is an explosive mixture when it dries or is heated: keep both out of such a cell (an error). Divide the cell if hypochlorite is not the product.',
  source:
    'Hypochlorite from chlorine and hydroxide, chlorate from warm hypochlorite: hypochlorite and chlorate cell practice (Ullmann\'s Encyclopedia, "Chlorine oxides and chlorine oxygen acids", from memory). ' +
    'Nitrogen trichloride from ammonium and chlorine, chlorate-organic mixtures as explosives: Bretherick\'s Handbook of Reactive Chemical Hazards, from memory. The 40 °C threshold: common practice, no source.',
  caution:
    'Keep an undivided chloride cell cool and alkaline, keep ammonium salts, ammonia and organic matter out of it, and treat its off-gas as chlorine-bearing; hypochlorite and chlorate solutions are oxidisers, and chlorate residues must not dry on organic material. Follow your local codes, the safety data sheets and your institution\'s licensed practice.',
  check({ model }) {
    const e = model.engine
    if (!e?.anode || !e.cathode || e.coupling !== 'same') return []
    // A chlorine anode: as the engine chose it, or an inert (oxygen) anode over chloride the engine
    // does not split into ions (ammonium chloride), at the engine's own chloride threshold.
    const chlorine = e.anode.kind === 'chlorine' || (e.anode.kind === 'oxygen' && chlorideMolar(model, e.anode.compartment) >= CHLORIDE_FOR_CHLORINE)
    if (!chlorine) return []
    const shared = new Set([e.anode.compartment, e.cathode.compartment])
    const peakC = peakTemperature(model) - ZERO_CELSIUS
    const warm = peakC >= WARM_CELSIUS - 1e-9
    const final = model.simulation?.final.filter((c) => shared.has(c.name)) ?? []
    const chlorateMol = final.reduce((t, c) => t + (c.species['ClO3^-'] ?? 0), 0)
    const hypoMol = model.simulation
      ? final.reduce((t, c) => t + (c.species['ClO^-'] ?? 0), 0)
      : (e.totals ?? []).filter((p) => /ClO(\^-)?$/.test(p.formula)).reduce((t, p) => t + p.mol, 0)
    const chlorateMayForm = warm || chlorateMol > 1e-9
    const items = itemsIn(model, shared)
    const acids = items.filter((x) => x.kind === 'acid')
    const reducing = items.filter((x) => x.kind === 'reducing')
    const ammonium = items.filter((x) => x.kind === 'ammonium')
    const names = (xs: Item[]) => [...new Set(xs.map((x) => prettyFormula(x.formula)))].join(', ')

    const formed: string[] = []
    if (hypoMol > 1e-9) formed.push(`${fmt(hypoMol)} mol hypochlorite`)
    if (chlorateMol > 1e-9) formed.push(`${fmt(chlorateMol)} mol chlorate`)
    const amounts = formed.length ? ` (${model.simulation ? 'simulated end of run' : 'by the charge passed'}: ${formed.join(', ')})` : ''
    const also: string[] = []
    if (warm) also.push(`at ${fmt(peakC)} °C the hypochlorite turns to chlorate and less chlorine stays dissolved`)
    if (acids.length) also.push('acid releases chlorine gas from any hypochlorite and chloride it meets')
    if (reducing.length) also.push(`reducing agents charged (${names(reducing)}) react with the hypochlorite, with heat and gas`)
    if (ammonium.length) also.push(`ammonium charged (${names(ammonium)}) forms explosive nitrogen trichloride with the chlorine`)
    const out: Diagnostic[] = [
      {
        code: 'undivided-chloride',
        severity: 'warning',
        message:
          (acids.length
            ? `undivided chloride cell with acid charged (${names(acids)}): the chlorine from the anode comes off as gas while the acid lasts, then meets the hydroxide from the cathode and forms hypochlorite${warm ? ' and chlorate' : ''}${amounts}`
            : `undivided chloride cell: the chlorine from the anode meets the hydroxide from the cathode and forms hypochlorite${warm ? ' and chlorate' : ''}${amounts}`) +
          (also.length ? `; ${also.join('; ')}` : ''),
        span: cellSpan(model),
        fixes: [],
      },
    ]
    for (const x of items) {
      // Cool, ammonium's hazard is nitrogen trichloride, named on the cell line (and the subject of its own rule);
      // with chlorate forming it is also an explosive ammonium chlorate mixture, reported here.
      if (x.kind === 'ammonium' && chlorateMayForm) {
        out.push({
          code: 'undivided-chloride',
          severity: 'error',
          message: `${prettyFormula(x.formula)} (ammonium) in ${x.compartment} with the chlorate this cell forms${chlorateMol > 1e-9 ? ` (${fmt(chlorateMol)} mol simulated)` : ` at ${fmt(peakC)} °C`}: ammonium chlorate is an unstable explosive, and the chlorine forms nitrogen trichloride`,
          span: x.span,
          fixes: [],
        })
      } else if (x.kind === 'organic') {
        out.push({
          code: 'undivided-chloride',
          severity: chlorateMayForm ? 'error' : 'warning',
          message: chlorateMayForm
            ? `${prettyFormula(x.formula)} (organic) in ${x.compartment} with the chlorate this cell forms${chlorateMol > 1e-9 ? ` (${fmt(chlorateMol)} mol simulated)` : ` at ${fmt(peakC)} °C`}: chlorate with organics is an explosion hazard, above all when it dries or is heated`
            : `${prettyFormula(x.formula)} (organic) in ${x.compartment} with the hypochlorite this cell forms: hypochlorite chlorinates organics, and from ${WARM_CELSIUS} °C the chlorate that forms makes an explosive mixture with them`,
          span: x.span,
          fixes: [],
        })
      }
    }
    return out
  },
}
