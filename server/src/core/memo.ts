// Results reused between analyses. On each keystroke the whole document is analysed again, but
// most edits (a note, a comment, an observation, a typo being typed) leave the chemistry's input
// as it was: the engine's bookkeeping and the simulation are then taken from here instead of being
// run again. An input is compared with the kept ones value by value (sameInput), so a hit is
// exactly the same computation; nothing is written out to compare (writing a thousand steps' numbers
// as JSON cost more than a millisecond on every analysis).
// The cached results and the kept inputs are shared: nothing may change them (a test runs the
// engine and the simulation on frozen inputs).

/**
 * Whether two inputs are the same data: primitives by Object.is (NaN equals NaN, -0 differs from
 * 0), arrays and plain objects by their own enumerable keys in order and their values, Maps and
 * Sets by their entries in order. Any other object (a class instance, an object with toJSON) only
 * equals itself. Deeper than 64 levels counts as different (the result is then computed again).
 * Stricter than comparing the inputs as JSON, never looser: a test checks that equal inputs have
 * equal JSON (with what JSON merges kept apart).
 */
export function sameInput(a: unknown, b: unknown, depth = 0): boolean {
  if (Object.is(a, b)) return true
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null || depth > 64) return false
  if (Array.isArray(a)) {
    if (!Array.isArray(b) || a.length !== b.length) return false
    for (let i = 0; i < a.length; i++) if (!sameInput(a[i], b[i], depth + 1)) return false
    return true
  }
  if (a instanceof Map || a instanceof Set) {
    if (Object.getPrototypeOf(a) !== Object.getPrototypeOf(b) || a.size !== (b as Map<unknown, unknown> | Set<unknown>).size) return false
    const x = [...a.entries()]
    const y = [...(b as Map<unknown, unknown> | Set<unknown>).entries()]
    for (let i = 0; i < x.length; i++) if (!sameInput(x[i], y[i], depth + 1)) return false
    return true
  }
  const proto = Object.getPrototypeOf(a)
  if ((proto !== Object.prototype && proto !== null) || Object.getPrototypeOf(b) !== proto) return false
  if (typeof (a as { toJSON?: unknown }).toJSON === 'function') return false
  const ka = Object.keys(a)
  const kb = Object.keys(b)
  if (ka.length !== kb.length) return false
  for (let i = 0; i < ka.length; i++) {
    if (ka[i] !== kb[i]) return false
    if (!sameInput((a as Record<string, unknown>)[ka[i]], (b as Record<string, unknown>)[kb[i]], depth + 1)) return false
  }
  return true
}

export class ResultCache<I, R> {
  /** Least recently used first. */
  private readonly entries: { input: I; result: R }[] = []
  hits = 0
  misses = 0

  constructor(
    private readonly compute: (input: I) => R,
    // Two: the current and the previous chemistry (a digit typed and taken back). Each entry of a
    // long protocol's simulation is several MB, so not more.
    private readonly limit = 2,
  ) {}

  clear(): void {
    this.entries.length = 0
  }

  get(input: I): R {
    for (let i = this.entries.length - 1; i >= 0; i--) {
      const e = this.entries[i]
      if (!sameInput(e.input, input)) continue
      // Most recently used last.
      this.entries.splice(i, 1)
      this.entries.push(e)
      this.hits++
      return e.result
    }
    this.misses++
    const result = this.compute(input)
    if (this.entries.length >= this.limit) this.entries.shift()
    this.entries.push({ input, result })
    return result
  }
}

/**
 * A bounded map in two generations: when the current one is full it becomes the previous one, and
 * an entry read from the previous one moves back. What each analysis uses again stays, even when a
 * document has more distinct entries than one generation holds; at most two generations are kept.
 */
export class GenerationalCache<K, V> {
  private current = new Map<K, V>()
  private previous = new Map<K, V>()

  constructor(private readonly limit: number) {}

  /** The value for `key`, made by `make` when neither generation has it. */
  get(key: K, make: (key: K) => V): V {
    let v = this.current.get(key)
    if (v === undefined) {
      v = this.previous.get(key) ?? make(key)
      if (this.current.size >= this.limit) {
        this.previous = this.current
        this.current = new Map()
      }
      this.current.set(key, v)
    }
    return v
  }

  clear(): void {
    this.current.clear()
    this.previous.clear()
  }
}
