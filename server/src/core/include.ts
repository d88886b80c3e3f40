// Shared definitions: `include "PATH"` takes the named values (`let`), the house materials
// (`material`) and the cell (the `cell` block and its parts) from a definitions file in the same workspace. Paths resolve relative to the
// including file and may not leave the workspace root; cycles are reported, not followed. Pure: the
// caller supplies the reader (the CLI reads the disk; the language server its open documents first).
import { parse } from './parser'
import { type Span, spanOf } from './positions'
import { CELL_KEYWORDS, keywordOf, type LineNode } from './syntax'

export interface IncludeOptions {
  /** Absolute path of the document being analysed ('/'-separated). */
  file: string
  /** The workspace root: includes must resolve inside it. */
  root: string
  /** The text of a file by absolute path, or undefined when it cannot be read. */
  read(path: string): string | undefined
}

export interface IncludeProblem {
  span: Span
  kind: 'outside' | 'missing' | 'cycle' | 'syntax'
  message: string
}

/** Normalise a '/'-separated path: resolve `.` and `..`. */
export function normalisePath(p: string): string {
  const out: string[] = []
  for (const seg of p.split('/')) {
    if (seg === '' || seg === '.') continue
    if (seg === '..') out.pop()
    else out.push(seg)
  }
  return '/' + out.join('/')
}

function dirname(p: string): string {
  return p.slice(0, p.lastIndexOf('/')) || '/'
}

/** Is this line a definition an include takes: a `let`, a `material`, the `cell` line or a part of the cell? */
function isDefinition(n: LineNode): boolean {
  return n.kind === 'let' || n.kind === 'cell' || n.kind === 'material' || (CELL_KEYWORDS as readonly string[]).includes(keywordOf(n)?.text ?? '')
}

/**
 * The definition lines of everything `text` includes (recursively), as one text to append after
 * the document; the problems found, located at the include lines of the document; and the files read.
 */
export function gatherIncludes(lines: readonly LineNode[], opts: IncludeOptions): { defs: string; problems: IncludeProblem[]; files: string[] } {
  const problems: IncludeProblem[] = []
  const files: string[] = []
  const defs: string[] = []
  const root = normalisePath(opts.root)
  const visit = (nodes: readonly LineNode[], from: string, stack: string[], at: Span | undefined): void => {
    for (const n of nodes) {
      if (n.kind !== 'include') continue
      const span = at ?? spanOf(n.path)
      const where = at ? ` (included from ${from})` : ''
      const target = normalisePath(n.path.text.startsWith('/') ? n.path.text : `${dirname(from)}/${n.path.text}`)
      if (target !== root && !target.startsWith(root === '/' ? '/' : root + '/')) {
        problems.push({ span, kind: 'outside', message: `\`${n.path.text}\` resolves outside the workspace${where}` })
        continue
      }
      if (stack.includes(target)) {
        problems.push({ span, kind: 'cycle', message: `including \`${n.path.text}\` makes a cycle: ${[...stack, target].map((p) => p.slice(root.length + 1) || p).join(' → ')}` })
        continue
      }
      const text = opts.read(target)
      if (text === undefined) {
        problems.push({ span, kind: 'missing', message: `cannot read \`${n.path.text}\`${where}` })
        continue
      }
      if (files.includes(target)) continue // included twice through different paths: take it once
      files.push(target)
      const tree = parse(text)
      if (tree.lines.some((x) => x.kind === 'error')) {
        problems.push({ span, kind: 'syntax', message: `\`${n.path.text}\` has lines Cellrun cannot read; open it to see them${where}` })
      }
      // Its own includes first, so that their values are defined before this file's.
      visit(tree.lines, target, [...stack, target], span)
      const taken = tree.lines.filter((x) => x.kind !== 'error' && isDefinition(x))
      defs.push(...taken.map((x) => text.slice(x.span.start - x.indent, x.span.end)))
    }
  }
  visit(lines, normalisePath(opts.file), [normalisePath(opts.file)], undefined)
  return { defs: defs.join('\n'), problems, files }
}
