// shadows-unit: a `let` value named like a unit (`min`, `h`, `A`, `g`...) or a constant (`pi`). Letting it stand would
// silently change what every `90 min` or `2 h` in the protocol means, so the value is not defined
// and the line is an error until it gets another name.
import { spanOf } from '../core/positions'
import { isConstantName } from '../core/units'
import type { Rule } from './rule'

export const shadowsUnit: Rule = {
  code: 'shadows-unit',
  severity: 'error',
  summary: 'A named value that has the name of a unit (which would change what that unit means elsewhere) or of a built-in constant (which would be ignored).',
  check({ model }) {
    return model.declarations.flatMap((d) =>
      d.shadowsUnit
        ? [
            {
              code: 'shadows-unit',
              severity: 'error' as const,
              message: isConstantName(d.tok.text)
                ? `\`${d.tok.text}\` is a built-in constant; it keeps its meaning in every expression and this value would be ignored. Choose another name`
                : `\`${d.tok.text}\` is a unit; a value of that name would change what \`${d.tok.text}\` means in every expression. Choose another name`,
              span: spanOf(d.tok),
              fixes: [],
            },
          ]
        : [],
    )
  },
}
