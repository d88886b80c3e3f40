// Names a protocol defines and uses: `let` values (defined by `let NAME`, used inside expressions)
// and compartments (defined by `compartment NAME`, mentioned by charge, separator, electrode,
// expect and observe lines). Go to definition, find references and rename, as plain data.
import type { Analysis } from './analyze'
import type { Edit } from './diagnostics'
import { type Span, spanOf } from './positions'
import { compartmentMentions, letNames, valueUses } from './scan'
import { STATEMENT_KEYWORDS, STEP_CLAUSES } from './syntax'
import { isUnitSymbol } from './units'

export type NameKind = 'value' | 'compartment'

/** A name under the cursor: what it names and the occurrence the cursor is on. */
export interface NameAt {
  kind: NameKind
  name: string
  span: Span
}

export interface Occurrence {
  span: Span
  /** The defining occurrence (`let NAME`, `compartment NAME`). */
  declaration: boolean
}

/**
 * Words that a name must not take: they would be read as part of the line's structure
 * (`step 1: current for for 1 h`, `expect KOH x in in`), or as a function or constant.
 */
export const RESERVED_WORDS: ReadonlySet<string> = new Set<string>([
  ...STATEMENT_KEYWORDS,
  ...STEP_CLAUSES,
  'between',
  'and',
  'in',
  'on',
  'at',
  'area',
  'drag',
  'solution',
  'pi',
  'sqrt',
  'abs',
])

/** The `let` name or compartment name at `offset` (the cursor may stand just after it). */
export function nameAt(a: Analysis, offset: number): NameAt | undefined {
  const line = a.index.lineOf(offset)
  const n = a.tree.lines[line]
  if (!n) return undefined
  const inside = (s: Span) => offset >= s.start && offset <= s.end
  if (n.kind === 'let' && inside(spanOf(n.name))) return { kind: 'value', name: n.name.text, span: spanOf(n.name) }
  if (n.kind === 'compartment' && inside(spanOf(n.name))) return { kind: 'compartment', name: n.name.text, span: spanOf(n.name) }
  for (const t of compartmentMentions(n)) if (inside(spanOf(t))) return { kind: 'compartment', name: t.text, span: spanOf(t) }
  const uses = valueUses([n], letNames(a.tree.lines))
  const use = uses.find((u) => inside(u.span))
  return use ? { kind: 'value', name: use.name, span: use.span } : undefined
}

/** Every occurrence of a name, the declarations included, in document order. */
export function occurrences(a: Analysis, kind: NameKind, name: string): Occurrence[] {
  const out: Occurrence[] = []
  if (kind === 'value') {
    for (const n of a.tree.lines) if (n.kind === 'let' && n.name.text === name) out.push({ span: spanOf(n.name), declaration: true })
    for (const u of valueUses(a.tree.lines, new Set([name]))) out.push({ span: u.span, declaration: false })
  } else {
    for (const n of a.tree.lines) {
      if (n.kind === 'compartment' && n.name.text === name) out.push({ span: spanOf(n.name), declaration: true })
      for (const t of compartmentMentions(n)) if (t.text === name) out.push({ span: spanOf(t), declaration: false })
    }
  }
  return out.sort((x, y) => x.span.start - y.span.start)
}

/** Where the name at `offset` is defined: the first `let NAME` or `compartment NAME` of that name. */
export function definitionAt(a: Analysis, offset: number): Span | undefined {
  const at = nameAt(a, offset)
  if (!at) return undefined
  return occurrences(a, at.kind, at.name).find((o) => o.declaration)?.span
}

/** Every occurrence of the name at `offset`; the declarations only when asked for. */
export function referencesAt(a: Analysis, offset: number, includeDeclaration: boolean): Span[] {
  const at = nameAt(a, offset)
  if (!at) return []
  return occurrences(a, at.kind, at.name)
    .filter((o) => includeDeclaration || !o.declaration)
    .map((o) => o.span)
}

/** Can the name at `offset` be renamed? The span to rename and the current name, or why not. */
export function prepareRename(a: Analysis, offset: number): { span: Span; placeholder: string } | { error: string } {
  const at = nameAt(a, offset)
  if (!at) return { error: 'only a `let` name or a compartment name can be renamed' }
  return { span: at.span, placeholder: at.name }
}

/** Why `newName` cannot name a value or compartment here, or undefined when it can. */
export function renameProblem(a: Analysis, kind: NameKind, oldName: string, newName: string): string | undefined {
  // A value is used inside expressions, where `-` is a minus: only letters, digits and `_`.
  const pattern = kind === 'value' ? /^[A-Za-z_][A-Za-z0-9_]*$/ : /^[A-Za-z_][A-Za-z0-9_-]*$/
  if (!pattern.test(newName)) {
    return kind === 'value'
      ? `\`${newName}\` is not a name: use letters, digits and \`_\`, starting with a letter`
      : `\`${newName}\` is not a compartment name: use letters, digits, \`_\` and \`-\`, starting with a letter`
  }
  if (newName === oldName) return undefined
  if (isUnitSymbol(newName)) return `\`${newName}\` is a unit: a name of that spelling would change what the unit means`
  if (RESERVED_WORDS.has(newName)) return `\`${newName}\` is a word of the protocol format`
  const taken = a.tree.lines.some((n) => (n.kind === 'let' || n.kind === 'compartment') && n.name.text === newName)
  if (taken) return `\`${newName}\` is already defined`
  return undefined
}

/** The edits that rename the name at `offset` everywhere, or why it cannot be done. */
export function renameAt(a: Analysis, offset: number, newName: string): { edits: Edit[] } | { error: string } {
  const at = nameAt(a, offset)
  if (!at) return { error: 'only a `let` name or a compartment name can be renamed' }
  const problem = renameProblem(a, at.kind, at.name, newName)
  if (problem) return { error: problem }
  if (newName === at.name) return { edits: [] }
  return { edits: occurrences(a, at.kind, at.name).map((o) => ({ span: o.span, newText: newName })) }
}
