// The acknowledgement comment, `# noted CODE: reason`, shared by the analysis and its rule.
export const NOTED_ANY = /^#\s*noted\s+([A-Za-z0-9-]+)\s*(?::\s*(.*))?$/

/**
 * Whether the comment at `start` in `text` may be an acknowledgement: whether `#\s*noted\s` is
 * written there (read in place, without copying the comment out or running a pattern), so that the
 * usual comment costs nothing more. A test checks it against that pattern.
 */
export function mayBeNoted(text: string, start: number): boolean {
  if (text.charCodeAt(start) !== 35 /* # */) return false
  let i = start + 1
  while (i < text.length && isPatternSpace(text, i)) i++
  return text.startsWith('noted', i) && i + 5 < text.length && isPatternSpace(text, i + 5)
}

/** White space as `\s` in a pattern reads it (ASCII first, the rest by the pattern). */
function isPatternSpace(s: string, i: number): boolean {
  const c = s.charCodeAt(i)
  if (c === 32 || (c >= 9 && c <= 13)) return true
  return c > 127 && /\s/.test(s[i])
}
