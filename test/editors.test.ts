// End-to-end checks in editors no one here wrote: Neovim (vim.lsp) and Emacs (eglot), headless,
// against the built server. Each is skipped when the editor is not installed (.ci/run installs
// them from Debian); the scripts in test/editors/ print one result per line.
import { execFileSync, spawnSync } from 'node:child_process'
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'

const root = join(__dirname, '..')
const server = join(root, 'dist', 'server.js')
const has = (cmd: string) => spawnSync('sh', ['-c', `command -v ${cmd}`]).status === 0
/** Emacs with eglot available (Debian's elpa-eglot, or Emacs 29+ where it is built in). */
const hasEglot = () => has('emacs') && spawnSync('emacs', ['--batch', '--no-init-file', '--eval', "(progn (require 'package) (package-initialize) (require 'eglot))"]).status === 0

let file = ''
let text = ''
beforeAll(() => {
  if (!existsSync(server)) execFileSync(process.execPath, [join(root, 'esbuild.mjs')], { cwd: root })
  // The KOH example with a current given in volts appended: one wrong-unit error.
  text = readFileSync(join(root, 'examples', 'koh-from-carbonate.cellrun'), 'utf8') + 'step 9: current 5 V for 1 h\n'
  file = join(mkdtempSync(join(tmpdir(), 'cellrun-editors-')), 'run.cellrun')
  writeFileSync(file, text)
})

function results(stdout: string) {
  const lines = stdout.split('\n')
  return {
    diags: lines.filter((l) => l.startsWith('DIAG ')).map((l) => l.slice(5)),
    hints: lines.filter((l) => l.startsWith('HINT ')).map((l) => l.slice(5)),
    completion: Number(/^COMPLETION (-?\d+)/m.exec(stdout)?.[1] ?? NaN),
    format: Number(/^FORMAT (-?\d+)/m.exec(stdout)?.[1] ?? NaN),
    done: lines.includes('DONE'),
  }
}

/** Where the appended error is, 1-based, computed from the text (not from the server). */
function expectedWrongUnit(): string {
  const lines = text.split('\n')
  const line = lines.findIndex((l) => l.startsWith('step 9:'))
  return `${line + 1}:${lines[line].indexOf('5 V') + 1} wrong-unit`
}

function checkCommon(r: ReturnType<typeof results>) {
  expect(r.done).toBe(true)
  expect(r.diags).toContain(expectedWrongUnit())
  // A charge hint on each step line and the theoretical maximum on the expect line.
  const stepLine = text.split('\n').findIndex((l) => l.startsWith('step 1:')) + 1
  expect(r.hints.some((h) => h.startsWith(`${stepLine}:`) && h.includes('A·h'))).toBe(true)
  expect(r.hints.some((h) => h.includes('max'))).toBe(true)
  expect(r.completion).toBeGreaterThan(0)
  expect(r.format).toBeGreaterThanOrEqual(0)
}

describe('real editors', () => {
  it.skipIf(!has('nvim'))('Neovim: diagnostics, inlay hints, completion and formatting', () => {
    const out = execFileSync('nvim', ['--headless', '-u', 'NONE', '-c', `luafile ${join(root, 'test/editors/nvim-e2e.lua')}`], {
      env: { ...process.env, CELLRUN_SERVER: server, CELLRUN_FILE: file },
      encoding: 'utf8',
      timeout: 60_000,
    })
    checkCommon(results(out))
  }, 70_000)

  it.skipIf(!hasEglot())('Emacs with eglot: diagnostics, inlay hints, completion and formatting', () => {
    const r = spawnSync('emacs', ['--batch', '--no-init-file', '-l', join(root, 'test/editors/emacs-e2e.el')], {
      env: { ...process.env, CELLRUN_SERVER: server, CELLRUN_FILE: file },
      encoding: 'utf8',
      timeout: 60_000,
    })
    checkCommon(results(r.stdout))
  }, 70_000)
})
