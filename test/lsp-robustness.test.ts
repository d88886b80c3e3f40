// Robustness of the BUILT language server (issue #8): spawns `node dist/server.js --stdio` and
// writes LSP frames to its stdin BY HAND, so that it can also write what a correct client never
// would: bodies that are not JSON, wrong Content-Length values, headers without one, stray bytes,
// JSON-RPC messages of the wrong shape, requests for documents that were never opened, and a 5 MB
// document. After every abuse the test checks that the process is still running and that it still
// answers a real request correctly on a real open document.
//
// A note on framing errors. The LSP base protocol has no resynchronisation marker: once a frame is
// broken (a Content-Length that does not match its body, a header without one, stray bytes), the
// reader cannot know where the next message starts, and whatever bytes follow up to the next
// header/body boundary are lost, whatever the server does. What we require is that the server
// stays up and, as soon as the byte stream is back on a message boundary, reads and answers the
// next well-framed message. `resync()` gets the stream back there the way any client could: it
// writes an empty header block (which the reader rejects and drops) followed by a probe request,
// and repeats that a few times until the probe is answered.
import { spawn, type ChildProcessWithoutNullStreams } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { generateProtocol } from './bench/generate'
import { ensureBuilt, rangeOf, ROOT, SERVER, TIMEOUT } from './support/lsp-server'

// ------------------------------------------------------------------------------------------------
// A raw LSP client: frames what it is given, parses what the server writes.

interface Message {
  jsonrpc?: string
  id?: number | string | null
  method?: string
  params?: unknown
  result?: unknown
  error?: { code: number; message: string; data?: unknown }
}

/** JSON-RPC / LSP error codes the checks below expect. */
const METHOD_NOT_FOUND = -32601
const INVALID_PARAMS = -32602
const INTERNAL_ERROR = -32603
const REQUEST_FAILED = -32803

/** One LSP frame: `Content-Length` counts the body's bytes in UTF-8 unless `length` overrides it. */
function frame(body: string | Buffer, length?: number): Buffer {
  const bytes = typeof body === 'string' ? Buffer.from(body, 'utf8') : body
  return Buffer.concat([Buffer.from(`Content-Length: ${length ?? bytes.length}\r\n\r\n`, 'ascii'), bytes])
}

class RawClient {
  readonly child: ChildProcessWithoutNullStreams
  stderr = ''
  readonly exited: Promise<number | null>
  /** Every message the server sent, in order. */
  readonly received: Message[] = []
  /** How the client answers the server's requests, by method: a result or an error (default: result null). */
  readonly answers = new Map<string, { result: unknown } | { error: { code: number; message: string } }>([['workspace/configuration', { result: [{}] }]])
  private buf = Buffer.alloc(0)
  private nextId = 1
  private readonly watchers: { match: (m: Message) => boolean; resolve: (m: Message) => void }[] = []

  constructor() {
    this.child = spawn(process.execPath, [SERVER, '--stdio'], { cwd: ROOT, stdio: ['pipe', 'pipe', 'pipe'] })
    this.child.stderr.setEncoding('utf8')
    this.child.stderr.on('data', (d: string) => (this.stderr += d))
    this.exited = new Promise((resolve) => this.child.on('exit', (code) => resolve(code)))
    this.child.stdout.on('data', (chunk: Buffer) => this.onData(chunk))
    // A write after the server died must fail the checks, not the test runner.
    this.child.stdin.on('error', () => undefined)
  }

  /** True while the server process has neither exited nor been killed. */
  get alive(): boolean {
    return this.child.exitCode === null && this.child.signalCode === null
  }

  /** The server's output is trusted to be well framed: a failure here is a server bug. */
  private onData(chunk: Buffer): void {
    this.buf = Buffer.concat([this.buf, chunk])
    for (;;) {
      const end = this.buf.indexOf('\r\n\r\n')
      if (end < 0) return
      const header = this.buf.subarray(0, end).toString('ascii')
      const m = /Content-Length: (\d+)/i.exec(header)
      if (!m) throw new Error(`server wrote a header without Content-Length: ${header}`)
      const length = Number(m[1])
      if (this.buf.length < end + 4 + length) return
      const body = this.buf.subarray(end + 4, end + 4 + length).toString('utf8')
      this.buf = this.buf.subarray(end + 4 + length)
      this.onMessage(JSON.parse(body) as Message)
    }
  }

  private onMessage(msg: Message): void {
    this.received.push(msg)
    // Requests from the server: answer the ones a client must answer, so that it never waits on us.
    if (msg.method !== undefined && msg.id !== undefined) {
      this.send({ jsonrpc: '2.0', id: msg.id, ...(this.answers.get(msg.method) ?? { result: null }) })
    }
    for (const w of [...this.watchers]) {
      if (w.match(msg)) {
        this.watchers.splice(this.watchers.indexOf(w), 1)
        w.resolve(msg)
      }
    }
  }

  /** The first message (already received, when `past`, or yet to come) that `match` accepts; rejects after `ms`. */
  waitFor(match: (m: Message) => boolean, ms = TIMEOUT - 1000, past = true): Promise<Message> {
    const seen = past ? this.received.find(match) : undefined
    if (seen) return Promise.resolve(seen)
    return new Promise((resolve, reject) => {
      const w = { match, resolve }
      this.watchers.push(w)
      setTimeout(() => {
        const i = this.watchers.indexOf(w)
        if (i < 0) return
        this.watchers.splice(i, 1)
        reject(new Error(`no matching message within ${ms} ms (server ${this.alive ? 'running' : 'EXITED'}); stderr:\n${this.stderr}`))
      }, ms)
    })
  }

  writeRaw(bytes: string | Buffer): void {
    this.child.stdin.write(bytes)
  }

  send(msg: object): void {
    this.writeRaw(frame(JSON.stringify(msg)))
  }

  /** Send a request and wait for the response with its id (result or error). */
  request(method: string, params?: unknown, ms = TIMEOUT - 1000): Promise<Message> {
    const id = this.nextId++
    const answered = this.waitFor((m) => m.id === id && m.method === undefined, ms, false)
    this.send(params === undefined ? { jsonrpc: '2.0', id, method } : { jsonrpc: '2.0', id, method, params })
    return answered
  }

  /** Send a request whose body the caller wrote (any shape), under `id`, and wait for that id's response. */
  requestRaw(id: string, body: object, ms = TIMEOUT - 1000): Promise<Message> {
    const answered = this.waitFor((m) => m.id === id && m.method === undefined, ms, false)
    this.send({ jsonrpc: '2.0', id, ...body })
    return answered
  }

  notify(method: string, params: unknown): void {
    this.send({ jsonrpc: '2.0', method, params })
  }

  /** publishDiagnostics for `uri` (and `version`, when given). */
  diagnostics(uri: string, version?: number, ms = TIMEOUT - 1000): Promise<{ uri: string; version?: number; diagnostics: { code?: string; message: string }[] }> {
    return this.waitFor(
      (m) => m.method === 'textDocument/publishDiagnostics' && (m.params as { uri: string }).uri === uri && (version === undefined || (m.params as { version?: number }).version === version),
      ms,
    ).then((m) => m.params as never)
  }
}

function markdownOf(result: unknown): string {
  const c = (result as { contents?: unknown } | null)?.contents
  if (!c) return ''
  if (typeof c === 'string') return c
  return (c as { value: string }).value
}

// ------------------------------------------------------------------------------------------------
// The real document every check comes back to: the KOH example, opened once and never abused.

const EXAMPLE = readFileSync(join(ROOT, 'examples', 'koh-from-carbonate.cellrun'), 'utf8')
const REAL_URI = 'file:///virtual/robust-koh.cellrun'
const REAL_TEXT = EXAMPLE.endsWith('\n') ? EXAMPLE : EXAMPLE + '\n'
const K2CO3 = rangeOf(REAL_TEXT, 'K2CO3')
const NEVER_OPENED = 'file:///virtual/never-opened.cellrun'

let client: RawClient

beforeAll(async () => {
  ensureBuilt()
  client = new RawClient()
  const init = await client.request('initialize', {
    processId: process.pid,
    rootUri: null,
    workspaceFolders: null,
    // Settings are read from the client, and inlay hints refreshed on request: the configuration
    // test below answers both requests badly.
    capabilities: { workspace: { configuration: true, inlayHint: { refreshSupport: true } } },
  })
  expect((init.result as { capabilities: { hoverProvider: boolean } }).capabilities.hoverProvider).toBe(true)
  client.notify('initialized', {})
  client.notify('textDocument/didOpen', { textDocument: { uri: REAL_URI, languageId: 'cellrun', version: 1, text: REAL_TEXT } })
  await client.diagnostics(REAL_URI, 1)
}, 60_000)

afterAll(() => {
  if (client?.alive) client.child.kill('SIGKILL')
})

/**
 * The server is still fine: its process is running and a hover on `K2CO3` in the real document
 * gives the molar mass (2 × 39.0983 + 12.011 + 3 × 15.999 = 138.205 g/mol, IUPAC 2021 weights).
 */
async function expectHealthy(): Promise<void> {
  expect(client.alive, `the server exited; stderr:\n${client.stderr}`).toBe(true)
  const hover = await client.request('textDocument/hover', {
    textDocument: { uri: REAL_URI },
    position: { line: K2CO3.start.line, character: K2CO3.start.character + 1 },
  })
  expect(hover.error, JSON.stringify(hover.error)).toBeUndefined()
  const m = /M = ([\d.]+) g\/mol/.exec(markdownOf(hover.result))
  expect(m, markdownOf(hover.result)).not.toBeNull()
  expect(Number(m![1])).toBeCloseTo(138.205, 2)
  expect(client.alive).toBe(true)
}

let probes = 0
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))
/**
 * Bring the byte stream back to a message boundary after a broken frame (see the note at the top):
 * an empty header block, then (a moment later, so that the server reads it on its own) a probe
 * request, until a probe is answered. Returns the attempts it took.
 */
async function resync(): Promise<number> {
  const ids: string[] = []
  // Any of this call's probes answered proves the server is reading frames again.
  const answered = client.waitFor((m) => typeof m.id === 'string' && ids.includes(m.id) && m.method === undefined, 5 * 1200, false)
  answered.catch(() => undefined)
  for (let attempt = 1; attempt <= 5; attempt++) {
    const id = `probe-${++probes}`
    ids.push(id)
    client.writeRaw('\r\n\r\n')
    await sleep(100)
    client.writeRaw(frame(JSON.stringify({ jsonrpc: '2.0', id, method: 'cellrun/probe', params: {} })))
    const reply = await Promise.race([answered, sleep(1000).then(() => undefined)])
    if (reply) {
      // The probe is an unknown method: the answer that proves the server read it is MethodNotFound.
      expect(reply.error?.code).toBe(METHOD_NOT_FOUND)
      return attempt
    }
    expect(client.alive, `the server exited; stderr:\n${client.stderr}`).toBe(true)
  }
  throw new Error(`the server did not answer a well-framed probe after 5 attempts; stderr:\n${client.stderr}`)
}

// ------------------------------------------------------------------------------------------------

describe('broken framing', () => {
  it(
    'a body that is not JSON (correct length) is dropped and the next message is read at once',
    async () => {
      client.writeRaw(frame('{"jsonrpc": "2.0", "id": "nj-1", "method": "textDocument/hover", '))
      client.writeRaw(frame('this is not JSON at all'))
      // The frame boundaries were right, so no resynchronisation is needed.
      await expectHealthy()
      // Nothing was answered for the broken request.
      expect(client.received.some((m) => m.id === 'nj-1')).toBe(false)
    },
    TIMEOUT,
  )

  it(
    'a body that is JSON but not a message (number, string, null, array, deeply nested) is ignored',
    async () => {
      for (const body of ['42', '"hover"', 'null', '[]', '[{"jsonrpc":"2.0","id":"batch-1","method":"shutdown"}]', '['.repeat(50_000) + ']'.repeat(50_000)]) {
        client.writeRaw(frame(body))
      }
      await expectHealthy()
      // A batch is not part of LSP: its request was not run (no answer, and no shutdown either, as the hover above shows).
      expect(client.received.some((m) => m.id === 'batch-1')).toBe(false)
    },
    TIMEOUT,
  )

  it(
    'a body that is not valid UTF-8 is dropped',
    async () => {
      client.writeRaw(frame(Buffer.from([0x7b, 0xff, 0xfe, 0xc3, 0x28, 0x00, 0x7d])))
      await expectHealthy()
    },
    TIMEOUT,
  )

  it(
    'a Content-Length smaller than the body: the server survives and reads the next message after a resync',
    async () => {
      const body = JSON.stringify({ jsonrpc: '2.0', id: 'short-1', method: 'textDocument/hover', params: { textDocument: { uri: REAL_URI }, position: { line: 0, character: 0 } } })
      client.writeRaw(frame(body, body.length - 12))
      expect(await resync()).toBeLessThanOrEqual(3)
      await expectHealthy()
      expect(client.received.some((m) => m.id === 'short-1')).toBe(false)
    },
    TIMEOUT,
  )

  it(
    'a Content-Length larger than the body, followed by a real message that it swallows: the server survives',
    async () => {
      const body = JSON.stringify({ jsonrpc: '2.0', id: 'long-1', method: 'textDocument/hover', params: { textDocument: { uri: REAL_URI }, position: { line: 0, character: 0 } } })
      client.writeRaw(frame(body, body.length + 40))
      // This request's first 40 bytes complete the broken frame: it is lost, as the base protocol implies.
      const lost = client.request('textDocument/hover', { textDocument: { uri: REAL_URI }, position: { line: 0, character: 0 } }, 1500)
      await expect(lost).rejects.toThrow(/no matching message/)
      expect(await resync()).toBeLessThanOrEqual(3)
      await expectHealthy()
    },
    TIMEOUT,
  )

  it(
    'a header without Content-Length, and one whose value is not a number: the server survives',
    async () => {
      const body = JSON.stringify({ jsonrpc: '2.0', id: 'nolen-1', method: 'shutdown' })
      client.writeRaw(`Content-Type: application/vscode-jsonrpc; charset=utf-8\r\n\r\n${body}`)
      expect(await resync()).toBeLessThanOrEqual(3)
      await expectHealthy()
      client.writeRaw(`Content-Length: twelve\r\n\r\n${body}`)
      expect(await resync()).toBeLessThanOrEqual(3)
      await expectHealthy()
      // Neither shutdown request was run (the hovers above would have failed after a shutdown).
      expect(client.received.some((m) => m.id === 'nolen-1')).toBe(false)
    },
    TIMEOUT,
  )

  it(
    'garbage bytes between two messages: the server survives and answers after a resync',
    async () => {
      // Binary noise with NUL, invalid UTF-8, a lone CR LF, a colon and a fake header fragment.
      const noise = Buffer.from([0x00, 0x01, 0xff, 0x0d, 0x0a, 0x3a, 0x80, 0x43, 0x6f, 0x6e, 0x74, 0x65, 0x6e, 0x74, 0x0d, 0x0a, 0x9f, 0x00])
      client.send({ jsonrpc: '2.0', method: 'workspace/didChangeWatchedFiles', params: { changes: [] } })
      client.writeRaw(noise)
      client.writeRaw(Buffer.from('@@@@ random text without any structure @@@@'))
      client.send({ jsonrpc: '2.0', id: 'after-noise', method: 'textDocument/hover', params: { textDocument: { uri: REAL_URI }, position: { line: 0, character: 0 } } })
      expect(await resync()).toBeLessThanOrEqual(3)
      await expectHealthy()
    },
    TIMEOUT,
  )
})

describe('JSON-RPC messages of the wrong shape', () => {
  it(
    'a message without a method, a method that is not a string, an id that is an object: ignored',
    async () => {
      client.send({ jsonrpc: '2.0', id: 'shape-1' })
      client.send({ jsonrpc: '2.0', id: 'shape-2', method: 42, params: {} })
      client.send({ jsonrpc: '2.0', id: { not: 'an id' }, method: 'textDocument/hover', params: {} })
      client.send({ jsonrpc: '2.0', method: null })
      client.send({})
      // A response to a request the server never sent.
      client.send({ jsonrpc: '2.0', id: 987654, result: { unexpected: true } })
      client.send({ jsonrpc: '2.0', id: 987655, error: { code: -1, message: 'no such request' } })
      await expectHealthy()
    },
    TIMEOUT,
  )

  it(
    'textDocument/hover with params that are a string, a number, null, {} or missing: an error response, never a crash',
    async () => {
      for (const [i, params] of (['a string', 7, null, {}, { textDocument: { uri: 42 }, position: 'top' }] as unknown[]).entries()) {
        const reply = await client.requestRaw(`hover-bad-${i}`, { method: 'textDocument/hover', params })
        // Either "nothing here" (null) or a JSON-RPC error with a standard code; both are proper answers.
        if (reply.error) expect([INVALID_PARAMS, INTERNAL_ERROR, REQUEST_FAILED]).toContain(reply.error.code)
        else expect(reply.result).toBeNull()
      }
      const noParams = await client.requestRaw('hover-none', { method: 'textDocument/hover' })
      expect(noParams.error !== undefined || noParams.result === null).toBe(true)
      await expectHealthy()
    },
    TIMEOUT,
  )

  it(
    'every document request with params of the wrong type gets an answer (result or error)',
    async () => {
      const methods = [
        'textDocument/inlayHint', 'textDocument/documentSymbol', 'textDocument/codeAction', 'textDocument/completion',
        'textDocument/codeLens', 'textDocument/foldingRange', 'textDocument/semanticTokens/full', 'textDocument/formatting',
        'textDocument/definition', 'textDocument/references', 'textDocument/prepareRename', 'textDocument/rename', 'cellrun/preview',
      ]
      for (const method of methods) {
        for (const [i, params] of (['x', null, { textDocument: null }] as unknown[]).entries()) {
          const reply = await client.requestRaw(`${method}-${i}`, { method, params })
          expect(reply.error === undefined ? 'result' : typeof reply.error.code, `${method} ${JSON.stringify(params)}`).toMatch(/^(result|number)$/)
        }
      }
      await expectHealthy()
    },
    60_000,
  )

  it(
    'didOpen with no textDocument, no text or no uri is refused, and the documents opened next work as usual',
    async () => {
      client.notify('textDocument/didOpen', {})
      client.notify('textDocument/didOpen', null)
      client.notify('textDocument/didOpen', 'file:///virtual/x.cellrun')
      client.notify('textDocument/didOpen', { textDocument: { uri: 'file:///virtual/no-text.cellrun', languageId: 'cellrun', version: 1 } })
      client.notify('textDocument/didOpen', { textDocument: { languageId: 'cellrun', version: 1, text: 'run "no uri"\n' } })
      client.notify('textDocument/didOpen', { textDocument: { uri: 'file:///virtual/text-number.cellrun', languageId: 'cellrun', version: 1, text: 12345 } })
      client.notify('textDocument/didOpen', { textDocument: { uri: 'file:///virtual/no-version.cellrun', languageId: 'cellrun', text: 'run "v"\n' } })
      await expectHealthy()
      // The refused documents are not open: a hover on them is "nothing here", not an error.
      // (Before the fix in server.ts they were kept, and every request on them failed.)
      for (const uri of ['file:///virtual/no-text.cellrun', 'file:///virtual/text-number.cellrun', 'file:///virtual/no-version.cellrun']) {
        const hover = await client.request('textDocument/hover', { textDocument: { uri }, position: { line: 0, character: 1 } })
        expect(hover.error, `${uri}: ${JSON.stringify(hover.error)}`).toBeUndefined()
        expect(hover.result).toBeNull()
      }
      // An include is looked up among the open documents first: the lookup walks all of them, and
      // must not trip over a document without a uri. The run uses `area` and `feed` from the house file.
      const house = ['let area = 50 cm^2', 'cell', '  compartment feed 500 mL', '  compartment product 250 mL', '  separator cation-exchange between feed and product, area area', '  anode mmo-titanium in feed, area area', '  cathode nickel in product, area area', ''].join('\n')
      const run = ['include "house/cell.cellrun"', 'charge feed: K2CO3 180 g, water 420 mL', 'step 1: current 100 mA/cm^2 * area for 6 h', ''].join('\n')
      client.notify('textDocument/didOpen', { textDocument: { uri: 'file:///virtual/ws/house/cell.cellrun', languageId: 'cellrun', version: 1, text: house } })
      client.notify('textDocument/didOpen', { textDocument: { uri: 'file:///virtual/ws/run.cellrun', languageId: 'cellrun', version: 1, text: run } })
      const d = await client.diagnostics('file:///virtual/ws/run.cellrun', 1)
      expect(d.diagnostics.map((x) => x.code)).not.toContain('unknown-name')
      expect(d.diagnostics.map((x) => x.code)).not.toContain('include-file')
      await expectHealthy()
    },
    TIMEOUT,
  )

  it(
    'didChange with out-of-range, negative, reversed and malformed ranges: the document is updated and diagnosed',
    async () => {
      const uri = 'file:///virtual/robust-edits.cellrun'
      client.notify('textDocument/didOpen', { textDocument: { uri, languageId: 'cellrun', version: 1, text: 'run "edits"\nlet a = 2 A\n' } })
      await client.diagnostics(uri, 1)
      let version = 1
      const edits: unknown[] = [
        // Far past the end: clamped to the end of the document.
        { range: { start: { line: 9999, character: 5 }, end: { line: 10_000, character: 0 } }, text: 'let b = a * 2\n' },
        // Negative line and character.
        { range: { start: { line: -5, character: -1 }, end: { line: -1, character: -9 } }, text: '# top\n' },
        // End before start.
        { range: { start: { line: 1, character: 4 }, end: { line: 0, character: 0 } }, text: '' },
        // Character past the end of a line.
        { range: { start: { line: 0, character: 500 }, end: { line: 0, character: 900 } }, text: ' # tail' },
        // Fractional positions.
        { range: { start: { line: 0.5, character: 1.5 }, end: { line: 0.5, character: 1.5 } }, text: 'x' },
      ]
      for (const change of edits) {
        version++
        client.notify('textDocument/didChange', { textDocument: { uri, version }, contentChanges: [change] })
        // The server took the edit: diagnostics for exactly this version arrive.
        const d = await client.diagnostics(uri, version)
        expect(Array.isArray(d.diagnostics)).toBe(true)
      }
      // Malformed change lists: not an array, an element that is neither a full nor an incremental change, positions that are strings.
      for (const contentChanges of ['x', [42], [{ range: { start: { line: 'a', character: 'b' }, end: {} }, text: 'y' }], [{ text: 99 }], null]) {
        version++
        client.notify('textDocument/didChange', { textDocument: { uri, version }, contentChanges })
      }
      // After all that, a plain full-text change is still applied and diagnosed.
      version++
      client.notify('textDocument/didChange', { textDocument: { uri, version }, contentChanges: [{ text: 'run "edits"\nstep 1: current 5 V for 1 h\n' }] })
      const last = await client.diagnostics(uri, version)
      // `5 V` is not a current: the wrong-unit rule reports it, so the new text was really analysed.
      expect(last.diagnostics.map((x) => x.code)).toContain('wrong-unit')
      await expectHealthy()
    },
    TIMEOUT,
  )

  it(
    'an unknown request gets MethodNotFound; unknown notifications and cancellations are ignored',
    async () => {
      const unknown = await client.request('cellrun/doesNotExist', { uri: REAL_URI })
      expect(unknown.error?.code).toBe(METHOD_NOT_FOUND)
      const dollar = await client.request('$/cellrun.unknownRequest', {})
      expect(dollar.error?.code).toBe(METHOD_NOT_FOUND)
      const before = client.received.length
      client.notify('cellrun/unknownNotification', { anything: [1, 2, 3] })
      client.notify('$/unknownNotification', null)
      client.notify('$/cancelRequest', { id: 'never-sent' })
      client.notify('$/setTrace', { value: 'nonsense' })
      await expectHealthy()
      // The notifications got no answer: only the hover's response (and possibly log messages) came back.
      const since = client.received.slice(before)
      expect(since.filter((m) => m.id !== undefined && typeof m.id === 'string')).toEqual([])
    },
    TIMEOUT,
  )

  it(
    'the client answers workspace/configuration and inlayHint/refresh with errors, then with junk: the server runs on',
    async () => {
      // Before the fix in server/src/lsp/main.ts, the rejected configuration request ended the process
      // (Node 20 exits on an unhandled rejection): the server was gone after the first round.
      const failure = { error: { code: INTERNAL_ERROR, message: 'the client failed to answer' } }
      client.answers.set('workspace/configuration', failure)
      client.answers.set('workspace/inlayHint/refresh', failure)
      const asked = client.waitFor((m) => m.method === 'workspace/configuration', TIMEOUT - 1000, false)
      client.notify('workspace/didChangeConfiguration', { settings: null })
      await asked
      await expectHealthy()
      // Settings the client cannot have meant: the server reads them, keeps what it can, refreshes hints.
      for (const junk of ['junk', [42], [null], [{ rules: 5, inlayHints: 'off', simulation: { efficiencyFloor: 'high' } }]]) {
        client.answers.set('workspace/configuration', { result: junk })
        const refreshed = client.waitFor((m) => m.method === 'workspace/inlayHint/refresh', TIMEOUT - 1000, false)
        client.notify('workspace/didChangeConfiguration', { settings: {} })
        // The refresh comes after the settings were read and the open documents analysed again.
        await refreshed
        await expectHealthy()
      }
      client.answers.set('workspace/configuration', { result: [{}] })
      client.answers.delete('workspace/inlayHint/refresh')
      // With good settings again, a change publishes diagnostics for the real document as before.
      const republished = client.waitFor((m) => m.method === 'textDocument/publishDiagnostics' && (m.params as { uri: string }).uri === REAL_URI, TIMEOUT - 1000, false)
      client.notify('workspace/didChangeConfiguration', { settings: {} })
      expect(((await republished).params as { diagnostics: unknown[] }).diagnostics).toBeDefined()
      await expectHealthy()
    },
    30_000,
  )
})

describe('requests for documents that were never opened', () => {
  const doc = { uri: NEVER_OPENED }
  const pos = { line: 0, character: 0 }
  const range = { start: pos, end: { line: 10, character: 0 } }
  /** Each request and the empty answer the server gives for a document it does not have. */
  const cases: [string, object, unknown][] = [
    ['textDocument/hover', { textDocument: doc, position: pos }, null],
    ['textDocument/inlayHint', { textDocument: doc, range }, []],
    ['textDocument/documentSymbol', { textDocument: doc }, []],
    ['textDocument/codeAction', { textDocument: doc, range, context: { diagnostics: [] } }, []],
    ['textDocument/completion', { textDocument: doc, position: pos }, []],
    ['textDocument/codeLens', { textDocument: doc }, []],
    ['textDocument/foldingRange', { textDocument: doc }, []],
    ['textDocument/semanticTokens/full', { textDocument: doc }, { data: [] }],
    ['textDocument/formatting', { textDocument: doc, options: { tabSize: 2, insertSpaces: true } }, []],
    ['textDocument/definition', { textDocument: doc, position: pos }, null],
    ['textDocument/references', { textDocument: doc, position: pos, context: { includeDeclaration: true } }, []],
    ['textDocument/prepareRename', { textDocument: doc, position: pos }, null],
    ['textDocument/rename', { textDocument: doc, position: pos, newName: 'x' }, null],
  ]

  it.each(cases)(
    '%s gets an empty answer',
    async (method, params, expected) => {
      const reply = await client.request(method, params)
      expect(reply.error, JSON.stringify(reply.error)).toBeUndefined()
      expect(reply.result).toEqual(expected)
      expect(client.alive).toBe(true)
    },
    TIMEOUT,
  )

  it(
    'cellrun/preview answers with a page that says the document is not open',
    async () => {
      const reply = await client.request('cellrun/preview', { uri: NEVER_OPENED })
      expect(reply.error).toBeUndefined()
      const html = (reply.result as { html: string }).html
      expect(html).toContain('never-opened.cellrun is not open in the editor')
      // No plot and no script on that page.
      expect(html).not.toContain('<svg')
      expect(html).not.toContain('<script')
    },
    TIMEOUT,
  )

  it(
    'didChange and didClose for an unknown document are ignored (no diagnostics published for it)',
    async () => {
      const uri = 'file:///virtual/never-opened-2.cellrun'
      client.notify('textDocument/didChange', { textDocument: { uri, version: 2 }, contentChanges: [{ text: 'run "ghost"\n' }] })
      client.notify('textDocument/didClose', { textDocument: { uri } })
      client.notify('textDocument/didSave', { textDocument: { uri } })
      await expectHealthy()
      expect(client.received.some((m) => m.method === 'textDocument/publishDiagnostics' && (m.params as { uri: string }).uri === uri)).toBe(false)
      // And the document is still unknown: a hover on it has nothing to show.
      const hover = await client.request('textDocument/hover', { textDocument: { uri }, position: { line: 0, character: 1 } })
      expect(hover.result).toBeNull()
    },
    TIMEOUT,
  )

  it(
    'positions outside an open document: empty answers, not errors',
    async () => {
      const far = { line: 1_000_000, character: 1_000_000 }
      const negative = { line: -3, character: -7 }
      for (const position of [far, negative]) {
        const hover = await client.request('textDocument/hover', { textDocument: { uri: REAL_URI }, position })
        expect(hover.error, JSON.stringify(hover.error)).toBeUndefined()
        const def = await client.request('textDocument/definition', { textDocument: { uri: REAL_URI }, position })
        expect(def.error, JSON.stringify(def.error)).toBeUndefined()
        const refs = await client.request('textDocument/references', { textDocument: { uri: REAL_URI }, position, context: { includeDeclaration: true } })
        expect(refs.error, JSON.stringify(refs.error)).toBeUndefined()
        expect(Array.isArray(refs.result)).toBe(true)
        const completion = await client.request('textDocument/completion', { textDocument: { uri: REAL_URI }, position })
        expect(completion.error, JSON.stringify(completion.error)).toBeUndefined()
        const hints = await client.request('textDocument/inlayHint', { textDocument: { uri: REAL_URI }, range: { start: negative, end: far } })
        expect(hints.error, JSON.stringify(hints.error)).toBeUndefined()
        expect(Array.isArray(hints.result)).toBe(true)
        // prepareRename at a place with no name: null or a RequestFailed error ("nothing to rename here").
        const prep = await client.request('textDocument/prepareRename', { textDocument: { uri: REAL_URI }, position })
        if (prep.error) expect(prep.error.code).toBe(REQUEST_FAILED)
        else expect(prep.result).toBeNull()
      }
      await expectHealthy()
    },
    TIMEOUT,
  )
})

describe('a 5 MB document', () => {
  const uri = 'file:///virtual/five-megabytes.cellrun'
  // The generator's shift blocks, repeated until the text passes 5 MiB.
  let lines = 100_000
  let big = generateProtocol(lines)
  while (big.text.length < 5 * 1024 * 1024) big = generateProtocol((lines += 5000))
  const text = big.text

  it(
    'is diagnosed and hovered within 60 s each, and the server answers the real document afterwards',
    async () => {
      expect(Buffer.byteLength(text)).toBeGreaterThanOrEqual(5 * 1024 * 1024)
      const t0 = performance.now()
      client.notify('textDocument/didOpen', { textDocument: { uri, languageId: 'cellrun', version: 1, text } })
      const diags = await client.diagnostics(uri, 1, 60_000)
      const tDiagnostics = performance.now() - t0
      // The generated campaign has findings (e.g. the efficiency rules on its observe lines).
      expect(diags.diagnostics.length).toBeGreaterThan(0)

      const k = rangeOf(text, 'K2CO3')
      const t1 = performance.now()
      const hover = await client.request('textDocument/hover', { textDocument: { uri }, position: { line: k.start.line, character: k.start.character + 1 } }, 60_000)
      const tHover = performance.now() - t1
      const m = /M = ([\d.]+) g\/mol/.exec(markdownOf(hover.result))
      expect(m, markdownOf(hover.result)).not.toBeNull()
      expect(Number(m![1])).toBeCloseTo(138.205, 2)

      // A one-character edit near the end: the whole text is analysed again for the new version.
      const last = text.split('\n').length - 2
      const t2 = performance.now()
      client.notify('textDocument/didChange', { textDocument: { uri, version: 2 }, contentChanges: [{ range: { start: { line: last, character: 0 }, end: { line: last, character: 0 } }, text: '#' }] })
      await client.diagnostics(uri, 2, 60_000)
      const tEdit = performance.now() - t2

      console.log(
        `5 MB document (${(Buffer.byteLength(text) / 1024 / 1024).toFixed(2)} MiB, ${big.lines} lines, ${big.steps} steps): ` +
          `diagnostics after didOpen ${(tDiagnostics / 1000).toFixed(2)} s (${diags.diagnostics.length} diagnostics), ` +
          `hover ${(tHover / 1000).toFixed(3)} s, diagnostics after a one-character edit ${(tEdit / 1000).toFixed(2)} s`,
      )
      expect(tDiagnostics).toBeLessThan(60_000)
      expect(tHover).toBeLessThan(60_000)
      expect(tEdit).toBeLessThan(60_000)

      client.notify('textDocument/didClose', { textDocument: { uri } })
      // Closing clears its diagnostics.
      const cleared = await client.waitFor((m) => m.method === 'textDocument/publishDiagnostics' && (m.params as { uri: string; diagnostics: unknown[] }).uri === uri && (m.params as { diagnostics: unknown[] }).diagnostics.length === 0, 30_000)
      expect(cleared).toBeDefined()
      await expectHealthy()
    },
    200_000,
  )
})

describe('after all of it', () => {
  it(
    'shuts down on request and exits with code 0 (it never crashed)',
    async () => {
      const reply = await client.request('shutdown')
      expect(reply.result).toBeNull()
      client.notify('exit', null)
      const code = await Promise.race([client.exited, new Promise<'timeout'>((r) => setTimeout(() => r('timeout'), TIMEOUT - 1000))])
      expect(code, `server stderr:\n${client.stderr}`).toBe(0)
    },
    TIMEOUT,
  )
})
