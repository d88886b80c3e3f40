// Completion: what may be typed at a place in a protocol, from the line's text before the cursor.
// Statement keywords at the start of a line, clause words in a step, separator and handling
// kinds, electrode and vessel materials, compartment names, `let` names and units inside
// expressions, and formulas (with their molar masses) where a substance is named.
import type { Analysis } from './analyze'
import { commentStart } from './parser'
import type { Span } from './positions'
import { ATOMIC_WEIGHTS_SOURCE, chargeSpecies, molarMassLine, productSpecies } from './species'
import { CELL_KEYWORDS, HANDLING_KINDS, SEPARATOR_KINDS, STATEMENT_KEYWORDS, STEP_CLAUSES } from './syntax'
import { isUnitSymbol } from './units'

export type CompletionKind = 'keyword' | 'clause' | 'kind' | 'material' | 'compartment' | 'value' | 'unit' | 'formula' | 'option'

export interface CompletionItem {
  label: string
  kind: CompletionKind
  /** A short note beside the label. */
  detail?: string
  /** One line (markdown) shown with the item. */
  documentation?: string
  /** Plain text to insert (no snippet syntax); the label when absent. */
  insertText?: string
  /** The text the item replaces: the word typed so far (empty at the cursor when none). */
  replace: Span
  /** Order within the list. */
  sortText?: string
}

/** One line per statement keyword, after the README's table. */
export const KEYWORD_DOCS: Readonly<Record<(typeof STATEMENT_KEYWORDS)[number], { insert: string; doc: string }>> = {
  run: { insert: 'run ', doc: '`run "TITLE"`: the run\'s title.' },
  note: { insert: 'note ', doc: '`note TEXT`: free text for people; not analysed.' },
  conditions: { insert: 'conditions ', doc: '`conditions T, P`: run temperature and/or pressure (default 25 °C, 101.325 kPa).' },
  let: { insert: 'let ', doc: '`let NAME = EXPR`: a named value that later lines use in expressions.' },
  cell: { insert: 'cell', doc: '`cell`: starts the cell description; its parts follow on indented lines.' },
  vessel: { insert: 'vessel ', doc: '`vessel MATERIAL`: what the cell body is made of.' },
  compartment: { insert: 'compartment ', doc: '`compartment NAME VOLUME`: a compartment and its liquid volume.' },
  separator: { insert: 'separator ', doc: '`separator KIND between A and B[, area EXPR][, drag N]`: a membrane or diaphragm between two compartments.' },
  anode: { insert: 'anode ', doc: '`anode MATERIAL in COMPARTMENT[, area EXPR]`: an anode.' },
  cathode: { insert: 'cathode ', doc: '`cathode MATERIAL in COMPARTMENT[, area EXPR]`: a cathode.' },
  charge: { insert: 'charge ', doc: '`charge COMPARTMENT: ITEM, ITEM, ...`: what goes into a compartment.' },
  step: { insert: 'step ', doc: '`step LABEL: current EXPR, voltage EXPR, for DURATION, efficiency EXPR`: a run step.' },
  expect: { insert: 'expect ', doc: '`expect FORMULA AMOUNT [in COMPARTMENT]`: the planned amount after the run.' },
  observe: { insert: 'observe ', doc: '`observe FORMULA AMOUNT [in COMPARTMENT]`: the measured amount; gives the real current efficiency.' },
  handling: { insert: 'handling ', doc: '`handling KIND: TEXT`: a declared arrangement (vent, scrubber, hood, cooling, ppe, shield, detector).' },
  reaction: { insert: 'reaction ', doc: '`reaction anode: EQUATION`: states an electrode\'s half-reaction (likewise `cathode`).' },
  material: { insert: 'material ', doc: '`material NAME: DESCRIPTION`: declares a house electrode material; completion offers it after `anode` and `cathode`.' },
  include: { insert: 'include "', doc: '`include "PATH"`: takes the named values and the cell from a definitions file in the same workspace.' },
}

const CLAUSE_DOCS: Readonly<Record<(typeof STEP_CLAUSES)[number], string>> = {
  current: 'a current (`1.5 A`) or a current density (`40 mA/cm^2`, times the cathode area)',
  voltage: 'the cell voltage; with a current it gives the energy',
  for: 'the step duration (`2 h`, `1 h 30 min`)',
  efficiency: 'the share of the charge that makes the main product (`85 %`)',
}

const SEPARATOR_DOCS: Readonly<Record<(typeof SEPARATOR_KINDS)[number], string>> = {
  'cation-exchange': 'passes cations (Na⁺, K⁺) from the anode side to the cathode side',
  'anion-exchange': 'passes anions from the cathode side to the anode side',
  diaphragm: 'a porous separator, not ion-selective',
  none: 'no separator: the two compartments are one solution',
}

const HANDLING_DOCS: Readonly<Record<(typeof HANDLING_KINDS)[number], string>> = {
  vent: 'gas piped away (hydrogen)',
  scrubber: 'off-gas absorbed (chlorine in caustic)',
  hood: 'the cell runs under local exhaust',
  cooling: 'a jacket or coil holds the temperature',
  ppe: 'personal protective equipment',
  shield: 'a splash or blast shield',
  detector: 'a gas detector',
}

/** Electrode materials the analysis knows by name (what they do is in the engine and the rules). */
export const ELECTRODE_MATERIALS: readonly { name: string; doc: string }[] = [
  { name: 'mmo-titanium', doc: 'mixed-metal-oxide (DSA) coated titanium: inert; chlorine from chloride, else oxygen' },
  { name: 'platinum', doc: 'inert anode or cathode' },
  { name: 'platinized-titanium', doc: 'platinised titanium: inert, for acid electrolytes' },
  { name: 'graphite', doc: 'inert carbon; wears at high current density' },
  { name: 'boron-doped-diamond', doc: 'inert, high oxygen overpotential' },
  { name: 'nickel', doc: 'cathode, or an oxygen anode in alkali (dissolves outside alkali)' },
  { name: 'lead', doc: 'forms PbO₂ and evolves oxygen in sulfate (electrowinning)' },
  { name: 'copper', doc: 'soluble anode (plating, refining); cathode' },
  { name: 'steel', doc: 'cathode; a soluble anode' },
  { name: 'stainless-steel', doc: 'cathode; as an anode it releases chromate' },
  { name: 'titanium', doc: 'cathode or substrate' },
  { name: 'zinc', doc: 'soluble anode (zinc plating); cathode' },
  { name: 'silver', doc: 'soluble anode (silver plating)' },
  { name: 'tin', doc: 'soluble anode (tin plating)' },
  { name: 'iron', doc: 'cathode; a soluble anode' },
]

export const VESSEL_MATERIALS: readonly string[] = ['polypropylene', 'pvdf', 'ptfe', 'pvc', 'hdpe', 'acrylic', 'borosilicate-glass', 'glass', 'stainless-steel']

/** Units offered inside expressions, with what they measure. */
export const COMMON_UNITS: readonly { unit: string; doc: string }[] = [
  { unit: 'g', doc: 'gram (mass)' },
  { unit: 'kg', doc: 'kilogram (mass)' },
  { unit: 'mg', doc: 'milligram (mass)' },
  { unit: 'mol', doc: 'mole (amount)' },
  { unit: 'mmol', doc: 'millimole (amount)' },
  { unit: 'L', doc: 'litre (volume)' },
  { unit: 'mL', doc: 'millilitre (volume)' },
  { unit: 'cm^2', doc: 'square centimetre (area)' },
  { unit: 'dm^2', doc: 'square decimetre (area)' },
  { unit: 'm^2', doc: 'square metre (area)' },
  { unit: 'A', doc: 'ampere (current)' },
  { unit: 'mA', doc: 'milliampere (current)' },
  { unit: 'mA/cm^2', doc: 'current density' },
  { unit: 'A/dm^2', doc: 'current density (plating)' },
  { unit: 'kA/m^2', doc: 'current density (chlor-alkali)' },
  { unit: 'V', doc: 'volt (cell voltage)' },
  { unit: 's', doc: 'second (duration)' },
  { unit: 'min', doc: 'minute (duration)' },
  { unit: 'h', doc: 'hour (duration)' },
  { unit: 'C', doc: 'coulomb (charge)' },
  { unit: 'Ah', doc: 'ampere-hour (charge)' },
  { unit: 'mAh', doc: 'milliampere-hour (charge)' },
  { unit: 'Wh', doc: 'watt-hour (energy)' },
  { unit: 'degC', doc: 'degree Celsius (temperature; also `°C`)' },
  { unit: 'K', doc: 'kelvin (temperature)' },
  { unit: 'kPa', doc: 'kilopascal (pressure)' },
  { unit: 'bar', doc: 'bar (pressure)' },
  { unit: 'atm', doc: 'standard atmosphere (pressure)' },
  { unit: 'mol/L', doc: 'molar concentration' },
  { unit: 'M', doc: 'molar, mol/L (concentration)' },
  { unit: 'mM', doc: 'millimolar (concentration)' },
  { unit: 'g/L', doc: 'mass concentration' },
  { unit: 'wt%', doc: 'mass fraction, percent' },
  { unit: '%', doc: 'percent (efficiency)' },
]

const WORD_BEFORE = /[\p{L}_$][\p{L}\p{N}_$-]*$/u
const NAME_BEFORE = /[\p{L}_$][\p{L}\p{N}_$]*$/u

/** Completion items at `offset`. */
export function completionsAt(a: Analysis, offset: number): CompletionItem[] {
  const line = a.index.lineOf(offset)
  const lineStart = a.index.lineStart(line)
  const cursor = Math.max(lineStart, Math.min(offset, a.index.lineEnd(line)))
  const before = a.text.slice(lineStart, cursor)
  // Nothing inside a comment or a quoted title.
  if (commentStart(before) >= 0) return []
  if ((before.match(/"/g)?.length ?? 0) % 2 === 1) return []
  const replaceOf = (re: RegExp): Span => {
    const m = re.exec(before)
    return { start: cursor - (m ? m[0].length : 0), end: cursor }
  }
  const word = replaceOf(WORD_BEFORE)
  const name = replaceOf(NAME_BEFORE)
  const ctx: Ctx = { a, word, name, inLet: /^\s*let\s/.test(before) }

  // The start of a line: a statement keyword (cell parts first when indented).
  let m = /^(\s*)[A-Za-z-]*$/.exec(before)
  if (m) return keywords(word, m[1].length > 0)

  if (/^\s*separator\s+[\w-]*$/.test(before)) return SEPARATOR_KINDS.map((k) => item(k, 'kind', word, 'separator kind', SEPARATOR_DOCS[k]))
  if (/^\s*handling\s+[\w-]*$/.test(before)) return HANDLING_KINDS.map((k) => item(k, 'kind', word, 'handling kind', HANDLING_DOCS[k], `${k}: `))
  if (/^\s*(?:anode|cathode)\s+[\w-]*$/.test(before)) {
    // House materials (declared here or in an included definitions file) first.
    const house = a.model.tree.lines.flatMap((n) => (n.kind === 'material' ? [item(n.name.text, 'material', word, 'house material', n.description?.text ?? 'declared with `material`')] : []))
    return [...house, ...ELECTRODE_MATERIALS.map((x) => item(x.name, 'material', word, 'electrode material', x.doc))]
  }
  if (/^\s*vessel\s+[\w-]*$/.test(before)) return VESSEL_MATERIALS.map((x) => item(x, 'material', word, 'vessel material'))
  if (/^\s*reaction\s+\w*$/.test(before)) return ['anode', 'cathode'].map((r) => item(r, 'keyword', word, 'electrode', undefined, `${r}: `))
  if (/^\s*charge\s+[\w-]*$/.test(before)) return compartments(ctx)

  // Separator: compartments after `between` and `and`; then `, area` / `, drag` and expressions.
  if (/^\s*separator\s/.test(before)) {
    if (/\bbetween\s+[\w-]*$/.test(before) || /\bbetween\s+[\w-]+\s+and\s+[\w-]*$/.test(before)) return compartments(ctx)
    if (/\bbetween\s+[\w-]+\s+and\s+[\w-]+\s*$/.test(before)) return []
    return optionsOrExpression(ctx, before, ['area', 'drag'])
  }
  // Electrode: a compartment after `in`, then `, area` and its expression.
  if (/^\s*(?:anode|cathode)\s/.test(before)) {
    if (!before.includes(',') && /\sin\s+[\w-]*$/.test(before)) return compartments(ctx)
    if (!before.includes(',')) return []
    return optionsOrExpression(ctx, before, ['area'])
  }
  // Charge items: a formula at the start of an item, then its amount.
  if ((m = /^\s*charge\s+[\w-]+\s*:(.*)$/.exec(before))) {
    const current = lastTopLevel(m[1])
    if (/^\s*\S*$/.test(current)) return formulas(ctx, chargeSpecies(), current.trimStart())
    const words = [...(/^\s*\S+\s+\S*$/.test(current) ? [item('solution', 'keyword', word, '`FORMULA solution QUANTITY at CONCENTRATION`')] : [])]
    return [...words, ...expression(ctx)]
  }
  // Expect / observe: a formula, its amount, then `in COMPARTMENT`.
  if ((m = /^\s*(?:expect|observe)\s+(\S*)$/.exec(before))) return formulas(ctx, productSpecies(), m[1])
  if ((m = /^\s*(?:expect|observe)\s+\S+\s+(.*)$/.exec(before))) {
    if (/\sin\s+[\w-]*$/.test(` ${m[1]}`)) return compartments(ctx)
    return [...expression(ctx), ...(/\S\s+\w*$/.test(m[1]) ? [item('in', 'keyword', word, 'the compartment the amount is in', undefined, 'in ')] : [])]
  }
  // Steps: a clause word at the start of a clause; inside an expression, names, units and the next clause word.
  if ((m = /^\s*step\s+[^:]*:(.*)$/.exec(before))) {
    const current = lastTopLevel(m[1])
    const clauses = STEP_CLAUSES.map((c) => item(c, 'clause', word, 'step clause', CLAUSE_DOCS[c], `${c} `))
    if (/^\s*[A-Za-z-]*$/.test(current)) return clauses
    return [...expression(ctx), ...clauses.map((c) => ({ ...c, sortText: `9${c.label}` }))]
  }
  if (/^\s*let\s+[\w-]+\s*=/.test(before)) return expression(ctx)
  if (/^\s*conditions\s/.test(before)) return expression(ctx)
  if (/^\s*compartment\s+[\w-]+\s/.test(before)) return expression(ctx)
  return []
}

interface Ctx {
  a: Analysis
  /** The word before the cursor (letters, digits, `_`, `-`). */
  word: Span
  /** The name before the cursor as an expression reads it (no `-`). */
  name: Span
  /** The cursor is in a `let` line's value. */
  inLet: boolean
}

function item(label: string, kind: CompletionKind, replace: Span, detail?: string, documentation?: string, insertText?: string): CompletionItem {
  return { label, kind, replace, ...(detail ? { detail } : {}), ...(documentation ? { documentation } : {}), ...(insertText ? { insertText } : {}) }
}

function keywords(replace: Span, indented: boolean): CompletionItem[] {
  return STATEMENT_KEYWORDS.map((k) => {
    const cellPart = (CELL_KEYWORDS as readonly string[]).includes(k)
    return {
      ...item(k, 'keyword', replace, cellPart ? 'cell part' : 'statement', KEYWORD_DOCS[k].doc, KEYWORD_DOCS[k].insert),
      sortText: `${indented === cellPart ? 0 : 1}${String(STATEMENT_KEYWORDS.indexOf(k)).padStart(2, '0')}`,
    }
  })
}

function compartments(ctx: Ctx): CompletionItem[] {
  return [...ctx.a.model.compartments.values()].map((c) => {
    const volume = ctx.a.tree.lines[c.line]
    return item(c.name, 'compartment', ctx.word, 'compartment', volume?.kind === 'compartment' ? `\`compartment ${c.name} ${volume.volume.text}\`` : undefined)
  })
}

/** Formulas, replacing `typed`, the formula written so far before the cursor. */
function formulas(ctx: Ctx, species: string[], typed: string): CompletionItem[] {
  const replace = { start: ctx.word.end - typed.length, end: ctx.word.end }
  const list = species.includes('water') ? species : ['water', ...species]
  return list.map((f) => {
    const mass = molarMassLine(f)
    return { ...item(f, 'formula', replace, 'formula', mass ?? `(${ATOMIC_WEIGHTS_SOURCE})`), sortText: f === 'water' ? '0' : `1${f}` }
  })
}

/** Inside an expression: the document's `let` names and the common units. */
function expression(ctx: Ctx): CompletionItem[] {
  const values: CompletionItem[] = []
  const seen = new Set<string>()
  for (const n of ctx.a.tree.lines) {
    if (n.kind !== 'let' || seen.has(n.name.text) || isUnitSymbol(n.name.text) || !/^[A-Za-z_]\w*$/.test(n.name.text)) continue
    // A value defined on the cursor's own line is not defined yet there; a `let` sees only those above it.
    const here = ctx.a.index.lineOf(ctx.name.end)
    if (n.line === here || (ctx.inLet && n.line > here)) continue
    seen.add(n.name.text)
    values.push({ ...item(n.name.text, 'value', ctx.name, 'let value', `\`let ${n.name.text} = ${n.expr.text}\``), sortText: `0${n.name.text}` })
  }
  const units = COMMON_UNITS.map((u) => ({ ...item(u.unit, 'unit', ctx.name, 'unit', u.doc), sortText: `1${String(COMMON_UNITS.indexOf(u)).padStart(2, '0')}` }))
  return [...values, ...units]
}

/** After a comma on a cell line: the option words; after an option word: an expression. */
function optionsOrExpression(ctx: Ctx, before: string, options: string[]): CompletionItem[] {
  const current = lastTopLevel(before)
  if (before.includes(',') && /^\s*[A-Za-z-]*$/.test(current)) return options.map((o) => item(o, 'option', ctx.word, 'option', undefined, `${o} `))
  if (before.includes(',')) return expression(ctx)
  return []
}

/** The text after the last comma outside brackets. */
function lastTopLevel(s: string): string {
  let depth = 0
  let from = 0
  for (let i = 0; i < s.length; i++) {
    const c = s[i]
    if (c === '(' || c === '[') depth++
    else if (c === ')' || c === ']') depth--
    else if (c === ',' && depth <= 0) from = i + 1
  }
  return s.slice(from)
}
