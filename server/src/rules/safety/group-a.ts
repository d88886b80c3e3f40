// Hazard rules, group a (see safety/index.ts).
import type { Rule } from '../rule'
import { chlorineHandling } from './chlorine-handling'
import { chromiumAnode } from './chromium-anode'
import { hydrogenVent } from './hydrogen-vent'
import { mixedGases } from './mixed-gases'
import { nitrogenTrichloride } from './nitrogen-trichloride'

export const GROUP_A: readonly Rule[] = [chlorineHandling, hydrogenVent, mixedGases, nitrogenTrichloride, chromiumAnode]
