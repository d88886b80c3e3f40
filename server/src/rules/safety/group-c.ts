// Hazard rules, group c (see safety/index.ts).
import type { Rule } from '../rule'

export const GROUP_C: readonly Rule[] = []
