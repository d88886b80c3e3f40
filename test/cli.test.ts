import { it, expect } from 'vitest'
import { run } from '../server/src/cli/main'
it('x', () => { const o: string[] = []; expect(run(['--version'], (s) => o.push(s), () => {})).toBe(0); console.log(o) })
