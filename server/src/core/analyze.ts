// The entry point of the analysis core: text in, plain data out (syntax tree, model, computed
// values, diagnostics, outline, hovers). No editor or LSP types are used anywhere in the core.
import { RULES } from '../rules'
import { mayBeNoted, NOTED_ANY } from '../rules/noted'
import { gatherIncludes } from './include'
import type { Diagnostic } from './diagnostics'
import { clearFormulaCache, prettyFormula } from './formula'
import { buildModel, engineRuns, simulationRuns, type Computed, type Model, type ModelOptions } from './model'
import { parse, reparse } from './parser'
import { clearSimulationCaches } from './simulate'
import { spanOf, LineIndex, type Span } from './positions'
import { keywordOf, type LineNode, type SyntaxTree } from './syntax'
import { clearExpressionCache, fmt, withGasUnit, withSignificantFigures } from './units'

export interface Analysis {
  text: string
  index: LineIndex
  tree: SyntaxTree
  model: Model
  computed: Computed[]
  diagnostics: Diagnostic[]
  /** The definitions files the document includes (absolute paths), for re-analysis when they change. */
  includedFiles: string[]
}

/**
 * Forget everything kept between analyses (compiled expressions, parsed formulas, engine and
 * simulation results), so that the next analysis costs what a first one does. For benchmarks.
 */
export function clearAnalysisCaches(): void {
  clearExpressionCache()
  clearFormulaCache()
  engineRuns.clear()
  simulationRuns.clear()
  clearSimulationCaches()
}

/**
 * Analyse a protocol. `previous`, the analysis of an earlier version of the same document, lets the
 * parser reuse the lines an edit did not touch (the result is the same as without it).
 */
export function analyze(text: string, options: ModelOptions = {}, previous?: Pick<Analysis, 'text' | 'index' | 'tree'>): Analysis {
  return withSignificantFigures(options.significantFigures ?? 3, () => withGasUnit(options.gasUnit ?? 'L', () => analyzeWith(text, options, previous)))
}

function analyzeWith(text: string, options: ModelOptions, previous?: Pick<Analysis, 'text' | 'index' | 'tree'>): Analysis {
  const index = new LineIndex(text)
  const tree = previous ? reparse(previous, text, index) : parse(text, index)
  // Included definitions are appended after the document and analysed with it; what the analysis
  // says about the appended part is dropped (it belongs to the definitions file).
  let modelTree = tree
  let modelIndex = index
  let modelOptions = options
  let files: string[] = []
  if (options.includes && tree.lines.some((n) => n.kind === 'include')) {
    const got = gatherIncludes(tree.lines, options.includes)
    files = got.files
    modelOptions = { ...options, includeProblems: got.problems }
    if (got.defs) {
      const combined = text + (text === '' || /[\r\n]$/.test(text) ? '' : '\n') + got.defs + '\n'
      modelIndex = new LineIndex(combined)
      modelTree = parse(combined, modelIndex)
      modelOptions.definitionsFrom = modelIndex.lineOf(text.length === 0 || /[\r\n]$/.test(text) ? text.length : text.length + 1)
    }
  }
  const model = buildModel(modelTree, modelOptions)
  const inDocument = (span: Span) => span.start < text.length || (span.start === text.length && modelTree === tree)
  const diagnostics: Diagnostic[] = []
  for (const rule of RULES) {
    try {
      diagnostics.push(...rule.check({ model, index: modelIndex }).filter((d) => inDocument(d.span)))
    } catch (e) {
      // A failing rule must not hide the others' findings.
      diagnostics.push({
        code: rule.code,
        severity: 'hint',
        message: `internal error in rule ${rule.code}: ${e instanceof Error ? e.message : String(e)}`,
        span: { start: 0, end: 0 },
        fixes: [],
      })
    }
  }
  const settled = applyNotesAndSeverities(diagnostics, tree, text, index, options)
  settled.sort((a, b) => a.span.start - b.span.start || a.span.end - b.span.end || a.code.localeCompare(b.code))
  const computed = modelTree === tree ? model.computed : model.computed.filter((c) => inDocument(c.span) && c.anchor <= text.length)
  return { text, index, tree, model, computed, diagnostics: settled, includedFiles: files }
}


/**
 * Each rule's caution travels with its findings; a finding noted on its line with a reason becomes
 * information (its caution still shown); settings change a rule's severity or turn it off.
 */
function applyNotesAndSeverities(diagnostics: Diagnostic[], tree: SyntaxTree, text: string, index: LineIndex, options: ModelOptions): Diagnostic[] {
  const notes = new Map<number, Map<string, string>>()
  for (let li = 0; li < tree.lines.length; li++) {
    const n = tree.lines[li]
    if (!n.comment || !mayBeNoted(text, n.comment.start)) continue
    const m = NOTED_ANY.exec(text.slice(n.comment.start, n.comment.end).trim())
    if (m && m[2]?.trim()) {
      if (!notes.has(n.line)) notes.set(n.line, new Map())
      notes.get(n.line)!.set(m[1], m[2].trim())
    }
  }
  const byCode = new Map(RULES.map((r) => [r.code, r]))
  const out: Diagnostic[] = []
  for (const d of diagnostics) {
    const rule = byCode.get(d.code)
    const setting = options.severities?.[d.code]
    if (setting === 'off') continue
    const withCaution: Diagnostic = { ...d, ...(rule?.caution && !d.caution ? { caution: rule.caution } : {}) }
    if (setting) withCaution.severity = setting
    const reason = notes.get(index.lineOf(d.span.start))?.get(d.code)
    if (reason) {
      withCaution.noted = reason
      withCaution.severity = 'information'
      withCaution.message = `noted (${reason}): ${d.message}`
    }
    out.push(withCaution)
  }
  return out
}


export interface Hover {
  span: Span
  /** Markdown. */
  markdown: string
}

/** What to show when the pointer rests at `offset`: the working behind a computed value, or a formula's mass. */
export function hoverAt(a: Analysis, offset: number): Hover | undefined {
  const line = a.index.lineOf(offset)
  const f = a.model.formulas.find((x) => x.line === line && offset >= x.tok.start && offset <= x.tok.end)
  const here = a.computed.filter((c) => c.line === line && offset >= c.span.start && offset <= c.span.end)
  const parts: string[] = []
  if (f && f.formula.ok) {
    const counts = [...f.formula.counts].map(([el, n]) => `${el}${n === 1 ? '' : ' ×' + fmt(n, 6)}`).join(', ')
    parts.push(
      `**${prettyFormula(f.formula.text)}**: M = ${fmt(f.formula.molarMass, 6)} g/mol` +
        (f.formula.charge ? `, charge ${f.formula.charge > 0 ? '+' : ''}${f.formula.charge}` : '') +
        `\n\n${counts}  \n*(IUPAC 2021 standard atomic weights)*`,
    )
  }
  for (const c of here) {
    parts.push(`**${c.title}**\n\n${c.working.map((w) => `    ${w}`).join('\n')}`)
  }
  if (parts.length === 0) return undefined
  const span = f ? spanOf(f.tok) : here[0].span
  return { span, markdown: parts.join('\n\n---\n\n') }
}

export interface OutlineItem {
  name: string
  detail: string
  kind: 'run' | 'cell' | 'compartment' | 'separator' | 'electrode' | 'vessel' | 'charge' | 'step' | 'expect' | 'observe' | 'value' | 'handling' | 'conditions' | 'reaction'
  span: Span
  selection: Span
  children: OutlineItem[]
}

/** The document outline: run, values, the cell and its parts, charges, steps, yields, handling. */
export function outline(a: Analysis): OutlineItem[] {
  const items: OutlineItem[] = []
  let cell: OutlineItem | undefined
  const item = (n: LineNode, kind: OutlineItem['kind'], name: string, detail: string, selection = n.span): OutlineItem => ({
    name: name || kind,
    detail,
    kind,
    span: n.span,
    selection,
    children: [],
  })
  for (let li = 0; li < a.tree.lines.length; li++) {
    const n = a.tree.lines[li]
    switch (n.kind) {
      case 'run':
        items.push(item(n, 'run', n.title.text, 'run'))
        break
      case 'conditions':
        items.push(item(n, 'conditions', 'conditions', n.items.map((i) => i.text).join(', ')))
        break
      case 'let':
        items.push(item(n, 'value', n.name.text, n.expr.text, spanOf(n.name)))
        break
      case 'cell':
        cell = item(n, 'cell', 'cell', '')
        items.push(cell)
        break
      case 'compartment':
      case 'separator':
      case 'electrode':
      case 'vessel': {
        const child =
          n.kind === 'compartment'
            ? item(n, 'compartment', n.name.text, n.volume.text, spanOf(n.name))
            : n.kind === 'separator'
              ? item(n, 'separator', n.type.text, `${n.between[0].text} | ${n.between[1].text}`, spanOf(n.type))
              : n.kind === 'electrode'
                ? item(n, 'electrode', n.role, `${n.material.text} in ${n.compartment.text}`, spanOf(keywordOf(n) ?? n.span))
                : item(n, 'vessel', 'vessel', n.material.text, spanOf(n.material))
        if (cell && n.inCell) {
          cell.children.push(child)
          cell.span = { start: cell.span.start, end: n.span.end }
        } else items.push(child)
        break
      }
      case 'charge':
        items.push(item(n, 'charge', `charge ${n.compartment.text}`, n.items.map((i) => i.formula.text).join(', '), spanOf(n.compartment)))
        break
      case 'step':
        items.push(item(n, 'step', `step ${n.label.text}`, n.clauses.map((c) => `${c.keyword.text} ${c.expr.text}`).join(', '), spanOf(n.label)))
        break
      case 'expect':
      case 'observe':
        items.push(item(n, n.kind, `${n.kind} ${n.formula.text}`, n.quantity.text, spanOf(n.formula)))
        break
      case 'handling':
        items.push(item(n, 'handling', `handling ${n.type.text}`, n.text.text, spanOf(n.type)))
        break
      case 'reaction':
        items.push(item(n, 'reaction', `reaction ${n.role.text}`, n.equation.text, spanOf(n.role)))
        break
    }
  }
  return items
}
