// The acknowledgement comment, `# noted CODE: reason`, shared by the analysis and its rule.
export const NOTED_ANY = /^#\s*noted\s+([A-Za-z0-9-]+)\s*(?::\s*(.*))?$/

const NOTED_START = /#\s*noted\s/y

/**
 * Whether the comment at `start` in `text` may be an acknowledgement (`# noted ...`): a check at
 * that place, without copying the comment out, so that the usual comment costs nothing more.
 */
export function mayBeNoted(text: string, start: number): boolean {
  NOTED_START.lastIndex = start
  return NOTED_START.test(text)
}
