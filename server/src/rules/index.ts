// The rule registry: every diagnostic Cellrun reports comes from one of these modules.
import { approximateAmount } from './approximate-amount'
import { badExpression } from './bad-expression'
import { badFormula } from './bad-formula'
import { badReaction } from './bad-reaction'
import { belowCharged } from './below-charged'
import { belowReversible } from './below-reversible'
import { beyondFaraday } from './beyond-faraday'
import { beyondSolubility } from './beyond-solubility'
import { duplicateName } from './duplicate-name'
import { includeFile } from './include-file'
import { efficiencyOver100 } from './efficiency-over-100'
import { missingElectrode } from './missing-electrode'
import { outOfRange } from './out-of-range'
import { outsideCell } from './outside-cell'
import { overfilled } from './overfilled'
import { productReaction } from './product-reaction'
import type { Rule } from './rule'
import { notedReason, setKnownCodes } from './noted-reason'
import { SAFETY_RULES } from './safety'
import { shadowsUnit } from './shadows-unit'
import { stepIncomplete } from './step-incomplete'
import { syntax } from './syntax'
import { unknownElement } from './unknown-element'
import { unknownKind } from './unknown-kind'
import { twoAmounts } from './two-amounts'
import { unbalancedReaction } from './unbalanced-reaction'
import { unknownName } from './unknown-name'
import { wrongUnit } from './wrong-unit'
import { zeroForO } from './zero-for-o'

export const RULES: readonly Rule[] = [
  syntax,
  badExpression,
  unknownName,
  wrongUnit,
  outOfRange,
  unknownElement,
  zeroForO,
  badFormula,
  badReaction,
  unbalancedReaction,
  duplicateName,
  includeFile,
  shadowsUnit,
  unknownKind,
  outsideCell,
  missingElectrode,
  stepIncomplete,
  overfilled,
  approximateAmount,
  beyondSolubility,
  productReaction,
  twoAmounts,
  beyondFaraday,
  belowCharged,
  efficiencyOver100,
  belowReversible,
  notedReason,
  ...SAFETY_RULES,
]

setKnownCodes(RULES.map((r) => r.code))

export type { Rule, RuleContext } from './rule'
