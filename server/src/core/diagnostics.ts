// Diagnostics as plain data: what the rules report, with quick fixes as text edits.
import type { Span } from './positions'

export type Severity = 'error' | 'warning' | 'information' | 'hint'

export interface Edit {
  span: Span
  newText: string
}

export interface Fix {
  title: string
  edits: Edit[]
}

export interface Diagnostic {
  /** Stable rule code, e.g. "wrong-unit". */
  code: string
  severity: Severity
  message: string
  span: Span
  fixes: Fix[]
  /** For hazard rules: the usual precaution (always shown, also when the finding is noted). */
  caution?: string
  /** Set when a `# noted CODE: reason` comment on the line acknowledges the finding. */
  noted?: string
}

export function fix(title: string, span: Span, newText: string): Fix {
  return { title, edits: [{ span, newText }] }
}
