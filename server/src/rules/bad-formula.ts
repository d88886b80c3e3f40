// bad-formula: a formula that cannot be read (unbalanced brackets, stray characters), or an ion
// charge that can be read two ways (`Cu2+`).
import { formulaDiagnostics } from './formula-issue'
import type { Rule } from './rule'

export const badFormula: Rule = {
  code: 'bad-formula',
  severity: 'error',
  summary: 'A chemical formula that cannot be read, or whose ionic charge is ambiguous.',
  check: ({ model }) => formulaDiagnostics(model, ['formula-syntax', 'ambiguous-charge'], 'bad-formula'),
}
