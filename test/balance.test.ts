// Reaction parsing, balance checking and balancing (server/src/core/balance.ts).
//
// Every balanced equation below is standard textbook stoichiometry (general-chemistry and
// electrochemistry texts); the coefficients were written here by hand, not taken from the code.
// The residuals of the wrong-coefficient versions are counted by hand (right minus left), with the
// working in the comment beside each.
import * as fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  add,
  balance,
  checkBalance,
  div,
  gcd,
  lcm,
  mul,
  neg,
  nullspace,
  parseRational,
  parseReaction,
  rational,
  ratCompare,
  ratToNumber,
  ratToString,
  sub,
  type ParsedReaction,
} from '../server/src/core/balance'

const big = (xs: number[]): bigint[] => xs.map((x) => BigInt(x))

interface Case {
  name: string
  skeleton: string // every coefficient left out
  left: number[]
  right: number[]
  balanced: string // the textbook form
  wrong: string // a wrong-coefficient version
  residual: { elements: Record<string, number>; charge: number } // of `wrong`, right minus left
}

const CASES: Case[] = [
  {
    name: 'chlorine evolution (anode)',
    skeleton: 'Cl- -> Cl2 + e-',
    left: [2],
    right: [1, 2],
    balanced: '2 Cl- -> Cl2 + 2 e-', // standard textbook stoichiometry
    wrong: '2 Cl- -> Cl2 + e-',
    residual: { elements: { Cl: 0 }, charge: 1 }, // charge: right -1, left -2
  },
  {
    name: 'oxygen evolution, acid',
    skeleton: 'H2O -> O2 + H+ + e-',
    left: [2],
    right: [1, 4, 4],
    balanced: '2 H2O → O2 + 4 H+ + 4 e-', // standard textbook stoichiometry
    wrong: 'H2O -> O2 + 4 H+ + 4 e-',
    residual: { elements: { H: 2, O: 1 }, charge: 0 }, // H: 4 - 2; O: 2 - 1; charge: (4 - 4) - 0
  },
  {
    name: 'oxygen evolution, alkaline',
    skeleton: 'OH- → O2 + H2O + e⁻',
    left: [4],
    right: [1, 2, 4],
    balanced: '4 OH- → O2 + 2 H2O + 4 e⁻', // standard textbook stoichiometry
    wrong: '2 OH- -> O2 + H2O + 2 e-',
    residual: { elements: { O: 1, H: 0 }, charge: 0 }, // O: (2 + 1) - 2; H: 2 - 2; charge: -2 - (-2)
  },
  {
    name: 'hydrogen evolution, acid',
    skeleton: 'H+ + e- -> H2',
    left: [2, 2],
    right: [1],
    balanced: '2 H+ + 2 e- -> H2', // standard textbook stoichiometry
    wrong: 'H+ + e- -> H2',
    residual: { elements: { H: 1 }, charge: 0 }, // H: 2 - 1; charge: 0 - (1 - 1)
  },
  {
    name: 'hydrogen evolution, alkaline',
    skeleton: 'H2O + e- → H2 + OH-',
    left: [2, 2],
    right: [1, 2],
    balanced: '2H2O + 2e- → H2 + 2OH-', // standard textbook stoichiometry
    wrong: 'H2O + 2 e- -> H2 + 2 OH-',
    residual: { elements: { H: 2, O: 1 }, charge: 0 }, // H: (2 + 2) - 2; O: 2 - 1; charge: -2 - (-2)
  },
  {
    name: 'copper deposition (cathode)',
    skeleton: 'Cu^2+ + e- = Cu',
    left: [1, 2],
    right: [1],
    balanced: 'Cu^2+ + 2 e- = Cu', // standard textbook stoichiometry
    wrong: 'Cu^2+ + e- = Cu',
    residual: { elements: { Cu: 0 }, charge: -1 }, // charge: 0 - (2 - 1)
  },
  {
    name: 'chlor-alkali, overall',
    skeleton: 'NaCl + H2O -> NaOH + Cl2 + H2',
    left: [2, 2],
    right: [2, 1, 1],
    balanced: '2 NaCl + 2 H2O -> 2 NaOH + Cl2 + H2', // standard textbook stoichiometry
    wrong: 'NaCl + H2O -> NaOH + Cl2 + H2',
    residual: { elements: { Na: 0, Cl: 1, H: 1, O: 0 }, charge: 0 }, // Cl: 2 - 1; H: (1 + 2) - 2
  },
  {
    name: 'chlorate formation, overall',
    skeleton: 'NaCl + H2O -> NaClO3 + H2',
    left: [1, 3],
    right: [1, 3],
    balanced: 'NaCl + 3 H2O -> NaClO3 + 3 H2', // standard textbook stoichiometry
    wrong: 'NaCl + 3 H2O -> NaClO3 + 2 H2',
    residual: { elements: { Na: 0, Cl: 0, H: -2, O: 0 }, charge: 0 }, // H: 4 - 6; O: 3 - 3
  },
  {
    name: 'water splitting',
    skeleton: 'H2O -> H2 + O2',
    left: [2],
    right: [2, 1],
    balanced: '2 H2O -> 2 H2 + O2', // standard textbook stoichiometry
    wrong: 'H2O -> H2 + O2',
    residual: { elements: { H: 0, O: 1 }, charge: 0 }, // O: 2 - 1
  },
  {
    name: 'permanganate / iron(II)',
    skeleton: 'MnO4- + Fe^2+ + H+ -> Mn^2+ + Fe^3+ + H2O',
    left: [1, 5, 8],
    right: [1, 5, 4],
    balanced: 'MnO4- + 5 Fe^2+ + 8 H+ → Mn^2+ + 5 Fe^3+ + 4 H2O', // standard textbook stoichiometry
    wrong: 'MnO4- + Fe^2+ + 8 H+ -> Mn^2+ + Fe^3+ + 4 H2O',
    // Mn, O (4 - 4), H (8 - 8), Fe balance; charge: (2 + 3) - (-1 + 2 + 8) = -4
    residual: { elements: { Mn: 0, O: 0, Fe: 0, H: 0 }, charge: -4 },
  },
  {
    name: 'dichromate reduction',
    skeleton: 'Cr2O7^2- + H+ + e- -> Cr^3+ + H2O',
    left: [1, 14, 6],
    right: [2, 7],
    balanced: 'Cr2O7^2- + 14 H+ + 6 e- → 2 Cr^3+ + 7 H2O', // standard textbook stoichiometry
    wrong: 'Cr2O7^2- + 14 H+ + 3 e- -> 2 Cr^3+ + 7 H2O',
    residual: { elements: { Cr: 0, O: 0, H: 0 }, charge: -3 }, // charge: 6 - (-2 + 14 - 3)
  },
  {
    name: 'propane combustion',
    skeleton: 'C3H8 + O2 -> CO2 + H2O',
    left: [1, 5],
    right: [3, 4],
    balanced: 'C3H8 + 5 O2 → 3 CO2 + 4 H2O', // standard textbook stoichiometry
    wrong: 'C3H8 + 3 O2 -> 3 CO2 + 4 H2O',
    residual: { elements: { C: 0, H: 0, O: 4 }, charge: 0 }, // O: (6 + 4) - 6
  },
]

function balanced(text: string): { left: bigint[]; right: bigint[]; text: string } {
  const r = parseReaction(text)
  expect(r.errors, text).toEqual([])
  const b = balance(r)
  if (!b.ok) throw new Error(`${text}: ${b.reason}`)
  return { ...b.coefficients, text: b.text }
}

function reason(text: string): string {
  const b = balance(parseReaction(text))
  if (b.ok) throw new Error(`${text} balanced unexpectedly as ${b.text}`)
  return b.reason
}

describe('textbook reactions', () => {
  describe.each(CASES)('$name', (c) => {
    it('balances the skeleton', () => {
      const b = balanced(c.skeleton)
      expect(b.left).toEqual(big(c.left))
      expect(b.right).toEqual(big(c.right))
    })

    it('accepts the balanced form', () => {
      const r = parseReaction(c.balanced)
      expect(r.ok, JSON.stringify(r.errors)).toBe(true)
      const check = checkBalance(r)
      expect(check.balanced).toBe(true)
      expect(check.charge).toBe(0)
      for (const v of Object.values(check.elements)) expect(v).toBe(0)
      // Balancing the balanced form gives the same coefficients back.
      const b = balanced(c.balanced)
      expect(b.left).toEqual(big(c.left))
      expect(b.right).toEqual(big(c.right))
    })

    it('reports the residuals of a wrong version', () => {
      const check = checkBalance(parseReaction(c.wrong))
      expect(check.balanced).toBe(false)
      expect(check.elements).toEqual(c.residual.elements)
      expect(check.charge).toBe(c.residual.charge)
    })
  })
})

describe('balance: rendering in the user style', () => {
  it('uses the written arrow and term texts, omits coefficient 1, spaces by default', () => {
    expect(balanced('Cl- -> Cl2 + e-').text).toBe('2 Cl- -> Cl2 + 2 e-')
    expect(balanced('OH- → O2 + H2O + e⁻').text).toBe('4 OH- → O2 + 2 H2O + 4 e⁻')
    expect(balanced('Cu^2+ + e- = Cu').text).toBe('Cu^2+ + 2 e- = Cu')
    expect(balanced('H2O <=> H2 + O2').text).toBe('2 H2O <=> 2 H2 + O2')
    expect(balanced('H2O ⇌ H2 + O2').text).toBe('2 H2O ⇌ 2 H2 + O2')
  })

  it('keeps the coefficient spacing the user wrote', () => {
    expect(balanced('2H2O + e- → H2 + OH-').text).toBe('2H2O + 2e- → H2 + 2OH-')
    expect(balanced('3 NaCl + H2O -> NaOH + Cl2 + H2').text).toBe('2 NaCl + 2 H2O -> 2 NaOH + Cl2 + H2')
  })

  it('keeps state symbols and Unicode charges in the output', () => {
    expect(balanced('NaCl(aq) + H2O(l) -> NaOH(aq) + Cl2(g) + H2(g)').text).toBe(
      '2 NaCl(aq) + 2 H2O(l) -> 2 NaOH(aq) + Cl2(g) + H2(g)',
    )
    expect(balanced('Cu²⁺ + e⁻ → Cu').text).toBe('Cu²⁺ + 2 e⁻ → Cu')
  })

  it('balances a hydrate: CuSO4·5H2O -> CuSO4 + 5 H2O (standard textbook stoichiometry)', () => {
    const b = balanced('CuSO4·5H2O -> CuSO4 + H2O')
    expect(b.left).toEqual(big([1]))
    expect(b.right).toEqual(big([1, 5]))
  })

  it('balances with an element that has no standard atomic weight (Tc)', () => {
    // TcO4- + 4 H+ + 3 e- -> TcO2 + 2 H2O: Tc(VII) -> Tc(IV), balanced by hand (O: 4 = 2 + 2; H: 4 = 4; charge: -1 + 4 - 3 = 0)
    const b = balanced('TcO4- + H+ + e- -> TcO2 + H2O')
    expect(b.left).toEqual(big([1, 4, 3]))
    expect(b.right).toEqual(big([1, 2]))
  })
})

describe('balance: failures', () => {
  it('refuses a reaction with parse errors', () => {
    expect(reason('H2 + O2 H2O')).toMatch(/arrow/i)
  })

  it('cannot balance an impossible reaction', () => {
    const r = reason('Na -> Cl')
    expect(r).toMatch(/cannot be balanced with these species/)
    expect(r).toMatch(/Na appears only on the left/)
    expect(r).toMatch(/Cl appears only on the right/)
  })

  it('does not guess when two independent reactions are mixed', () => {
    // H2 + O2 -> H2O and H2 + O2 -> H2O2 both fit: a two-dimensional nullspace.
    const r = reason('H2 + O2 -> H2O + H2O2')
    expect(r).toMatch(/2 independent reactions/)
  })

  it('says which species is on the wrong side', () => {
    const r = reason('H2 + H2O -> O2')
    expect(r).toMatch(/'H2' would have to be on the other side/)
    expect(r).toContain('2 H2O -> 2 H2 + O2')
  })

  it('says which species takes no part', () => {
    expect(reason('H2 + O2 + N2 -> H2O')).toMatch(/'N2' takes no part/)
  })

  it('refuses the same species written twice on one side', () => {
    expect(reason('H2 + H2 + O2 -> H2O')).toMatch(/same species/)
  })
})

describe('parseReaction', () => {
  it('reads terms, coefficients and offsets', () => {
    const text = '2 NaCl + 2 H2O -> 2 NaOH + Cl2 + H2'
    const r = parseReaction(text)
    expect(r.ok).toBe(true)
    expect(r.left.map((t) => t.formula)).toEqual(['NaCl', 'H2O'])
    expect(r.right.map((t) => t.formula)).toEqual(['NaOH', 'Cl2', 'H2'])
    expect(r.left.map((t) => t.coefficient)).toEqual([rational(2n), rational(2n)])
    expect(r.right.map((t) => t.coefficient)).toEqual([rational(2n), null, null])
    for (const t of [...r.left, ...r.right]) expect(text.slice(t.start, t.end)).toBe(t.text)
    expect(r.left[1]).toMatchObject({ text: '2 H2O', start: 9, end: 14, species: 'H2O', speciesStart: 11 })
    expect(r.arrow).toEqual({ text: '->', start: 15, end: 17 })
  })

  it("tells a charge '+' from a term separator", () => {
    const r = parseReaction('Na+ + e- -> Na')
    expect(r.ok).toBe(true)
    expect(r.left.map((t) => t.text)).toEqual(['Na+', 'e-'])
    expect(r.left.map((t) => t.isElectron)).toEqual([false, true])
  })

  it.each(['e-', 'e^-', 'e⁻', 'e', 'e−'])('reads %s as an electron', (e) => {
    const r = parseReaction(`Cu^2+ + 2${e} -> Cu`)
    expect(r.ok, JSON.stringify(r.errors)).toBe(true)
    expect(r.left[1]).toMatchObject({ isElectron: true, formula: 'e-', coefficient: rational(2n), species: e })
  })

  it.each([
    ['->', 'H2 + Cl2 -> HCl'],
    ['→', 'H2 + Cl2 → HCl'],
    ['=', 'H2 + Cl2 = HCl'],
    ['<=>', 'H2 + Cl2 <=> HCl'],
    ['⇌', 'H2 + Cl2 ⇌ HCl'],
  ])('reads the arrow %s', (arrow, text) => {
    const r = parseReaction(text)
    expect(r.ok).toBe(true)
    expect(r.arrow?.text).toBe(arrow)
    expect(r.left).toHaveLength(2)
    expect(r.right).toHaveLength(1)
  })

  it('reads an arrow right after a charge sign', () => {
    const r = parseReaction('4 OH-→O2 + 2 H2O + 4 e-')
    expect(r.ok).toBe(true)
    expect(r.left.map((t) => t.formula)).toEqual(['OH-'])
  })

  it('reads integer, decimal and fraction coefficients, with or without a space', () => {
    const r = parseReaction('H2 + 1/2 O2 -> 1H2O')
    expect(r.left.map((t) => t.coefficient)).toEqual([null, rational(1n, 2n)])
    expect(r.right[0]?.coefficient).toEqual(rational(1n))
    expect(parseReaction('H2 + 0.5O2 -> H2O').left[1]?.coefficient).toEqual(rational(1n, 2n))
    expect(parseReaction('H2 + 1/2O2 -> H2O').left[1]).toMatchObject({ formula: 'O2', coefficient: rational(1n, 2n) })
    expect(parseReaction('10H2O -> 10 H2 + 5 O2').left[0]?.coefficient).toEqual(rational(10n))
    expect(checkBalance(parseReaction('H2 + 1/2 O2 -> H2O')).balanced).toBe(true)
    expect(checkBalance(parseReaction('H2 + 0.5 O2 -> H2O')).balanced).toBe(true)
  })

  it('drops state symbols and reads hydrates', () => {
    const r = parseReaction('CuSO4·5H2O(s) -> CuSO4(s) + 5 H2O (l)')
    expect(r.ok).toBe(true)
    expect(r.left[0]?.formula).toBe('CuSO4·5H2O')
    expect(r.right.map((t) => t.formula)).toEqual(['CuSO4', 'H2O'])
    expect(checkBalance(r).balanced).toBe(true)
  })

  it('reads Unicode subscripts and superscript charges', () => {
    const r = parseReaction('Cr₂O₇²⁻ + 14 H⁺ + 6 e⁻ → 2 Cr³⁺ + 7 H₂O')
    expect(r.ok, JSON.stringify(r.errors)).toBe(true)
    expect(r.left.map((t) => t.formula)).toEqual(['Cr2O7^2-', 'H^+', 'e-'])
    expect(checkBalance(r).balanced).toBe(true)
  })

  it('warns, without failing, about an ambiguous charge', () => {
    const text = 'Fe3+ + e- -> Fe2+'
    const r = parseReaction(text)
    expect(r.ok).toBe(true)
    expect(r.warnings).toHaveLength(2)
    expect(text.slice(r.warnings[0]!.start, r.warnings[0]!.end)).toBe('3+')
    expect(checkBalance(r).balanced).toBe(true)
  })

  describe('errors', () => {
    it('missing arrow', () => {
      const r = parseReaction('H2 + O2 H2O')
      expect(r.ok).toBe(false)
      expect(r.errors[0]?.message).toMatch(/No reaction arrow/)
      expect(r.right).toEqual([])
    })

    it('empty side', () => {
      const left = parseReaction('-> H2 + O2')
      expect(left.ok).toBe(false)
      expect(left.errors[0]).toMatchObject({ start: 0, end: 2 })
      expect(left.errors[0]?.message).toMatch(/left/)
      const right = parseReaction('H2O   →')
      expect(right.errors[0]?.message).toMatch(/right/)
      expect(right.errors[0]).toMatchObject({ start: 6, end: 7 })
    })

    it('empty term', () => {
      const text = 'H2 + O2 + -> H2O'
      const r = parseReaction(text)
      expect(r.ok).toBe(false)
      expect(r.errors[0]?.message).toMatch(/Empty term/)
      expect(r.errors[0]).toMatchObject({ start: 8, end: 9 })
    })

    it('unknown element, with its offsets in the reaction text', () => {
      const text = 'Xx + H2 -> 2 HXx'
      const r = parseReaction(text)
      expect(r.ok).toBe(false)
      expect(r.errors.map((e) => text.slice(e.start, e.end))).toEqual(['Xx', 'Xx'])
      expect(r.errors[0]?.message).toMatch(/Unknown element/)
      expect(r.errors[1]).toMatchObject({ start: 14, end: 16 })
      const b = balance(r)
      expect(b.ok).toBe(false)
    })

    it('a formula error after a superscript maps back to the written text', () => {
      const text = 'Cu²⁺ + 2 e⁻ -> Qq'
      const r = parseReaction(text)
      expect(r.errors.map((e) => text.slice(e.start, e.end))).toEqual(['Qq'])
    })

    it('terms not separated by a spaced plus', () => {
      const r = parseReaction('H2 +O2 -> H2O')
      expect(r.ok).toBe(false)
      expect(r.errors[0]?.message).toMatch(/not one species/)
    })

    it('more than one arrow', () => {
      const r = parseReaction('H2 + O2 -> H2O -> H2O2')
      expect(r.errors.map((e) => e.message)).toEqual([expect.stringMatching(/More than one arrow/)])
      expect(r.errors[0]).toMatchObject({ start: 15, end: 17 })
    })

    it('zero and malformed coefficients', () => {
      expect(parseReaction('0 H2 + O2 -> H2O').errors[0]?.message).toMatch(/coefficient of 0/)
      expect(parseReaction('1/0 H2 + O2 -> H2O').errors[0]?.message).toMatch(/zero denominator/)
      expect(parseReaction('2 -> H2O').errors[0]?.message).toMatch(/Expected a species/)
    })

    it('empty text', () => {
      expect(parseReaction('').errors).toHaveLength(1)
      expect(parseReaction('   ').ok).toBe(false)
    })
  })
})

describe('properties', () => {
  type Span = { start: number; end: number }
  function within(text: string, s: Span): boolean {
    return Number.isInteger(s.start) && Number.isInteger(s.end) && s.start >= 0 && s.start <= s.end && s.end <= text.length
  }
  const show = (v: unknown): string => JSON.stringify(v, (_, x) => (typeof x === 'bigint' ? `${x}n` : x))
  function invariants(text: string): void {
    let r: ParsedReaction | undefined
    expect(() => {
      r = parseReaction(text)
    }).not.toThrow()
    if (r === undefined) return
    for (const e of [...r.errors, ...r.warnings]) expect(within(text, e), show({ text, e })).toBe(true)
    for (const t of [...r.left, ...r.right]) {
      expect(within(text, t), show({ text, t })).toBe(true)
      expect(text.slice(t.start, t.end)).toBe(t.text)
      expect(t.speciesStart >= t.start && t.speciesStart + t.species.length === t.end).toBe(true)
    }
    if (r.arrow) expect(within(text, r.arrow)).toBe(true)
    expect(r.ok).toBe(r.errors.length === 0)
    expect(() => checkBalance(r!)).not.toThrow()
    expect(() => balance(r!)).not.toThrow()
  }

  it('parseReaction never throws on arbitrary strings, and every offset lies in the text', () => {
    fc.assert(fc.property(fc.string({ maxLength: 60 }), invariants), { numRuns: 1000 })
    fc.assert(fc.property(fc.string({ unit: 'binary', maxLength: 60 }), invariants), { numRuns: 1000 })
  })

  it('… nor on strings built from reaction characters', () => {
    const unit = fc.constantFrom(
      ...'HOClNaCuFe0123456789()^+-=<>/.·⁻⁺²³₂ e'.split(''),
      ' + ',
      ' -> ',
      ' → ',
      '⇌',
      '(aq)',
      'Xq',
      '😀',
    )
    fc.assert(fc.property(fc.string({ unit, maxLength: 50 }), invariants), { numRuns: 3000 })
  })

  it('balance does not depend on the coefficients written', () => {
    const cases = CASES.map((c) => {
      const r = parseReaction(c.skeleton)
      return { c, left: r.left.map((t) => t.species), right: r.right.map((t) => t.species), arrow: r.arrow?.text ?? '->' }
    })
    const coef = fc.oneof(fc.constant(''), fc.integer({ min: 1, max: 60 }).map(String), fc.constantFrom('1/2', '0.25', '3/7'))
    fc.assert(
      fc.property(
        fc.constantFrom(...cases),
        fc.array(coef, { minLength: 8, maxLength: 8 }),
        fc.boolean(),
        ({ c, left, right, arrow }, coefs, spaced) => {
          let i = 0
          const term = (s: string): string => {
            const k = coefs[i++] ?? ''
            return k === '' ? s : `${k}${spaced ? ' ' : ''}${s}`
          }
          const text = `${left.map(term).join(' + ')} ${arrow} ${right.map(term).join(' + ')}`
          const b = balance(parseReaction(text))
          expect(b.ok, text).toBe(true)
          if (b.ok) {
            expect(b.coefficients.left).toEqual(big(c.left))
            expect(b.coefficients.right).toEqual(big(c.right))
            expect(checkBalance(parseReaction(b.text)).balanced).toBe(true)
          }
        },
      ),
      { numRuns: 500 },
    )
  })
})

describe('Rational', () => {
  it('normalises: lowest terms, sign in the numerator, zero as 0/1', () => {
    expect(rational(2n, 4n)).toEqual({ num: 1n, den: 2n })
    expect(rational(1n, -2n)).toEqual({ num: -1n, den: 2n })
    expect(rational(-3n, -6n)).toEqual({ num: 1n, den: 2n })
    expect(rational(0n, -5n)).toEqual({ num: 0n, den: 1n })
    expect(rational(6, 3)).toEqual({ num: 2n, den: 1n })
    expect(() => rational(1n, 0n)).toThrow(RangeError)
    expect(() => rational(0.5)).toThrow(RangeError)
  })

  it('adds, subtracts, multiplies and divides exactly', () => {
    const half = rational(1n, 2n)
    const third = rational(1n, 3n)
    expect(add(half, third)).toEqual(rational(5n, 6n))
    expect(sub(third, half)).toEqual(rational(-1n, 6n))
    expect(mul(rational(-2n, 3n), rational(3n, 4n))).toEqual(rational(-1n, 2n))
    expect(div(half, rational(-1n, 4n))).toEqual(rational(-2n))
    expect(add(half, neg(half))).toEqual({ num: 0n, den: 1n })
    expect(() => div(half, rational(0n))).toThrow(RangeError)
    // 0.1 + 0.2 is exactly 3/10 here (not 0.30000000000000004).
    expect(add(rational(1n, 10n), rational(2n, 10n))).toEqual(rational(3n, 10n))
  })

  it('compares, prints and converts', () => {
    expect(ratCompare(rational(1n, 3n), rational(1n, 2n))).toBe(-1)
    expect(ratCompare(rational(2n, 4n), rational(1n, 2n))).toBe(0)
    expect(ratToString(rational(-6n, 4n))).toBe('-3/2')
    expect(ratToString(rational(4n, 2n))).toBe('2')
    expect(ratToNumber(rational(3n, 4n))).toBe(0.75)
    expect(ratToNumber(rational(10n ** 400n, 2n * 10n ** 400n))).toBe(0.5)
  })

  it('gcd and lcm', () => {
    expect(gcd(-12n, 18n)).toBe(6n)
    expect(gcd(0n, 0n)).toBe(0n)
    expect(gcd(0n, -7n)).toBe(7n)
    expect(lcm(4n, 6n)).toBe(12n)
    expect(lcm(-4n, 6n)).toBe(12n)
    expect(lcm(0n, 5n)).toBe(0n)
  })

  it('parses coefficient text', () => {
    expect(parseRational('3')).toEqual(rational(3n))
    expect(parseRational('0.25')).toEqual(rational(1n, 4n))
    expect(parseRational('.5')).toEqual(rational(1n, 2n))
    expect(parseRational('6/4')).toEqual(rational(3n, 2n))
    expect(parseRational('1/0')).toBeNull()
    expect(parseRational('x')).toBeNull()
    expect(parseRational('1e3')).toBeNull()
  })

  it('nullspace of a small matrix', () => {
    // x + y - z = 0, x - y = 0  ->  nullspace spanned by (1, 1, 2) (solved by hand)
    const r = (n: number) => rational(n)
    const basis = nullspace(
      [
        [r(1), r(1), r(-1)],
        [r(1), r(-1), r(0)],
      ],
      3,
    )
    expect(basis).toHaveLength(1)
    expect(basis[0]).toEqual([rational(1n, 2n), rational(1n, 2n), rational(1n)])
  })
})
