// chromium-anode: a stainless-steel or other chromium-bearing anode. Anodically, the chromium in it
// dissolves transpassively as chromate, hexavalent chromium, a carcinogen; in chloride the steel
// also pits and dissolves.
import type { Diagnostic } from '../../core/diagnostics'
import { parseFormula } from '../../core/formula'
import type { Span } from '../../core/positions'
import { fmt } from '../../core/units'
import type { Rule } from '../rule'
import { chloridesIn, sharedSolution } from './chlorine-handling'

/** Stainless grades (AISI/SAE, from memory), written bare or after `ss`, `aisi` or `sus`: 304, 316L, 430... */
const GRADE = '(?:20[12]|30[1-49]|31[067]|321|347|41[06]|420|430|440[abc]?|904)(?:l|ln|ti|h)?'
const GRADE_PART = new RegExp(`^(?:ss|aisi|sus)?${GRADE}$`, 'i')
/** Names of chromium-bearing alloys, as one part of a (possibly hyphenated) material word. */
const ALLOY_PART = /^(?:stainless|ss|inconel\d*|incoloy\d*|hastelloy[a-z0-9]*|nichrome|kanthal|fecral|stellite\d*|duplex|superduplex)$/i

/** Is this material word chromium-bearing? Each hyphen-separated part is tested (`stainless-steel`, `aisi-316`, `chrome-plated`). */
export function chromiumWord(word: string): boolean {
  return word.split('-').some((p) => /chrom/i.test(p) || ALLOY_PART.test(p) || GRADE_PART.test(p))
}

/** The chromium-bearing words of a material, as one span (with a `steel` word next to them), relative to the material's start. */
export function chromiumRun(material: string): { start: number; end: number } | undefined {
  const words = [...material.matchAll(/\S+/g)].map((m) => ({ text: m[0], start: m.index!, end: m.index! + m[0].length }))
  for (let i = 0; i < words.length; i++) {
    if (!chromiumWord(words[i].text) && !/^steel$/i.test(words[i].text)) continue
    let j = i
    while (j + 1 < words.length && (chromiumWord(words[j + 1].text) || /^steel$/i.test(words[j + 1].text))) j++
    if (words.slice(i, j + 1).some((w) => chromiumWord(w.text))) return { start: words[i].start, end: words[j].end }
    i = j
  }
  return undefined
}

/** Chromium in type 304 stainless, mass fraction (18-20 wt %: ASTM A240, from memory; the lower bound). */
const CR_IN_304 = 0.18

export const chromiumAnode: Rule = {
  code: 'chromium-anode',
  severity: 'error',
  category: 'safety',
  summary: 'A stainless-steel or other chromium-bearing anode: it releases hexavalent chromium (chromate), a carcinogen.',
  details:
    'As an anode, the chromium in stainless steel, nichrome, Inconel, Hastelloy and similar alloys dissolves transpassively as chromate, Cr(VI), which is carcinogenic and toxic to handle and to dispose of; in chloride the steel also pits and dissolves quickly. ' +
    'Use a dimensionally stable anode instead: mixed-metal-oxide coated titanium in chloride, platinized titanium in acid or neutral solution, nickel in alkaline solution.',
  source: 'Cr(VI) compounds carcinogenic to humans (Group 1): IARC Monographs vol. 100C (2012), from memory; 18-20 wt % Cr in type 304 stainless: ASTM A240, from memory',
  caution:
    'Do not use chromium-bearing alloys as anodes; where such a run has happened, treat the electrolyte and deposits as containing hexavalent chromium (gloves, no aerosols, collected as hazardous waste). ' +
    "Follow your local codes, the safety data sheets and your institution's licensed practice.",
  check({ model }) {
    const out: Diagnostic[] = []
    const e = model.engine
    for (const el of model.electrodes) {
      if (el.role !== 'anode') continue
      const run = chromiumRun(el.material.text)
      if (!run) continue
      const span: Span = { start: el.material.start + run.start, end: el.material.start + run.end }
      const word = el.material.text.slice(run.start, run.end)
      const solution = sharedSolution(model, el.compartment)
      const replacement = chloridesIn(model, solution).length > 0 ? 'mmo-titanium' : e?.ph.get(el.compartment) === 'alkaline' ? 'nickel' : 'platinized-titanium'
      const facts: string[] = []
      // Highest anode current density over the steps, when the anode's area is known.
      const anodes = model.electrodes.filter((x) => x.role === 'anode')
      const area = anodes.every((x) => x.areaCm2 !== undefined) ? anodes.reduce((t, x) => t + x.areaCm2!, 0) : undefined
      const peakA = Math.max(0, ...model.steps.map((s) => s.currentA ?? 0))
      if (area && peakA > 0) facts.push(`up to ${fmt((1000 * peakA) / area)} mA/cm² at the anode`)
      // Where the engine has the anode dissolving (stainless pitting in chloride): how much, and its chromium.
      const isEngineAnode = e?.anode?.compartment === el.compartment && e.anode.material === el.material.text
      if (isEngineAnode && e!.anode!.kind === 'dissolution') {
        const mol = e!.totals.filter((p) => p.origin === 'anode' && p.compartment === el.compartment && p.formula === 'Fe^2+').reduce((t, p) => t + p.mol, 0)
        const g = mol * parseFormula('Fe').molarMass
        if (g > 0) facts.push(`the engine has about ${fmt(g)} g of the anode dissolving (counted as iron), with some ${fmt(g * CR_IN_304)} g chromium at 18 % Cr (type 304)`)
      }
      out.push({
        code: 'chromium-anode',
        severity: 'error',
        message:
          `${word} is a chromium-bearing anode: its chromium dissolves transpassively as chromate, hexavalent chromium (a carcinogen)` +
          (facts.length ? `; ${facts.join('; ')}` : ''),
        span,
        fixes: [{ title: `Change the anode material to ${replacement}`, edits: [{ span, newText: replacement }] }],
      })
    }
    return out
  },
}
