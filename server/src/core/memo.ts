// Results reused between analyses. On each keystroke the whole document is analysed again, but
// most edits (a note, a comment, an observation, a typo being typed) leave the chemistry's input
// as it was: the engine's bookkeeping and the simulation are then taken from here instead of being
// run again. Keys are the full input written as JSON, so a hit is exactly the same computation.
// The cached results are shared: nothing that reads them may change them.

/**
 * JSON with what JSON would merge kept apart: non-finite numbers (all `null` in JSON), -0 (`0`),
 * bigints (not written at all), undefined values, and Maps and Sets (all `{}` in JSON; written here
 * as their entries).
 */
function keyPart(_k: string, v: unknown): unknown {
  if (typeof v === 'number') return Number.isFinite(v) && !Object.is(v, -0) ? v : `#${Object.is(v, -0) ? '-0' : String(v)}`
  if (typeof v === 'bigint') return `#${v}n`
  if (v === undefined) return '#undefined'
  if (v instanceof Map) return ['#Map', ...v]
  if (v instanceof Set) return ['#Set', ...v]
  return v
}

export class ResultCache<I, R> {
  private readonly entries = new Map<string, R>()
  hits = 0
  misses = 0

  constructor(
    private readonly compute: (input: I) => R,
    // Two: the current and the previous chemistry (a digit typed and taken back). Each entry of a
    // long protocol's simulation is several MB, so not more.
    private readonly limit = 2,
  ) {}

  clear(): void {
    this.entries.clear()
  }

  get(input: I): R {
    const key = JSON.stringify(input, keyPart)
    const hit = this.entries.get(key)
    if (hit !== undefined) {
      // Most recently used last.
      this.entries.delete(key)
      this.entries.set(key, hit)
      this.hits++
      return hit
    }
    this.misses++
    const r = this.compute(input)
    if (this.entries.size >= this.limit) this.entries.delete(this.entries.keys().next().value as string)
    this.entries.set(key, r)
    return r
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
