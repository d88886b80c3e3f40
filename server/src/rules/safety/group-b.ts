// Hazard rules, group b (see safety/index.ts).
import type { Rule } from '../rule'
import { acidThroughCationMembrane } from './acid-through-cation-membrane'
import { acidifiedFeed } from './acidified-feed'
import { causticInGlass } from './caustic-in-glass'
import { crystallisingProduct } from './crystallising-product'
import { undividedChloride } from './undivided-chloride'

export const GROUP_B: readonly Rule[] = [causticInGlass, crystallisingProduct, acidThroughCationMembrane, undividedChloride, acidifiedFeed]
