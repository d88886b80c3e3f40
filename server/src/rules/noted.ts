// The acknowledgement comment, `# noted CODE: reason`, shared by the analysis and its rule.
import { isWhiteSpace } from '../core/text'

export const NOTED_ANY = /^#\s*noted\s+([A-Za-z0-9-]+)\s*(?::\s*(.*))?$/

/**
 * Whether the comment at `start` in `text` may be an acknowledgement: whether `#\s*noted\s` is
 * written there (read in place, without copying the comment out or running a pattern), so that the
 * usual comment costs nothing more. A test checks it against that pattern.
 */
export function mayBeNoted(text: string, start: number): boolean {
  if (text.charCodeAt(start) !== 35 /* # */) return false
  let i = start + 1
  while (i < text.length && isWhiteSpace(text.charCodeAt(i))) i++
  return text.startsWith('noted', i) && i + 5 < text.length && isWhiteSpace(text.charCodeAt(i + 5))
}
