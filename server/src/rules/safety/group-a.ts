// Hazard rules, group a (see safety/index.ts).
import type { Rule } from '../rule'

export const GROUP_A: readonly Rule[] = []
