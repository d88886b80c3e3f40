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

/**
 * Whether JSON.stringify writes `v` as keyPart would have it written: no value keyPart changes
 * (non-finite numbers, -0, bigints, undefined, Maps, Sets) and no toJSON anywhere. Deeper than 64
 * levels counts as not plain (the replacer path then decides).
 */
function plain(v: unknown, depth: number): boolean {
  switch (typeof v) {
    case 'number':
      return Number.isFinite(v) && !Object.is(v, -0)
    case 'string':
    case 'boolean':
    case 'function':
    case 'symbol':
      return true
    case 'object': {
      if (v === null) return true
      if (depth > 64 || v instanceof Map || v instanceof Set || typeof (v as { toJSON?: unknown }).toJSON === 'function') return false
      if (Array.isArray(v)) {
        for (let i = 0; i < v.length; i++) if (!plain(v[i], depth + 1)) return false
        return true
      }
      // Inherited enumerable properties (which JSON does not write) are checked too: at worst an
      // input goes the slow way for nothing.
      for (const k in v) if (!plain((v as Record<string, unknown>)[k], depth + 1)) return false
      return true
    }
    default:
      // undefined and bigint
      return false
  }
}

/** The key of an input: JSON as keyPart writes it (the replacer skipped when it would change nothing). */
export function cacheKey(input: unknown): string {
  return plain(input, 0) ? JSON.stringify(input) : JSON.stringify(input, keyPart)
}

/** The key written with the replacer always: for the test that cacheKey's shortcut gives the same text. */
export function cacheKeyByReplacer(input: unknown): string {
  return JSON.stringify(input, keyPart)
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
    // The replacer is called for every value, which costs more than the rest of the key: inputs with
    // nothing it changes (the usual case) are written without it, to the same text.
    const key = cacheKey(input)
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
