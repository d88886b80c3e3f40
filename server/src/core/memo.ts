// Results reused between analyses. On each keystroke the whole document is analysed again, but
// most edits (a note, a comment, an observation, a typo being typed) leave the chemistry's input
// as it was: the engine's bookkeeping and the simulation are then taken from here instead of being
// run again. Keys are the full input written as JSON, so a hit is exactly the same computation.
// The cached results are shared: nothing that reads them may change them.

export class ResultCache<I, R> {
  private readonly entries = new Map<string, R>()
  hits = 0
  misses = 0

  constructor(
    private readonly compute: (input: I) => R,
    private readonly limit = 8,
  ) {}

  clear(): void {
    this.entries.clear()
  }

  get(input: I): R {
    const key = JSON.stringify(input, (_k, v) => (typeof v === 'bigint' ? `${v}n` : v))
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
