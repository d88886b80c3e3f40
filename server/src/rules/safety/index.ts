// The hazard rules. Each lives in its own module in this folder; the groups list them.
import { GROUP_A } from './group-a'
import { GROUP_B } from './group-b'
import { GROUP_C } from './group-c'
import type { Rule } from '../rule'

export const SAFETY_RULES: readonly Rule[] = [...GROUP_A, ...GROUP_B, ...GROUP_C]
