// unknown-element: a formula with a symbol that is no element (`Xq`, or `CL` for Cl).
import { formulaDiagnostics } from './formula-issue'
import type { Rule } from './rule'

export const unknownElement: Rule = {
  code: 'unknown-element',
  severity: 'error',
  summary: 'A formula uses a symbol that is not a chemical element; the fix corrects the letter case where that finds one.',
  check: ({ model }) => formulaDiagnostics(model, ['unknown-element'], 'unknown-element'),
}
