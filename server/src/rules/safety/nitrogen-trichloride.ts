// nitrogen-trichloride: an ammonium salt, ammonia, an amine or urea is charged into a solution
// where an anode makes chlorine from chloride: chlorine and the nitrogen compound form nitrogen
// trichloride (NCl3), a sensitive explosive.
import { spanOf } from '../../core/positions'
import type { Diagnostic } from '../../core/diagnostics'
import { prettyFormula, type Formula } from '../../core/formula'
import type { Rule } from '../rule'
import { chlorineSite } from './chlorine-handling'

/** What kind of chlorinatable nitrogen compound a formula is, if it is one (kept simple on purpose). */
export function nitrogenSource(f: Formula, text: string): string | undefined {
  if (!f.ok || !f.counts.has('N')) return undefined
  const n = (el: string) => f.counts.get(el) ?? 0
  if (/NH4/.test(text)) return 'an ammonium salt'
  if (f.counts.size === 2 && n('N') === 1 && n('H') === 3 && f.charge === 0) return 'ammonia'
  if (f.counts.size === 4 && n('C') === 1 && n('N') === 2 && n('H') === 4 && n('O') === 1 && f.charge === 0) return 'urea'
  // Amines (and amides, amino acids): C, N and H, but not a cyanide, cyanate or thiocyanate, a carbonate or a nitrate.
  if (n('C') > 0 && n('H') > 0 && !/CN|NC(?!l)|CO3|NO3/.test(text)) return 'an amine'
  return undefined
}

export const nitrogenTrichloride: Rule = {
  code: 'nitrogen-trichloride',
  severity: 'error',
  category: 'safety',
  summary: 'Ammonium, ammonia, an amine or urea charged where an anode makes chlorine: nitrogen trichloride (NCl3), a sensitive explosive, can form.',
  details:
    'Chlorine (and the hypochlorite it forms) chlorinates ammonium, ammonia, amines and urea step by step to chloramines and finally nitrogen trichloride, an oily, volatile liquid that explodes on shock, heat or light; it collects in the anolyte, in the gas lines and wherever chlorine condenses. ' +
    'Keep nitrogen compounds out of any solution that meets a chlorine-evolving anode: use a nitrogen-free salt, a different anode reaction, or a separate compartment.',
  source: 'NCl3 from ammonium in chlorine production: Euro Chlor GEST 76/55 (nitrogen trichloride) and Ullmann\'s Encyclopedia of Industrial Chemistry, "Chlorine", from memory; no figure used',
  caution:
    'Do not electrolyse chloride solutions that contain ammonium, ammonia, amines or urea with an anode that can make chlorine; if such a run is unavoidable it needs a specific hazard assessment. ' +
    "Follow your local codes, the safety data sheets and your institution's licensed practice.",
  check({ model }) {
    const site = chlorineSite(model)
    if (!site) return []
    const out: Diagnostic[] = []
    for (let li = 0; li < model.tree.lines.length; li++) {
      const n = model.tree.lines[li]
      if (n.kind !== 'charge' || !site.solution.has(n.compartment.text)) continue
      for (const item of n.items) {
        const ff = model.formulas.find((x) => x.line === n.line && x.tok.start === item.formula.start)
        if (!ff || ff.isWater) continue
        const what = nitrogenSource(ff.formula, ff.tok.text)
        if (!what) continue
        out.push({
          code: 'nitrogen-trichloride',
          severity: 'error',
          message:
            `${prettyFormula(ff.tok.text)} (${what}) is charged into ${n.compartment.text}, where chlorine forms (${site.why}): ` +
            'chlorine and the nitrogen compound form nitrogen trichloride, NCl₃, a sensitive explosive',
          span: spanOf(ff.tok),
          fixes: [],
        })
      }
    }
    return out
  },
}
