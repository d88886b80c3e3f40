// The shape of a diagnostic rule. Each rule lives in its own module, has a stable code of our own,
// reads the parsed tree and the model (never the editor), and returns plain diagnostics.
import type { Diagnostic, Severity } from '../core/diagnostics'
import type { LineIndex } from '../core/positions'
import type { Model } from '../core/model'

export interface RuleContext {
  model: Model
  index: LineIndex
}

export interface Rule {
  /** Stable code shown with every diagnostic of this rule. */
  code: string
  /** Default severity; a rule may raise or lower it per finding. */
  severity: Severity
  /** One line on what the rule catches. */
  summary: string
  check(ctx: RuleContext): Diagnostic[]
}
