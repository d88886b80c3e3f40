// Hazard rules, group c (see safety/index.ts).
import type { Rule } from '../rule'
import { currentDensityLimit } from './current-density-limit'
import { heatRise } from './heat-rise'
import { solubleAnode } from './soluble-anode'
import { ventilationCapacity } from './ventilation-capacity'

export const GROUP_C: readonly Rule[] = [currentDensityLimit, heatRise, solubleAnode, ventilationCapacity]
