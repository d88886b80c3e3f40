// zero-for-o: the digit 0 typed for the letter O in a formula (`C02`, `Na0H`, `H20`).
import { formulaDiagnostics } from './formula-issue'
import type { Rule } from './rule'

export const zeroForO: Rule = {
  code: 'zero-for-o',
  severity: 'error',
  summary: 'A zero typed where the letter O (oxygen) was meant, as in C02 or H20.',
  check: ({ model }) => formulaDiagnostics(model, ['zero-for-oxygen'], 'zero-for-o'),
}
