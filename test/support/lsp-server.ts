// Shared by the stdio protocol tests (test/lsp*.test.ts): where the built server is, building it
// when stale, and position helpers that are independent of the server's own LineIndex (UTF-16 code
// units, '\n' line breaks: the test documents use only '\n').
import { execFileSync } from 'node:child_process'
import { existsSync, readdirSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import type { Position, Range } from 'vscode-languageserver-protocol'

export const ROOT = fileURLToPath(new URL('../..', import.meta.url))
export const SERVER = join(ROOT, 'dist', 'server.js')
export const TIMEOUT = 10_000

export function posAt(text: string, offset: number): Position {
  const before = text.slice(0, offset)
  const line = before.split('\n').length - 1
  const character = offset - (before.lastIndexOf('\n') + 1)
  return { line, character }
}

export function rangeOf(text: string, needle: string, from = 0): Range {
  const at = text.indexOf(needle, from)
  if (at < 0) throw new Error(`test setup: \`${needle}\` not found in the document`)
  return { start: posAt(text, at), end: posAt(text, at + needle.length) }
}

/** Offset where the line that contains `needle` starts. */
export function lineStartOf(text: string, needle: string): number {
  const at = text.indexOf(needle)
  if (at < 0) throw new Error(`test setup: \`${needle}\` not found in the document`)
  return text.lastIndexOf('\n', at) + 1
}

function newestMtime(dir: string): number {
  let newest = 0
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name)
    newest = Math.max(newest, e.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs)
  }
  return newest
}

/** Build dist/server.js when it is missing or older than any server source, so a stale bundle is never tested. */
export function ensureBuilt(): void {
  const stale = !existsSync(SERVER) || statSync(SERVER).mtimeMs < newestMtime(join(ROOT, 'server', 'src'))
  if (stale) execFileSync(process.execPath, ['esbuild.mjs'], { cwd: ROOT, stdio: 'pipe', timeout: 60_000 })
  if (!existsSync(SERVER)) throw new Error('dist/server.js was not built')
}
