// The syntax tree of a Cellrun protocol: one node per line, plain data, exact spans.
import type { Span } from './positions'

/** A word or piece of text with where it stands. */
export interface Tok {
  text: string
  start: number
  end: number
}

/** An expression as written (mathjs syntax with units); evaluated later by the model. */
export type Expr = Tok

export interface ChargeItem {
  span: Span
  formula: Tok
  /** Mass, amount or volume of the substance; for a solution, the mass or volume of the solution. */
  quantity: Expr
  /** Present for `FORMULA solution QUANTITY at CONCENTRATION`. */
  concentration?: Expr
  /** The same amount stated a second way, in parentheses: `K2CO3 260 g (1.88 mol)`. */
  alternate?: Expr
}

export interface Clause {
  span: Span
  keyword: Tok
  expr: Expr
  /** `current 2 A/dm^2 on anode`: the part (anode, cathode, separator) whose area a current density refers to. */
  on?: Tok
}

interface Base {
  /** 0-based line. */
  line: number
  /** The statement's text span (after indentation, before any comment). Empty lines: zero length. */
  span: Span
  /** Indentation width in characters. */
  indent: number
  /** A trailing `# comment`, if any. */
  comment?: Span
}

/** A planned (`expect`) or measured (`observe`) amount of a product. */
interface YieldFields {
  formula: Tok
  quantity: Expr
  /** The same amount stated a second way, in parentheses: `expect KOH 25 g (0.446 mol)`. */
  alternate?: Expr
  compartment?: Tok
}

export type LineNode =
  | (Base & { kind: 'blank' })
  | (Base & { kind: 'run'; title: Tok })
  | (Base & { kind: 'note'; text: Tok })
  | (Base & { kind: 'conditions'; items: Expr[] })
  | (Base & { kind: 'let'; name: Tok; expr: Expr })
  | (Base & { kind: 'cell' })
  | (Base & { kind: 'vessel'; material: Tok; inCell: boolean })
  | (Base & { kind: 'compartment'; name: Tok; volume: Expr; inCell: boolean })
  | (Base & { kind: 'separator'; type: Tok; between: [Tok, Tok]; area?: Expr; drag?: Expr; inCell: boolean })
  | (Base & { kind: 'electrode'; role: 'anode' | 'cathode'; material: Tok; compartment: Tok; area?: Expr; inCell: boolean })
  | (Base & { kind: 'charge'; compartment: Tok; items: ChargeItem[] })
  | (Base & { kind: 'step'; label: Tok; clauses: Clause[] })
  | (Base & YieldFields & { kind: 'expect' })
  | (Base & YieldFields & { kind: 'observe' })
  | (Base & { kind: 'handling'; type: Tok; text: Tok })
  | (Base & { kind: 'reaction'; role: Tok; equation: Tok })
  | (Base & { kind: 'include'; path: Tok })
  | (Base & { kind: 'material'; name: Tok; description?: Tok })
  | (Base & {
      kind: 'error'
      message: string
      errorSpan: Span
      fix?: { span: Span; newText: string; title: string }
      /** The word the line starts with, when it is written like a keyword (known or not). */
      keyword?: Tok
    })

export type NodeKind = LineNode['kind']

/**
 * The statement keyword of a line, where it stands: the first word of every statement (`anode` or
 * `cathode` for an electrode), the word an error line starts with when it reads like a keyword, and
 * nothing for a blank line. Worked out from the node (a node does not carry a token for it: the
 * keyword is known from its kind and starts where the statement does).
 */
export function keywordOf(n: LineNode): Tok | undefined {
  if (n.kind === 'blank') return undefined
  if (n.kind === 'error') return n.keyword
  const text = n.kind === 'electrode' ? n.role : n.kind
  return { text, start: n.span.start, end: n.span.start + text.length }
}

export interface SyntaxTree {
  text: string
  /** Exactly one node per line, in order. */
  lines: LineNode[]
}

export const STATEMENT_KEYWORDS = [
  'run',
  'note',
  'conditions',
  'let',
  'cell',
  'vessel',
  'compartment',
  'separator',
  'anode',
  'cathode',
  'charge',
  'step',
  'expect',
  'observe',
  'handling',
  'reaction',
  'include',
  'material',
] as const

export const CELL_KEYWORDS = ['vessel', 'compartment', 'separator', 'anode', 'cathode'] as const

export const STEP_CLAUSES = ['current', 'voltage', 'for', 'efficiency'] as const

export const SEPARATOR_KINDS = ['cation-exchange', 'anion-exchange', 'diaphragm', 'none'] as const

export const HANDLING_KINDS = ['vent', 'scrubber', 'hood', 'cooling', 'ppe', 'shield', 'detector'] as const
