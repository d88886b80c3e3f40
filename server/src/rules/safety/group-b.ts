// Hazard rules, group b (see safety/index.ts).
import type { Rule } from '../rule'

export const GROUP_B: readonly Rule[] = []
