// Units and expressions (server/src/core/units.ts): the sandboxed mathjs instance.
//
// Sources of the expected numbers (BINDING rule: nothing below is pasted from a run of the code):
//   - SI Brochure 9th ed. (BIPM 2019): the hour is 3600 s and the minute 60 s (Table 8, non-SI units
//     accepted for use with the SI); litre L = 1 dm^3 = 1e-3 m^3; the degree Celsius is defined by
//     t/°C = T/K - 273.15 (section 2.3.1); prefixes m = 1e-3, µ = 1e-6, k = 1e3, d = 1e-1.
//   - The standard atmosphere 1 atm = 101 325 Pa and 1 bar = 1e5 Pa (definitions, SI Brochure Table 8
//     and ISO 80000-4).
//   - Molar concentration 1 M = 1 mol/L (IUPAC Green Book, 3rd ed., section 2.10, "molar" unit M).
//   - Percent: 1 % = 0.01 (ISO 80000-1).
// Every other expected value is hand arithmetic from those definitions, written out beside it.
import * as fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  evaluateExpression,
  isValuelessUnitFast,
  simpleTree,
  fmt,
  inKindUnit,
  isUnit,
  kindOf,
  MAX_EXPRESSION_LENGTH,
  MAX_NESTING,
  NAME_AT,
  NUMBER_AT,
  INTEGER_AT,
  normalise,
  sandbox,
  toNumber,
  type ExprFailure,
  type Kind,
  type Value,
} from '../server/src/core/units'

const EMPTY: ReadonlyMap<string, Value> = new Map()

/** Evaluate and insist it worked. */
function value(text: string, scope: ReadonlyMap<string, Value> = EMPTY): Value {
  const r = evaluateExpression(text, scope)
  if (!r.ok) throw new Error(`expected \`${text}\` to evaluate, got ${r.failure.reason}: ${r.failure.message}`)
  return r.value
}

/** Evaluate, check the kind, and return the number in the kind's stored unit. */
function inKind(text: string, kind: Kind): number {
  const v = value(text)
  expect(kindOf(v), `kind of \`${text}\``).toBe(kind)
  return inKindUnit(v, kind)
}

/** Evaluate and insist it failed; return the failure. */
function failure(text: string, scope: ReadonlyMap<string, Value> = EMPTY): ExprFailure {
  const r = evaluateExpression(text, scope)
  if (r.ok) throw new Error(`expected \`${text}\` to fail, got a value`)
  return r.failure
}

/** |a - b| / |b| below `tol`. */
function near(actual: number, expected: number, tol = 1e-12): void {
  expect(Math.abs(actual - expected) / Math.abs(expected), `${actual} vs ${expected}`).toBeLessThan(tol)
}

describe('units chemists use', () => {
  it('a current density times an area is a current: 40 mA/cm^2 × 36 cm^2 = 1.44 A', () => {
    // by hand: 40e-3 A/cm^2 × 36 cm^2 = 1.44 A
    near(inKind('40 mA/cm^2 * 36 cm^2', 'current'), 1.44)
    near(inKind('40 mA/cm^2 × 36 cm^2', 'current'), 1.44)
  })

  it('`90 min` is 90 minutes, not the min function', () => {
    // SI Brochure: 1 min = 60 s, so 90 min = 5400 s
    near(inKind('90 min', 'time'), 5400)
    near(inKind('1.5 h', 'time'), 5400)
    // the bare unit name is one minute
    near(inKind('min', 'time'), 60)
  })

  it('`2 h + 30 min` adds durations', () => {
    // 2 × 3600 s + 30 × 60 s = 7200 s + 1800 s = 9000 s
    near(inKind('2 h + 30 min', 'time'), 9000)
  })

  it('Ah and mAh are charges', () => {
    // 1 A·h = 1 A × 3600 s = 3600 C; 250 mA·h = 0.25 × 3600 C = 900 C
    near(inKind('1 Ah', 'charge'), 3600)
    near(inKind('250 mAh', 'charge'), 900)
    near(inKind('2 A * 3 h', 'charge'), 2 * 3 * 3600)
  })

  it('M and mM are mol/L', () => {
    // IUPAC Green Book: 1 M = 1 mol/L; m = 1e-3; µ = 1e-6
    near(inKind('0.5 M', 'molarity'), 0.5)
    near(inKind('2 mM', 'molarity'), 0.002)
    near(inKind('5 µM', 'molarity'), 5e-6)
    near(inKind('1 mol/L', 'molarity'), 1)
    near(inKind('250 mmol / 500 mL', 'molarity'), 0.5) // 0.25 mol ÷ 0.5 L
  })

  it('g/L is a mass concentration', () => {
    near(inKind('300 g/L', 'mass-concentration'), 300)
    near(inKind('30 g / 100 mL', 'mass-concentration'), 300) // 30 g ÷ 0.1 L
  })

  it('`25 wt%` is a mass fraction, kept in percent', () => {
    expect(inKind('25 wt%', 'mass-fraction')).toBe(25)
    // and it is not a plain 0.25: a mass fraction is its own kind
    expect(kindOf(value('25 wt%'))).not.toBe('dimensionless')
  })

  it('°C and degC are temperatures in kelvin: 22 °C = 295.15 K', () => {
    // SI Brochure 2.3.1: T/K = t/°C + 273.15, so 22 °C = 295.15 K, 0 °C = 273.15 K, -40 °C = 233.15 K
    near(inKind('22 °C', 'temperature'), 295.15)
    near(inKind('22 degC', 'temperature'), 295.15)
    near(inKind('0 degC', 'temperature'), 273.15)
    near(inKind('-40 degC', 'temperature'), 233.15)
    near(inKind('300 K', 'temperature'), 300)
  })

  it('`85 %` is 0.85', () => {
    // ISO 80000-1: 1 % = 0.01
    const v = value('85 %')
    expect(kindOf(v)).toBe('dimensionless')
    near(inKindUnit(v, 'dimensionless'), 0.85)
    near(inKind('100 %', 'dimensionless'), 1)
  })

  it('`·`, `×` and `⋅` multiply', () => {
    for (const op of ['·', '×', '⋅', '*']) near(inKind(`2 ${op} 3 A`, 'current'), 6)
  })

  it('µ (micro sign) and μ (Greek mu) are the micro prefix', () => {
    // 5 µA = 5e-6 A
    near(inKind('5 µA', 'current'), 5e-6)
    near(inKind('5 μA', 'current'), 5e-6)
  })

  it('superscript ² and ³ and the minus sign − are read', () => {
    near(inKind('2 cm²', 'area'), 2)
    near(inKind('3 dm³', 'volume'), 3) // 1 dm^3 = 1 L
    near(inKind('−2 A', 'current'), -2)
  })

  it('other units: pressure, volume, area, energy, power', () => {
    near(inKind('1 atm', 'pressure'), 101325) // definition of the standard atmosphere
    near(inKind('1 bar', 'pressure'), 1e5) // definition of the bar
    near(inKind('101.325 kPa', 'pressure'), 101325)
    near(inKind('250 mL', 'volume'), 0.25)
    near(inKind('1 dm^2', 'area'), 100) // (10 cm)^2
    near(inKind('1 m^2', 'area'), 1e4) // (100 cm)^2
    near(inKind('2 cm', 'length'), 0.02)
    near(inKind('1 Wh', 'energy'), 3600) // 1 W × 3600 s
    // a constant-voltage step: 3.6 V × 1.2 A × 2 h = 8.64 W·h = 8.64 × 3600 J = 31104 J
    near(inKind('3.6 V * 1.2 A * 2 h', 'energy'), 31104)
    near(inKind('3 V * 2 A', 'power'), 6)
    near(inKind('58.44 g/mol', 'molar-mass'), 58.44)
  })

  it('sqrt and abs are allowed', () => {
    near(inKind('sqrt(4 cm^2)', 'length'), 0.02) // 2 cm
    near(inKind('abs(-2 A)', 'current'), 2)
    near(inKind('2 * pi', 'dimensionless'), 2 * Math.PI)
  })

  it('numbers pass through toNumber and isUnit tells values apart', () => {
    expect(toNumber(3, 'A')).toBe(3)
    expect(isUnit(3)).toBe(false)
    expect(isUnit(value('3 A'))).toBe(true)
    near(toNumber(value('1500 mA'), 'A'), 1.5)
  })
})

describe('kinds', () => {
  const cases: [string, Kind | 'other'][] = [
    ['2 A', 'current'],
    ['500 mA', 'current'],
    ['2 A/dm^2', 'current-density'],
    ['40 mA/cm^2', 'current-density'],
    ['3 kA/m^2', 'current-density'],
    ['3.6 V', 'voltage'],
    ['100 C', 'charge'],
    ['1 Ah', 'charge'],
    ['5 h', 'time'],
    ['36 cm^2', 'area'],
    ['1 L', 'volume'],
    ['1 g', 'mass'],
    ['1 mol', 'amount'],
    ['1 M', 'molarity'],
    ['1 g/L', 'mass-concentration'],
    ['1 wt%', 'mass-fraction'],
    ['1 kPa', 'pressure'],
    ['25 degC', 'temperature'],
    ['1 J', 'energy'],
    ['1 W', 'power'],
    ['1 g/mol', 'molar-mass'],
    ['3', 'dimensionless'],
    ['50 %', 'dimensionless'],
    ['1 m/s', 'other'],
    ['1 A*V/m', 'other'],
  ]
  it.each(cases)('%s is %s', (text, kind) => {
    expect(kindOf(value(text))).toBe(kind)
  })

  it('a current, a current density and a voltage are three different kinds', () => {
    const kinds = new Set(['1 A', '1 A/m^2', '1 V'].map((t) => kindOf(value(t))))
    expect(kinds.size).toBe(3)
  })

  it('inKindUnit converts into the stored unit of the kind', () => {
    // 40 mA/cm^2 = 40e-3 A / 1e-4 m^2 = 400 A/m^2
    near(inKind('40 mA/cm^2', 'current-density'), 400)
    // 2 A/dm^2 = 2 A / 1e-2 m^2 = 200 A/m^2
    near(inKind('2 A/dm^2', 'current-density'), 200)
    // 0.5 mol/L of a 58.44 g/mol salt: 29.22 g/L
    near(inKind('0.5 mol/L * 58.44 g/mol', 'mass-concentration'), 29.22)
  })
})

describe('names', () => {
  it('an unknown name reports the name and its offsets in the text as written', () => {
    const f = failure('foo * 2')
    expect(f).toMatchObject({ reason: 'unknown-name', name: 'foo', start: 0, end: 3 })
    const g = failure('2 A * qq')
    expect(g).toMatchObject({ reason: 'unknown-name', name: 'qq', start: 6, end: 8 })
    expect(g.message).toContain('qq')
  })

  it('offsets count the text as written even when `°C`, `µ` or `·` were rewritten', () => {
    // '22 °C + qq': q is at index 8 of the original text ('2','2',' ','°','C',' ','+',' ','q')
    expect(failure('22 °C + qq')).toMatchObject({ reason: 'unknown-name', name: 'qq', start: 8, end: 10 })
    // '5 µA · qq': q at index 7
    expect(failure('5 µA · qq')).toMatchObject({ reason: 'unknown-name', name: 'qq', start: 7, end: 9 })
  })

  it('a let value from the scope is used, and may shadow a unit name', () => {
    const scope = new Map<string, Value>([['area', value('36 cm^2')], ['min', 3]])
    const v = value('40 mA/cm^2 * area', scope)
    near(inKindUnit(v, 'current'), 1.44)
    // `min` is a let value here: 2 × 3 = 6, a plain number
    expect(value('2 * min', scope)).toBe(6)
  })

  it('names of mathjs functions and constants are not reachable', () => {
    for (const name of ['faraday', 'createUnit', 'parse', 'evaluate', 'e', 'i']) {
      expect(failure(name)).toMatchObject({ reason: 'unknown-name', name })
    }
  })
})

describe('refused constructs', () => {
  const refused: [string, string][] = [
    ['sin(2)', 'a function other than sqrt/abs'],
    ['min(1, 2)', 'min as a function'],
    ['evaluate("1+1")', 'evaluate'],
    ['import(x)', 'import'],
    ['x = 3', 'assignment'],
    ['f(x) = x', 'function assignment'],
    ['[1, 2]', 'a matrix'],
    ['1:3', 'a range'],
    ['{a: 1}', 'an object'],
    ['a.b', 'an accessor'],
    ['a[1]', 'an index'],
    ['true ? 1 : 2', 'a conditional'],
    ['1 < 2', 'a comparison operator'],
    ['1 < 2 < 3', 'a chained comparison'],
    ['1 == 1', 'equality'],
    ['"text"', 'a string'],
    ['1; 2', 'a block'],
    ['7 mod 3', 'mod'],
    ['3!', 'factorial'],
  ]
  it.each(refused)('%s (%s) is refused', (text) => {
    const f = failure(text)
    expect(f.reason).toBe('refused')
    expect(f.start).toBeGreaterThanOrEqual(0)
    expect(f.end).toBeLessThanOrEqual(text.length)
    expect(f.end).toBeGreaterThan(f.start)
  })

  it('a refused function call points at the function name', () => {
    expect(failure('2 * sin(2)')).toMatchObject({ reason: 'refused', start: 4, end: 7 })
  })

  it('mixing kinds in a sum is a math failure, not a crash', () => {
    expect(failure('1 A + 1 V').reason).toBe('math')
    expect(failure('1 / 0').reason).toBe('math')
  })

  it('a syntax error is reported as such', () => {
    expect(failure('2 A +').reason).toBe('syntax')
    expect(failure('').reason).toBe('syntax')
  })
})

describe('length and nesting caps', () => {
  it(`an expression of ${MAX_EXPRESSION_LENGTH} characters is read, one more is 'too-long'`, () => {
    expect(MAX_EXPRESSION_LENGTH).toBe(400)
    const ok = '2' + ' '.repeat(397) + ' A' // 1 + 397 + 2 = 400 characters
    expect(ok.length).toBe(400)
    near(inKindUnit(value(ok), 'current'), 2)
    const long = '2' + ' '.repeat(398) + ' A' // 401 characters
    expect(long.length).toBe(401)
    expect(failure(long)).toMatchObject({ reason: 'too-long', start: 0, end: 401 })
  })

  it(`nesting of ${MAX_NESTING} parentheses is read, 33 is 'too-long'`, () => {
    expect(MAX_NESTING).toBe(32)
    const nest = (n: number) => '('.repeat(n) + '1' + ')'.repeat(n)
    expect(value(nest(32))).toBe(1)
    expect(failure(nest(33)).reason).toBe('too-long')
    expect(failure(nest(200)).reason).toBe('too-long')
  })

  it("a deep chain of unary minus is 'too-long' too", () => {
    expect(failure('- '.repeat(40) + '1').reason).toBe('too-long')
  })
})

describe('the sandbox', () => {
  const names = ['import', 'createUnit', 'evaluate', 'parse', 'simplify', 'derivative', 'resolve', 'reviver'] as const
  it.each(names)('%s is disabled', (name) => {
    expect(sandbox.tryDisabled(name)).toContain('disabled')
  })
})

describe('the cache', () => {
  it('the same text evaluated twice gives the same result', () => {
    const a = value('2 h + 30 min')
    const b = value('2 h + 30 min')
    near(toNumber(a, 's'), 9000)
    near(toNumber(b, 's'), 9000)
  })

  it('a cached expression still honours a different scope each time', () => {
    const text = 'q_cache_probe * 2'
    near(toNumber(value(text, new Map([['q_cache_probe', value('1 A')]])), 'A'), 2)
    const v = value(text, new Map([['q_cache_probe', value('3 V')]]))
    expect(kindOf(v)).toBe('voltage')
    near(toNumber(v, 'V'), 6)
    expect(value(text, new Map([['q_cache_probe', 5]]))).toBe(10)
    expect(failure(text)).toMatchObject({ reason: 'unknown-name', name: 'q_cache_probe' })
  })

  it('an expression of units only is kept with its result, until a named value shadows one of its units', () => {
    const text = '7.25 mL'
    const first = evaluateExpression(text, EMPTY)
    expect(evaluateExpression(text, EMPTY)).toBe(first)
    // `mL` as a named value (shadowing the unit) is read, and the result follows it each time.
    const shadowed = evaluateExpression(text, new Map([['mL', value('2 A')]]))
    expect(shadowed).not.toBe(first)
    expect(shadowed.ok && kindOf(shadowed.value)).toBe('current')
    expect(evaluateExpression(text, EMPTY)).toMatchObject({ ok: true, kind: 'volume' })
  })

  it('a cached failure stays a failure', () => {
    expect(failure('sin(1)').reason).toBe('refused')
    expect(failure('sin(1)').reason).toBe('refused')
  })
})

describe('normalise', () => {
  it('rewrites the typographic forms and maps every character back', () => {
    const n = normalise('22 °C')
    expect(n.text).toBe('22 degC')
    // '°C' (2 characters at 3-4) became 'degC' (4 characters), all mapped back to 3
    expect(n.map).toEqual([0, 1, 2, 3, 3, 3, 3, 5])
  })

  it('handles wt%, ·, ×, µ, ², ³ and −', () => {
    expect(normalise('25 wt%').text).toBe('25 wtpct')
    expect(normalise('2·3×4⋅5').text).toBe('2*3*4*5')
    expect(normalise('5 µA').text).toBe('5 uA')
    expect(normalise('5 μA').text).toBe('5 uA')
    expect(normalise('cm² dm³').text).toBe('cm^2 dm^3')
    expect(normalise('−1').text).toBe('-1')
    expect(normalise('50 °F').text).toBe('50 degF')
  })

  it('the shortcut for text with nothing to replace gives what the character-by-character pass gives', () => {
    // Mostly printable ASCII, with the characters and words normalise() rewrites mixed in.
    const piece = fc.oneof(
      fc.string({ unit: fc.integer({ min: 32, max: 126 }).map((c) => String.fromCharCode(c)), maxLength: 6 }),
      fc.constantFrom('w', 'wt%', 'wt %', '°C', '℃', '·', '−', 'µ', '²', '\t', '\u00a0', '\n', ' h ', ' min ', '1 h 30 min', '2 min 5 s', 'h 3', 'min 2s'),
    )
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 6 }), (parts) => {
        const t = parts.join('')
        expect(normalise(t), JSON.stringify(t)).toEqual(sandbox.normaliseByCharacter(t))
      }),
      { numRuns: 3000, seed: 11 },
    )
  })

  it('leaves plain text alone, with an identity map plus the end', () => {
    const n = normalise('2 A')
    expect(n.text).toBe('2 A')
    expect(n.map).toEqual([0, 1, 2, 3])
  })

  it('does not rewrite `wt%` inside a longer word', () => {
    expect(normalise('xwt%').text).toBe('xwt%')
  })
})

describe('fmt', () => {
  // expected strings are rounding by hand to 3 significant figures (the default)
  it.each([
    [1.23456, 3, '1.23'],
    [1.235, 2, '1.2'],
    [0.0012345, 3, '0.00123'],
    [123.456, 3, '123'],
    [123456, 3, '123456'],
    [1234567, 3, '1.23e6'],
    [0.0001234, 3, '1.23e-4'],
    [0, 3, '0'],
    [-0.5, 3, '-0.5'],
    [1, 3, '1'],
    [2.5, 4, '2.5'],
    [96485.33212, 9, '96485.3321'],
  ])('fmt(%d, %d) = %s', (n, sig, s) => {
    expect(fmt(n, sig)).toBe(s)
  })

  it('non-finite numbers are printed as such', () => {
    expect(fmt(Infinity)).toBe('Infinity')
    expect(fmt(NaN)).toBe('NaN')
  })
})

describe('the fast unit-name test agrees with mathjs', () => {
  // The oracle is mathjs's own Unit.isValuelessUnit on the same instance (our units included).
  const table = sandbox.unitTable()

  it('on every unit name, and on every allowed prefix with every unit', () => {
    let checked = 0
    for (const u of table) {
      expect(isValuelessUnitFast(u.name), u.name).toBe(sandbox.mathjsIsValuelessUnit(u.name))
      for (const p of u.prefixes) {
        const name = p + u.name
        expect(isValuelessUnitFast(name), name).toBe(sandbox.mathjsIsValuelessUnit(name))
        checked++
      }
    }
    expect(checked).toBeGreaterThan(1000) // mathjs knows hundreds of units, most with 20+ prefixes
  })

  it('on names that are not units, near misses and random strings', () => {
    const prefixes = [...new Set(table.flatMap((u) => u.prefixes))]
    const names = table.map((u) => u.name)
    const near = fc.oneof(
      fc.string({ maxLength: 8 }),
      fc.tuple(fc.constantFrom(...prefixes), fc.constantFrom(...names)).map(([p, n]) => p + n),
      fc.tuple(fc.constantFrom(...prefixes, 'x', 'j', 'q'), fc.constantFrom(...names), fc.constantFrom('', '1', 's', '_')).map(([p, n, t]) => p + n + t),
      fc.constantFrom('area', 'j12', 'feed', 'panel', 'inH2O', 'mmHg', 'kk', 'mmm', 'Ah', 'mAh', 'kAh', 'wtpct', 'degC', ''),
    )
    fc.assert(
      fc.property(near, (name) => isValuelessUnitFast(name) === sandbox.mathjsIsValuelessUnit(name)),
      { numRuns: 3000, seed: 11 },
    )
  })
})

describe('our tree-walking evaluation agrees with mathjs compile()', () => {
  // The oracle is mathjs's own compile().evaluate() of the same parsed expression, with the same scope
  // (named values, and the unit values evaluateExpression places for unit names).
  const UNITS = ['g', 'kg', 'mL', 'L', 'A', 'mA', 'h', 'min', 's', 'cm', 'mol', 'V', 'Ah', 'wtpct']
  const scope = () => {
    const m = new Map<string, unknown>()
    for (const u of UNITS) m.set(u, sandbox.unitValue(u))
    m.set('area', value('36 cm^2'))
    m.set('j', value('40 mA/cm^2'))
    m.set('n', value('3'))
    return m
  }
  const num = fc.oneof(fc.integer({ min: 0, max: 1000 }).map(String), fc.constantFrom('0.5', '1e3', '2.5e-3', '0', '1e308'))
  const expr: fc.Arbitrary<string> = fc.letrec((tie) => ({
    atom: fc.oneof(
      num,
      fc.tuple(num, fc.constantFrom(...UNITS)).map(([a, u]) => `${a} ${u}`),
      fc.tuple(num, fc.constantFrom(...UNITS), fc.constantFrom('2', '3', '-1')).map(([a, u, p]) => `${a} ${u}^${p}`),
      num.map((a) => `${a} %`),
      fc.constantFrom('area', 'j', 'n', 'pi'),
    ),
    expr: fc.oneof(
      { arbitrary: tie('atom'), weight: 4 },
      fc.tuple(tie('expr'), fc.constantFrom(' + ', ' - ', ' * ', ' / ', ' '), tie('expr')).map(([a, op, b]) => `${a}${op}${b}`),
      tie('expr').map((e) => `(${e})`),
      tie('expr').map((e) => `-${e}`),
      fc.tuple(tie('atom'), fc.constantFrom('2', '3', '-1', '0.5')).map(([a, p]) => `(${a})^${p}`),
      fc.tuple(fc.constantFrom('sqrt', 'abs'), tie('expr')).map(([f, e]) => `${f}(${e})`),
    ),
  })).expr as fc.Arbitrary<string>

  const outcome = (f: () => unknown): string => {
    try {
      const v = f()
      if (typeof v === 'number') return `number ${Object.is(v, -0) ? '-0' : String(v)}`
      if (isUnit(v)) {
        // Field by field: the unit list (unit, prefix, power), dimensions, value and both flags.
        const u = v as unknown as { units: { unit: { name: string }; prefix: { name: string }; power: number }[]; dimensions: number[]; fixPrefix: boolean; skipAutomaticSimplification: boolean }
        const parts = u.units.map((p) => `${p.prefix.name}${p.unit.name}^${p.power}`).join(' ')
        return `unit ${parts} [${u.dimensions.join(',')}] ${String(v.value)} fix=${u.fixPrefix} skip=${u.skipAutomaticSimplification} ${v.formatUnits()}`
      }
      return `other ${String(v)}`
    } catch (e) {
      return 'throws'
    }
  }

  it('evaluateExpression with the document\'s named values gives the same values (the names it reads found without a scope Map)', () => {
    const named = new Map<string, Value>([
      ['area', value('36 cm^2')],
      ['j', value('40 mA/cm^2')],
      ['n', value('3')],
    ])
    let compared = 0
    fc.assert(
      fc.property(expr, (e) => {
        if (e.length > MAX_EXPRESSION_LENGTH) return
        const r = evaluateExpression(e, named)
        const theirs = outcome(() => sandbox.mathjsEvaluate(e, scope()))
        // Ours refuses more (caps, values that are not finite): compare where ours gives a value.
        if (!r.ok) return
        compared++
        expect(outcome(() => r.value), e).toBe(theirs)
      }),
      { numRuns: 2000, seed: 37 },
    )
    expect(compared).toBeGreaterThan(1000)
  })

  it('the same value (or both refuse) over 3,000 generated expressions', () => {
    let compared = 0
    let capped = 0
    fc.assert(
      fc.property(expr, (e) => {
        if (e.length > MAX_EXPRESSION_LENGTH) return
        const ours = outcome(() => sandbox.cellrunEvaluate(e, scope()))
        const theirs = outcome(() => sandbox.mathjsEvaluate(e, scope()))
        // Where ours refuses and mathjs evaluates, it is one of our caps (nesting, huge powers).
        if (ours === 'throws' && theirs !== 'throws') {
          capped++
          return
        }
        compared++
        expect(ours, e).toBe(theirs)
      }),
      { numRuns: 3000, seed: 5 },
    )
    // The comparison is not vacuous: nearly every expression is compared value for value.
    expect(compared).toBeGreaterThan(20 * capped)
  })
})

describe('numbers in a kind\'s unit are mathjs\'s numbers', () => {
  // The oracle is mathjs's Unit.toNumber on the same value; the result must be the same bit for bit.
  const UNITS = ['g', 'kg', 'mg', 'ug', 'mol', 'mmol', 'L', 'mL', 'uL', 'm^3', 'cm^3', 'cm^2', 'dm^2', 'm^2', 'mm^2', 'mm', 'm', 'A', 'mA', 'kA', 'A/cm^2', 'mA/cm^2', 'A/dm^2', 'A/m^2', 'V', 'mV', 's', 'min', 'h', 'day', 'C', 'A h', 'mA h', 'K', 'degC', 'degF', 'Pa', 'kPa', 'bar', 'atm', 'psi', 'mol/L', 'M', 'mM', 'g/L', 'mg/L', 'wtpct', 'ppmw', 'J', 'kJ', 'W h', 'kW h', 'W', 'kW', 'g/mol', 'kg/mol']
  it('for values of every kind, written in every usual unit and as products', () => {
    const num = fc.oneof(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: -5000, max: 5000 }), fc.constantFrom(0, 1, 0.1, 273.15, 1e-9))
    const text = fc.oneof(
      fc.tuple(num, fc.constantFrom(...UNITS)).map(([n, u]) => `${n} ${u}`),
      fc.tuple(num, fc.constantFrom(...UNITS), num, fc.constantFrom(...UNITS), fc.constantFrom('*', '/')).map(([a, u, b, w, op]) => `(${a} ${u}) ${op} (${b} ${w})`),
    )
    let compared = 0
    fc.assert(
      fc.property(text, (t) => {
        const r = evaluateExpression(t, EMPTY)
        if (!r.ok || typeof r.value === 'number') return
        const k = kindOf(r.value)
        if (k === 'other' || k === 'dimensionless') return
        compared++
        expect(inKindUnit(r.value, k), t).toBe(r.value.toNumber(sandbox.kindUnit(k) as unknown as string))
      }),
      { numRuns: 4000, seed: 23 },
    )
    expect(compared).toBeGreaterThan(1500)
  })

  it('two values have the same base dimensions exactly when mathjs\'s equalBase says so', () => {
    // The oracle is mathjs's Unit.equalBase; the values include fractional powers (sqrt) within and
    // beyond its 1e-12 tolerance.
    const vals = [...UNITS.map((u) => sandbox.unitValue(u)), ...['sqrt(4 m^2)', 'sqrt(2 m^2) * sqrt(2 m^2) / m', '(1 m)^(1/3)', '(1 m)^(0.3333333333333)', '2 A / m^2', '3 mA/cm^2'].map((t) => {
      const r = evaluateExpression(t, EMPTY)
      return r.ok && typeof r.value !== 'number' ? r.value : sandbox.unitValue('m')
    })]
    let same = 0
    for (const a of vals) {
      for (const b of vals) {
        const theirs = a.equalBase(b)
        expect(sandbox.sameBase(a, b), `${a.toString()} / ${b.toString()}`).toBe(theirs)
        if (theirs) same++
      }
    }
    expect(same).toBeGreaterThan(vals.length)
  })
})

describe('a number times a unit is mathjs\'s product', () => {
  // The oracle is the sandboxed instance's own multiply(x, unit), compared field by field.
  const fields = (v: unknown) => {
    if (!isUnit(v)) return { plain: v }
    const u = v as unknown as { value: number; dimensions: number[]; fixPrefix: boolean; skipAutomaticSimplification: boolean; units: { unit: { name: string }; prefix: { name: string }; power: number }[] }
    return {
      keys: Object.keys(u),
      value: Object.is(u.value, -0) ? '-0' : u.value,
      dimensions: u.dimensions,
      fixPrefix: u.fixPrefix,
      skip: u.skipAutomaticSimplification,
      units: u.units.map((x) => [Object.keys(x).join(','), x.unit.name, x.prefix.name, x.power]),
    }
  }
  it('for every unit mathjs knows here, with and without prefixes, and any number', () => {
    const names: string[] = []
    for (const { name, prefixes } of sandbox.unitTable()) {
      names.push(name)
      for (const p of prefixes.slice(0, 3)) if (p) names.push(p + name)
    }
    const usable = names.filter((n) => {
      try {
        return isUnit(sandbox.unitValue(n))
      } catch {
        return false
      }
    })
    expect(usable.length).toBeGreaterThan(200)
    let fast = 0
    fc.assert(
      fc.property(fc.constantFrom(...usable), fc.oneof(fc.double({ noNaN: true }), fc.integer(), fc.constantFrom(0, -0, 1, 0.1, 1e-300, 1e300)), (name, x) => {
        const unit = sandbox.unitValue(name)
        const ours = sandbox.scaledUnit(unit, x)
        if (ours === undefined) return
        fast++
        expect(fields(ours), `${x} ${name}`).toEqual(fields(sandbox.mathjsMultiply(x, unit)))
      }),
      { numRuns: 5000, seed: 43 },
    )
    expect(fast).toBeGreaterThan(4000)
  })
})

describe('a number times a unit name shares its unit list and dimensions (frozen) without changing what mathjs does with it', () => {
  // The oracle: the same operations on mathjs's own product, which owns its parts.
  const ops: [string, (u: any) => unknown][] = [
    ['toString', (u) => u.toString()],
    ['format', (u) => u.format({ precision: 6 })],
    ['formatUnits', (u) => u.formatUnits()],
    ['toJSON', (u) => JSON.stringify(u)],
    ['clone', (u) => u.clone().toString()],
    ['toSI', (u) => u.toSI().toString()],
    ['simplify', (u) => u.simplify().toString()],
    ['to', (u) => { try { return u.to(u.formatUnits()).toString() } catch (e) { return String(e) } }],
    ['toNumber', (u) => u.toNumber(u.formatUnits())],
    ['times itself', (u) => sandbox.mathjsProduct(u, u, false)?.toString()],
    ['by itself', (u) => String(sandbox.mathjsProduct(u, u, true))],
    ['times 3', (u) => sandbox.mathjsProduct(u, 3, false)?.toString()],
    ['pow 2', (u) => u.pow(2).toString()],
    ['pow 0.5', (u) => u.pow(0.5).toString()],
    ['abs', (u) => u.abs().toString()],
    ['equals', (u) => u.equals(u.clone())],
    ['equalBase', (u) => u.equalBase(u)],
    ['splitUnit', (u) => { try { return u.splitUnit([u.formatUnits()]).map(String).join(' ') } catch (e) { return String(e) } }],
  ]
  it('for common units and values, every operation gives what it gives on mathjs\'s product, and leaves the shared parts as they were', () => {
    for (const name of ['g', 'kg', 'mL', 'L', 'A', 'mA', 'h', 'min', 's', 'cm', 'mol', 'V', 'Ah', 'wtpct', 'degC', 'K', 'Pa', 'bar', 'J', 'W']) {
      const unit = sandbox.unitValue(name)
      for (const x of [0, 2.5, -4, 1e-9, 123456.789]) {
        const ours = sandbox.scaledUnit(unit, x) as any
        if (ours === undefined) continue
        const theirs = sandbox.mathjsMultiply(x, unit) as any
        const before = JSON.stringify([ours.units.map((p: any) => [p.unit.name, p.prefix.name, p.power]), ours.dimensions])
        const run = (op: (u: any) => unknown, u: unknown) => {
          try {
            return op(u)
          } catch (e) {
            return `throws ${String(e)}`
          }
        }
        for (const [what, op] of ops) expect(run(op, ours), `${what} of ${x} ${name}`).toEqual(run(op, theirs))
        expect(JSON.stringify([ours.units.map((p: any) => [p.unit.name, p.prefix.name, p.power]), ours.dimensions])).toBe(before)
        expect(Object.isFrozen(ours.units) && Object.isFrozen(ours.dimensions)).toBe(true)
      }
    }
  })
})

describe('a unit times or by a number or a unit is mathjs\'s product and quotient', () => {
  // The oracle is the sandboxed instance's own multiply(a, b) and divide(a, b), compared field by
  // field: value (bit for bit, -0 apart), dimensions, both flags, the unit list with each entry's
  // keys in order, and the class of the result.
  const fields = (v: unknown) => {
    if (!isUnit(v)) return { plain: Object.is(v, -0) ? '-0' : v }
    const u = v as unknown as { value: number; dimensions: number[]; fixPrefix: boolean; skipAutomaticSimplification: boolean; units: Record<string, unknown>[] }
    return {
      proto: Object.getPrototypeOf(v) === Object.getPrototypeOf(sandbox.unitValue('g')),
      keys: Object.keys(u),
      value: Object.is(u.value, -0) ? '-0' : u.value,
      dimensions: u.dimensions.map((d) => (Object.is(d, -0) ? '-0' : d)),
      fixPrefix: u.fixPrefix,
      skip: u.skipAutomaticSimplification,
      units: u.units.map((x) => [Object.keys(x).join(','), (x.unit as { name: string }).name, (x.prefix as { name: string }).name, Object.is(x.power, -0) ? '-0' : x.power]),
    }
  }
  // (fractional powers: 0.1 + 0.2 - 0.3 is not 0 but within mathjs's 1e-12 of it)
  const UNITS = ['g', 'kg', 'mL', 'L', 'A', 'mA', 'h', 'min', 's', 'cm', 'cm^2', 'm^3', 'mol', 'V', 'Ah', 'wtpct', 'mA/cm^2', 'mol/L', 'g/mol', 'kW h', 'degC', 'K', 'Pa', 'm/s^2', 'm^0.1', 'm^0.2', 'm^0.3']
  const num = fc.oneof(fc.double({ noNaN: true }), fc.integer({ min: -1000, max: 1000 }), fc.constantFrom(0, -0, 1, 0.5, 1e-300, 1e300, Infinity))
  // Valued units made by mathjs itself (1 UNIT times any number, non-finite ones included).
  const valued = fc
    .tuple(num, fc.constantFrom(...UNITS), fc.option(fc.constantFrom(...UNITS)))
    .map(([x, u, w]) => sandbox.mathjsProduct((w ? sandbox.mathjsProduct(value(`1 ${u}`) as never, value(`1 ${w}`) as never, false) : value(`1 ${u}`)) as never, x, false))
  it('for valued units of many kinds, numbers, and valueless units (which go the mathjs way)', () => {
    let fast = 0
    const operand = fc.oneof(valued, num, fc.constantFrom(...UNITS).map((u) => value(u)))
    fc.assert(
      fc.property(valued, operand, fc.boolean(), (a, b, divide) => {
        if (!isUnit(a)) return
        const ours = sandbox.unitProduct(a, b as never, divide)
        if (ours === undefined) return
        fast++
        expect(fields(ours), `${divide ? 'divide' : 'multiply'}`).toEqual(fields(sandbox.mathjsProduct(a, b as never, divide)))
      }),
      { numRuns: 5000, seed: 47 },
    )
    expect(fast).toBeGreaterThan(2500)
  })
  it('a result whose dimensions are within 1e-12 of none is a number, as in mathjs', () => {
    // 0.1 + 0.2 - 0.3 = 5.6e-17: mathjs's equalBase tolerance makes m^0.1 · m^0.2 / m^0.3 a plain number.
    const a = sandbox.mathjsProduct(value('2 m^0.1') as never, value('3 m^0.2') as never, false)
    for (const [b, divide] of [[value('4 m^0.3'), true], [value('4 m^-0.3'), false], [value('4 m^0.31'), true]] as const) {
      const ours = sandbox.unitProduct(a as never, b as never, divide)
      expect(ours).not.toBeUndefined()
      expect(fields(ours)).toEqual(fields(sandbox.mathjsProduct(a as never, b as never, divide)))
    }
    expect(typeof sandbox.unitProduct(a as never, value('4 m^0.3') as never, true)).toBe('number')
  })
})

describe('the trees built without the parser are the parser\'s trees', () => {
  // The oracle is mathjs's own parser on the same (normalised) text.
  type Shape = { type: string; fn?: string; op?: string; implicit?: boolean; isPercentage?: boolean; name?: string; value?: unknown; args?: Shape[] }
  const shape = (n: unknown): Shape => {
    const x = n as Shape & { args?: unknown[] }
    return {
      type: x.type,
      ...(x.fn !== undefined ? { fn: typeof x.fn === 'string' ? x.fn : 'node' } : {}),
      ...(x.op !== undefined ? { op: x.op } : {}),
      ...(x.type === 'OperatorNode' ? { implicit: !!x.implicit, isPercentage: !!x.isPercentage } : {}),
      ...(x.name !== undefined ? { name: x.name } : {}),
      ...(x.type === 'ConstantNode' ? { value: x.value } : {}),
      ...(x.args ? { args: x.args.map(shape) } : {}),
    }
  }
  const num = fc.oneof(fc.nat({ max: 100000 }).map(String), fc.constantFrom('0.5', '1e3', '2.5E-3', '007', '1e400', '0.000', '12.75'))
  const name = fc.oneof(
    fc.constantFrom('g', 'kg', 'mL', 'A', 'mA', 'min', 'h', 'area', 'j12', 'x_1', 'e', 'i', 'pi', 'Infinity', 'NaN', 'percent', 'wtpct', 'degC'),
    fc.constantFrom('in', 'to', 'mod', 'and', 'or', 'not', 'xor', 'true', 'false', 'null', 'undefined', 'end'),
  )
  // Including white space the parser does not skip (it refuses those): they must go to the parser.
  const ws = fc.constantFrom('', ' ', '  ', '\t', '\u00a0', '\u3000', '\u2028', '\v', '\ufeff', '\n', '\r')
  const term = fc.oneof(num, name)
  const text = fc.oneof(
    fc.tuple(ws, term, ws).map(([a, t, b]) => a + t + b),
    fc.tuple(num, fc.constantFrom(' ', '  ', '\t', '\u00a0', '\u3000', '\v'), name).map(([n, w, u]) => n + w + u),
    fc.tuple(name, fc.constantFrom(' ', '  '), name).map(([a, w, b]) => a + w + b),
    fc.tuple(term, ws, fc.constantFrom('*', '/', '+', '-', '^'), ws, term).map(([a, w1, op, w2, b]) => a + w1 + op + w2 + b),
    fc.tuple(term, ws, term, fc.constantFrom('', ' kg', ' * 2')).map(([a, w, b, c]) => a + w + b + c),
    // Percentages, powers and chains of * and /, with near misses (`%` that is a modulo, a power of a
    // power, a decimal or named exponent, an implicit multiplication after an operator).
    fc.tuple(ws, num, ws, fc.constantFrom('%', '%%', '% 2', '% * 2', '%x'), ws).map(([a, n, w, p, b]) => a + n + w + p + b),
    fc.tuple(name, ws, fc.constantFrom('^', '**'), ws, fc.constantFrom('2', '-2', '+3', '02', '2.5', '2e1', 'x', '-', '2^2', '2 ^ 3', '2x', '10')).map(([u, w1, c, w2, e]) => u + w1 + c + w2 + e),
    fc
      .tuple(
        fc.oneof(num, name, fc.tuple(num, fc.constantFrom(' ', '', '  '), name).map(([n, w, u]) => n + w + u)),
        fc.array(fc.tuple(ws, fc.constantFrom('*', '/', '^', '%', ''), ws, fc.oneof(term, fc.tuple(name, fc.constantFrom('^2', '^-1', ' ^ 3', '^2.5')).map(([u, p]) => u + p), fc.tuple(num, fc.constantFrom(' ', ''), name).map(([n, w, u]) => n + w + u))), { maxLength: 4 }),
      )
      .map(([first, rest]) => first + rest.map(([w1, op, w2, t]) => w1 + op + w2 + t).join('')),
  )

  it('the same tree as mathjs parses, for every text it builds one for', () => {
    let built = 0
    let passed = 0
    fc.assert(
      fc.property(text, (t) => {
        const ours = simpleTree(t)
        if (!ours) {
          passed++
          return
        }
        built++
        let theirs: Shape
        try {
          theirs = shape(sandbox.mathjsParse(t))
        } catch (e) {
          throw new Error(`built a tree for ${JSON.stringify(t)}, which mathjs refuses: ${String(e)}`)
        }
        expect(shape(ours), JSON.stringify(t)).toEqual(theirs)
      }),
      { numRuns: 8000, seed: 3 },
    )
    // Both kinds are exercised: many built directly, many handed to the parser.
    expect(built).toBeGreaterThan(300)
    expect(passed).toBeGreaterThan(500)
  })

  it('reads numbers and names where the token patterns do (scanned, not matched)', () => {
    const text = fc.array(fc.constantFrom('1', '23', '.', 'e', 'E', '+', '-', '5', 'x', '_', 'A', ' ', 'é', '9'), { maxLength: 10 }).map((p) => p.join(''))
    fc.assert(
      fc.property(text, fc.nat({ max: 12 }), (t, at) => {
        const i = Math.min(at, t.length)
        for (const re of [NUMBER_AT, NAME_AT, INTEGER_AT]) {
          re.lastIndex = i
          const m = re.exec(t)
          expect(sandbox.tokenEnd(re, t, i), `${re} in ${JSON.stringify(t)} at ${i}`).toBe(m ? i + m[0].length : i)
        }
      }),
      { numRuns: 4000, seed: 31 },
    )
  })

  it('compiles those shapes to the same names, places and units as walking the tree does', () => {
    let same = 0
    fc.assert(
      fc.property(text, (t) => {
        const { shortcut, walked } = sandbox.compiledNames(t)
        expect(shortcut, JSON.stringify(t)).toEqual(walked)
        same++
      }),
      { numRuns: 4000, seed: 47 },
    )
    expect(same).toBe(4000)
    // And with names written more than once, and a name inside another.
    for (const t of ['g * g', 'area * a / area', 'a * area', 'j12 * j1', '2 mA / mA', 'pi * r', 'x * pi * x']) {
      const { shortcut, walked } = sandbox.compiledNames(t)
      expect(shortcut, t).toEqual(walked)
    }
  })

  it('builds the shapes protocols use most without the parser, as the parser does', () => {
    const built = ['93 %', '93%', '95 mA/cm^2', '200 cm^2', 'cm^-2', '1 mol / L / s', 'j12 * area', '0.5 mol/L', '30 degC', '10 m^+2 * x']
    for (const t of built) {
      const ours = simpleTree(t)
      expect(ours, t).toBeDefined()
      expect(shape(ours), t).toEqual(shape(sandbox.mathjsParse(t)))
    }
    // Left to the parser: an implicit multiplication after an operator (`2 / 3 kg` is `(2/3) kg`
    // there), a modulo, a power of a power, a decimal exponent.
    for (const t of ['2 / 3 kg', '5 % 2', '2 mA/cm^2^2', 'g^2.5', '93 % * 2', 'x %']) expect(simpleTree(t), t).toBeUndefined()
  })
})
