// The editor's hover: the analysis hover (working behind a computed value, a formula's molar mass)
// with what the data tables hold for a hovered formula: its solubility at the run temperature and
// the range of its 20 °C density table.
import { hoverAt, type Analysis, type Hover } from './analyze'
import { dataNotes } from './species'

const SEPARATOR = '\n\n---\n\n'

export function hoverWithData(a: Analysis, offset: number): Hover | undefined {
  const h = hoverAt(a, offset)
  if (!h) return undefined
  const line = a.index.lineOf(offset)
  const f = a.model.formulas.find((x) => x.line === line && offset >= x.tok.start && offset <= x.tok.end)
  if (!f || !f.formula.ok || f.isWater) return h
  const notes = dataNotes(f.tok.text, a.model.temperatureK)
  if (notes.length === 0) return h
  // The formula part comes first in the analysis hover; the data goes right after it.
  const cut = h.markdown.indexOf(SEPARATOR)
  const head = cut < 0 ? h.markdown : h.markdown.slice(0, cut)
  const rest = cut < 0 ? '' : h.markdown.slice(cut)
  return { span: h.span, markdown: `${head}\n\n${notes.join('\n\n')}${rest}` }
}
