// What is kept between analyses (DEVELOPERS.md, invariant 8) must give the same result as starting
// afresh, whatever was analysed before. Regressions found in review, and the cache key's rules.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { analyze, clearAnalysisCaches } from '../server/src/core/analyze'
import { join } from 'node:path'
import { GenerationalCache, ResultCache, sameInput } from '../server/src/core/memo'
import { loadExamples } from './fuzz/generators'

describe('ResultCache keys', () => {
  it('keeps apart what JSON would merge: NaN, Infinity, -Infinity, -0, undefined, bigints', () => {
    let computed = 0
    const cache = new ResultCache((_: { v?: unknown }) => ++computed, 16)
    const inputs: { v?: unknown }[] = [{ v: NaN }, { v: Infinity }, { v: -Infinity }, { v: null }, { v: 0 }, { v: -0 }, { v: undefined }, { v: 1n }, { v: '1n' }, {}]
    const results = inputs.map((i) => cache.get(i))
    // Every input is a different computation (10 of them)...
    expect(new Set(results).size).toBe(inputs.length)
    // ...and asking again is a hit for each.
    inputs.forEach((i, k) => expect(cache.get(i)).toBe(results[k]))
    expect(computed).toBe(inputs.length)
  })

  // The definition the comparison must never be looser than: the inputs written as JSON, with what
  // JSON merges (NaN, Infinity and null; -0 and 0; undefined and absent; every Map and Set as {})
  // kept apart. (Cellrun keyed its caches by this text before; kept here as the oracle.)
  const asJson = (v: unknown) =>
    JSON.stringify(v, (_k, x) => {
      if (typeof x === 'number') return Number.isFinite(x) && !Object.is(x, -0) ? x : `#${Object.is(x, -0) ? '-0' : String(x)}`
      if (typeof x === 'bigint') return `#${x}n`
      if (x === undefined) return '#undefined'
      if (x instanceof Map) return ['#Map', ...x]
      if (x instanceof Set) return ['#Set', ...x]
      return x
    })
  const leaf = fc.oneof(fc.double(), fc.constantFrom(NaN, Infinity, -Infinity, -0, 0, undefined, null, 1n, true, '', 'x'), fc.integer({ min: -3, max: 3 }), fc.string({ maxLength: 2 }))
  const { tree } = fc.letrec((tie) => ({
    tree: fc.oneof(
      { depthSize: 'small' },
      leaf,
      fc.array(tie('tree'), { maxLength: 3 }),
      fc.dictionary(fc.constantFrom('a', 'b', 'c'), tie('tree'), { maxKeys: 3 }),
      tie('tree').map((v) => new Map([['k', v]])),
      tie('tree').map((v) => new Set([v])),
    ),
  }))
  /** A copy with new objects, arrays, Maps and Sets throughout. */
  const copy = (v: unknown): unknown =>
    Array.isArray(v)
      ? v.map(copy)
      : v instanceof Map
        ? new Map([...v].map(([k, x]) => [copy(k), copy(x)]))
        : v instanceof Set
          ? new Set([...v].map(copy))
          : typeof v === 'object' && v !== null
            ? Object.setPrototypeOf(Object.fromEntries(Object.entries(v).map(([k, x]) => [k, copy(x)])), Object.getPrototypeOf(v))
            : v

  it('inputs the cache takes as the same have the same JSON (with what JSON merges kept apart)', () => {
    let same = 0
    fc.assert(
      fc.property(tree, tree, fc.boolean(), (a, b0, twin) => {
        // Half the pairs are a value and its copy, so that equal pairs are common.
        const b = twin ? copy(a) : b0
        if (!sameInput(a, b)) return
        same++
        expect(asJson(b)).toBe(asJson(a))
      }),
      { numRuns: 3000, seed: 17 },
    )
    expect(same).toBeGreaterThan(1000)
  })

  it('a copy of an input is the same input (a hit), whatever it holds', () => {
    fc.assert(
      fc.property(tree, (v) => {
        expect(sameInput(v, copy(v))).toBe(true)
      }),
      { numRuns: 2000, seed: 19 },
    )
  })

  it('keeps apart Maps and Sets with different contents (JSON writes every one as {})', () => {
    let computed = 0
    const cache = new ResultCache((_: { m: unknown }) => ++computed, 16)
    const a = cache.get({ m: new Map([['a', 1]]) })
    const b = cache.get({ m: new Map([['a', 2]]) })
    const c = cache.get({ m: new Set(['a']) })
    expect(new Set([a, b, c]).size).toBe(3)
    expect(cache.get({ m: new Map([['a', 1]]) })).toBe(a)
  })
})

describe('ResultCache size', () => {
  it('keeps the last two inputs by default (the current and the previous chemistry)', () => {
    let computed = 0
    const cache = new ResultCache((x: { n: number }) => (++computed, x.n))
    cache.get({ n: 1 })
    cache.get({ n: 2 })
    cache.get({ n: 1 }) // hit
    expect(computed).toBe(2)
    cache.get({ n: 3 }) // evicts 2, the least recently used
    cache.get({ n: 1 }) // still there
    expect(computed).toBe(3)
    cache.get({ n: 2 }) // made again
    expect(computed).toBe(4)
  })
})

describe('GenerationalCache', () => {
  it('keeps what is used again across a generation change, and computes each key once while kept', () => {
    const made: string[] = []
    const cache = new GenerationalCache<string, string>(3)
    const get = (k: string) => cache.get(k, (x) => (made.push(x), x.toUpperCase()))
    for (const k of ['a', 'b', 'c']) get(k) // generation 1 is full
    get('d') // generation 1 becomes the previous one; d starts generation 2
    expect(get('a')).toBe('A') // read back from the previous generation, not made again
    expect(made).toEqual(['a', 'b', 'c', 'd'])
    get('e') // generation 2 (d, a, e) is full
    get('f') // previous = (d, a, e): b and c are gone
    get('b')
    expect(made).toEqual(['a', 'b', 'c', 'd', 'e', 'f', 'b'])
    get('a') // still in the previous generation
    expect(made.filter((k) => k === 'a')).toHaveLength(1)
  })
})

describe('an analysis does not depend on what was analysed before', () => {
  const CELL = ['cell', '  compartment bath 1 L', '  anode nickel in bath', '  cathode nickel in bath', ''].join('\n')
  // Found in review: an amount that overflows to Infinity mol and one that is NaN mol gave the same
  // engine key, so the second analysis took the first one's anode reaction.
  const A = CELL + 'charge bath: KOH 1e306 kg, water 1 L\nstep 1: current 1 A for 1 h\n'
  const B = CELL + 'charge bath: KOH solution 1e306 kg at 0 wt%, water 1 L\nstep 1: current 1 A for 1 h\n'

  const view = (text: string) => {
    const a = analyze(text)
    return JSON.stringify({ d: a.diagnostics, c: a.computed, anode: a.model.engine?.anode, sim: a.model.simulation?.final })
  }

  it('B after A gives what B alone gives (and A after B what A alone gives)', () => {
    clearAnalysisCaches()
    const bAlone = view(B)
    clearAnalysisCaches()
    const aAlone = view(A)
    clearAnalysisCaches()
    view(A)
    expect(view(B)).toBe(bAlone)
    clearAnalysisCaches()
    view(B)
    expect(view(A)).toBe(aAlone)
  })

  it('the analysis leaves no global state behind (the core is pure)', () => {
    const before = new Set(Object.keys(globalThis))
    analyze(A)
    analyze(B)
    expect(Object.keys(globalThis).filter((k) => !before.has(k))).toEqual([])
  })
})

describe('kept inputs and results are not changed', () => {
  it('the engine and the simulation run on frozen inputs (they never write to what they are given)', () => {
    // The cache keeps each input to compare the next ones with: a computation that wrote to its
    // input would change what is kept. Frozen inputs make any such write throw (ES modules are strict).
    // Object.freeze does not stop Map.set or Set.add: frozen Maps and Sets are watched instead.
    const frozenCollections = new WeakSet<object>()
    const deepFreeze = (v: unknown, seen = new Set<unknown>()): void => {
      if (typeof v !== 'object' || v === null || seen.has(v)) return
      seen.add(v)
      Object.freeze(v)
      if (v instanceof Map || v instanceof Set) frozenCollections.add(v)
      if (v instanceof Map) for (const [k, x] of v) (deepFreeze(k, seen), deepFreeze(x, seen))
      else if (v instanceof Set) for (const x of v) deepFreeze(x, seen)
      else for (const x of Object.values(v)) deepFreeze(x, seen)
    }
    const texts = loadExamples(join(__dirname, '..', 'examples')).map((e) => e.text)
    expect(texts.length).toBeGreaterThanOrEqual(3)
    const plainRuns = texts.map((t) => {
      clearAnalysisCaches()
      return JSON.stringify(analyze(t).computed)
    })
    const writers = [
      [Map.prototype, 'set'],
      [Map.prototype, 'delete'],
      [Map.prototype, 'clear'],
      [Set.prototype, 'add'],
      [Set.prototype, 'delete'],
      [Set.prototype, 'clear'],
    ] as const
    const originals = writers.map(([proto, name]) => (proto as unknown as Record<string, (...a: unknown[]) => unknown>)[name])
    writers.forEach(([proto, name], i) => {
      ;(proto as unknown as Record<string, unknown>)[name] = function (this: object, ...args: unknown[]) {
        if (frozenCollections.has(this)) throw new TypeError(`${name} on a frozen input`)
        return originals[i].apply(this, args)
      }
    })
    const get = ResultCache.prototype.get
    let frozen = 0
    ResultCache.prototype.get = function (this: ResultCache<unknown, unknown>, input: unknown) {
      deepFreeze(input)
      frozen++
      return get.call(this, input)
    }
    try {
      texts.forEach((t, i) => {
        clearAnalysisCaches()
        expect(JSON.stringify(analyze(t).computed)).toBe(plainRuns[i])
      })
    } finally {
      ResultCache.prototype.get = get
      writers.forEach(([proto, name], i) => ((proto as unknown as Record<string, unknown>)[name] = originals[i]))
      clearAnalysisCaches()
    }
    // Every example runs the engine, most the simulation too.
    expect(frozen).toBeGreaterThanOrEqual(2 * texts.length - 1)
  })
})
