// What is kept between analyses (DEVELOPERS.md, invariant 8) must give the same result as starting
// afresh, whatever was analysed before. Regressions found in review, and the cache key's rules.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { analyze, clearAnalysisCaches } from '../server/src/core/analyze'
import { cacheKey, cacheKeyByReplacer, GenerationalCache, ResultCache } from '../server/src/core/memo'

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

  it('the key written without the replacer (when nothing needs it) is the replacer\'s key', () => {
    // Values of every kind, the ones the replacer rewrites included, nested in objects and arrays.
    const leaf = fc.oneof(
      fc.double(),
      fc.constantFrom(NaN, Infinity, -Infinity, -0, 0, undefined, null, 1n, true, '', 'x'),
      fc.integer(),
      fc.string({ maxLength: 4 }),
    )
    const { tree } = fc.letrec((tie) => ({
      tree: fc.oneof({ depthSize: 'small' }, leaf, fc.array(tie('tree'), { maxLength: 4 }), fc.dictionary(fc.string({ maxLength: 3 }), tie('tree'), { maxKeys: 4 }), tie('tree').map((v) => new Map([['k', v]])), tie('tree').map((v) => new Set([v]))),
    }))
    let shortcut = 0
    fc.assert(
      fc.property(tree, (v) => {
        const key = cacheKey(v)
        expect(key).toBe(cacheKeyByReplacer(v))
        let plainJson: string | undefined
        try {
          plainJson = JSON.stringify(v)
        } catch {
          // a bigint: JSON cannot write it
        }
        if (key === plainJson) shortcut++
      }),
      { numRuns: 3000, seed: 17 },
    )
    // Both paths are taken.
    expect(shortcut).toBeGreaterThan(300)
    expect(shortcut).toBeLessThan(2900)
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
