// The browser build: the web-worker language server bundle runs with only what a worker offers
// (no Node modules) and answers LSP over the worker's message channel.
import { execFileSync } from 'node:child_process'
import { existsSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { createContext, runInContext } from 'node:vm'
import { beforeAll, describe, expect, it } from 'vitest'

const root = join(__dirname, '..')
const bundle = join(root, 'dist', 'browser', 'server.js')

beforeAll(() => {
  if (!existsSync(bundle)) execFileSync(process.execPath, [join(root, 'esbuild.mjs')], { cwd: root })
})

/** A fake worker global: what the bundle posts, and a way to post to it. */
function worker() {
  const posted: any[] = []
  const listeners: ((e: { data: unknown }) => void)[] = []
  const self: any = {
    postMessage: (m: unknown) => posted.push(m),
    addEventListener: (type: string, f: (e: { data: unknown }) => void) => {
      if (type === 'message') listeners.push(f)
    },
    removeEventListener: () => {},
  }
  const context = createContext({
    self,
    console,
    setTimeout,
    clearTimeout,
    setInterval,
    clearInterval,
    queueMicrotask,
    crypto: globalThis.crypto,
    TextEncoder,
    TextDecoder,
    btoa,
    atob,
    performance,
  })
  const send = (m: unknown) => {
    if (self.onmessage) self.onmessage({ data: m })
    for (const f of listeners) f({ data: m })
  }
  return { context, posted, send }
}

async function until<T>(f: () => T | undefined, ms = 5000): Promise<T> {
  const end = Date.now() + ms
  for (;;) {
    const v = f()
    if (v !== undefined) return v
    if (Date.now() > end) throw new Error('timed out')
    await new Promise((r) => setTimeout(r, 10))
  }
}

describe('browser build', () => {
  it('has no Node-only requires in the worker bundle', () => {
    const code = readFileSync(bundle, 'utf8')
    expect(code).not.toMatch(/require\(["'](node:|fs|path|child_process|net|os|crypto)["']\)/)
  })

  it('answers initialize and publishes diagnostics over the worker channel', async () => {
    const w = worker()
    runInContext(readFileSync(bundle, 'utf8'), w.context, { filename: 'server.js' })
    w.send({ jsonrpc: '2.0', id: 1, method: 'initialize', params: { processId: null, rootUri: null, capabilities: {} } })
    const init = await until(() => w.posted.find((m) => m.id === 1))
    expect(init.result.capabilities.inlayHintProvider).toBeTruthy()
    w.send({ jsonrpc: '2.0', method: 'initialized', params: {} })
    const text = 'cell\n  compartment a 1 L\n  anode platinum in a\n  cathode nickel in a\ncharge a: KOH solution 1 L at 1 M\nstep 1: current 5 V for 1 h\n'
    w.send({ jsonrpc: '2.0', method: 'textDocument/didOpen', params: { textDocument: { uri: 'memfs:/x.cellrun', languageId: 'cellrun', version: 1, text } } })
    const diags = await until(() => w.posted.find((m) => m.method === 'textDocument/publishDiagnostics'))
    expect(diags.params.diagnostics.map((d: { code: string }) => d.code)).toContain('wrong-unit')
  })
})
