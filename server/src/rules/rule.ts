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
  /** Hazard rules: the usual precaution, deferring to local codes, safety data sheets and licensed practice. */
  caution?: string
  /** Where the rule's figures or reasoning come from: a published source, or "common practice, no source". */
  source?: string
  /** Longer explanation for `cellrun explain CODE`: why it matters, what to do. */
  details?: string
  /** 'safety' for hazard rules, else a consistency rule. */
  category?: 'safety' | 'consistency'
  check(ctx: RuleContext): Diagnostic[]
}
