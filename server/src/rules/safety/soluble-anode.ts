// soluble-anode: the anode is a metal that dissolves instead of evolving gas, and the cathode does not
// deposit that metal again (so this is not plating or refining with a soluble anode). Stainless steel
// and other chromium-bearing anodes are left to chromium-anode, which reports their chromate as an error.
import { spanOf } from '../../core/positions'
import { fix } from '../../core/diagnostics'
import { ATOMIC_WEIGHTS, ELEMENT_NAMES } from '../../core/elements'
import { prettyFormula } from '../../core/formula'
import { fmt } from '../../core/units'
import type { Rule } from '../rule'
import { chromiumRun } from './chromium-anode'
import { produced } from './facts'

export const solubleAnode: Rule = {
  code: 'soluble-anode',
  severity: 'warning',
  category: 'safety',
  summary: 'A metal anode dissolves into the solution instead of evolving gas, and the cathode does not deposit that metal back.',
  details:
    'A soluble anode (copper, zinc, silver, tin, iron and plain steels, nickel outside alkali) passes its current by dissolving: the anode thins and may break off, the solution fills with its metal ions (some toxic, such as nickel or cadmium), and the gas or product the run aims at is not made. Plating and refining use this on purpose, with the cathode depositing the same metal; otherwise choose an inert anode suited to the anolyte. Stainless-steel anodes are reported by chromium-anode.',
  source:
    "Which anode dissolves: Cellrun's anode choice (standard potentials, CRC electrochemical series, from memory); the amount: Faraday's law at 100 % anode efficiency. The inert anodes suggested (MMO-titanium for chloride, platinised titanium for acid, nickel for alkali): common practice, no source.",
  caution:
    "A dissolving anode leaves metal-bearing solution to be collected and disposed of as hazardous waste, and can give off unexpected by-products; check the anode material against the electrolyte before the run. Follow your local codes, the safety data sheets and your institution's licensed practice.",
  check({ model }) {
    const e = model.engine
    const a = e?.anode
    if (!e || !a || a.kind !== 'dissolution' || !a.metal) return []
    const el = a.metal.element
    if (e.cathode?.kind === 'deposition' && e.cathode.metal?.element === el) return []
    const anode = model.electrodes.find((x) => x.role === 'anode' && x.material.text === a.material && x.compartment === a.compartment)
    if (!anode || chromiumRun(anode.material.text)) return []
    const mol = produced(model, `${el}^${a.metal.charge}+`)
    const g = mol * (ATOMIC_WEIGHTS[el] ?? NaN)
    const ions = e.ions.get(a.compartment)
    const chloride = (ions?.anions.get('Cl')?.mol ?? 0) > 0
    const alkaline = e.ph.get(a.compartment) === 'alkaline'
    const inert = chloride ? 'mmo-titanium' : alkaline ? 'nickel' : 'platinized-titanium'
    const why = chloride ? 'for a chloride anolyte' : alkaline ? 'for an alkaline anolyte' : e.ph.get(a.compartment) === 'neutral' ? 'for a neutral anolyte' : 'for an acid anolyte'
    const amount = mol > 0 && Number.isFinite(g) ? `: about ${fmt(g)} g of ${ELEMENT_NAMES[el]?.toLowerCase() ?? el} (${fmt(mol)} mol ${prettyFormula(`${el}^${a.metal.charge === 1 ? '' : a.metal.charge}+`)}) over the run` : ''
    const cathode = e.cathode?.kind === 'deposition' && e.cathode.metal ? `the cathode deposits ${e.cathode.metal.element}, not ${el}` : 'the cathode does not deposit it back'
    return [
      {
        code: 'soluble-anode',
        severity: 'warning',
        message: `the ${a.material} anode dissolves into ${a.compartment} instead of evolving gas, and ${cathode}${amount}`,
        span: spanOf(anode.material),
        fixes: [fix(`Use an inert ${inert} anode (${why})`, spanOf(anode.material), inert)],
      },
    ]
  },
}
