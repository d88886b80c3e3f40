// Small text helpers shared by the parser and the rules.

/**
 * White space or a line terminator, as ECMAScript defines them: the code units `\s` matches in a
 * pattern and String.prototype.trim removes (one set). A test checks it against both for every
 * UTF-16 code unit.
 */
export function isWhiteSpace(c: number): boolean {
  if (c <= 32) return c === 32 || (c >= 9 && c <= 13)
  if (c < 0xa0) return false
  return c === 0xa0 || c === 0x1680 || (c >= 0x2000 && c <= 0x200a) || c === 0x2028 || c === 0x2029 || c === 0x202f || c === 0x205f || c === 0x3000 || c === 0xfeff
}

/** Levenshtein distance, capped: returns `cap + 1` as soon as the distance must exceed `cap`. */
export function editDistance(a: string, b: string, cap = 3): number {
  if (Math.abs(a.length - b.length) > cap) return cap + 1
  let prev = Array.from({ length: b.length + 1 }, (_, i) => i)
  for (let i = 1; i <= a.length; i++) {
    const cur = [i]
    let rowMin = i
    for (let j = 1; j <= b.length; j++) {
      const v = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1))
      cur.push(v)
      rowMin = Math.min(rowMin, v)
    }
    if (rowMin > cap) return cap + 1
    prev = cur
  }
  return prev[b.length]
}

/** The closest candidate within a small edit distance (case-insensitive), or undefined. */
export function closest(word: string, candidates: readonly string[]): string | undefined {
  if (!word) return undefined
  const w = word.toLowerCase()
  const cap = w.length <= 3 ? 1 : 2
  let best: string | undefined
  let bestD = cap + 1
  for (const c of candidates) {
    const d = editDistance(w, c.toLowerCase(), cap)
    if (d < bestD) {
      best = c
      bestD = d
    }
  }
  return best
}
