// Protocol-level test of the BUILT language server: spawns `node dist/server.js --stdio` and
// speaks LSP to it over stdio with vscode-jsonrpc, exactly as an editor would (no VS Code).
//
// Expected ranges are computed from the document text here (indexOf + a line/column helper that
// is independent of the server's LineIndex), never copied from server output.
import { spawn, type ChildProcessWithoutNullStreams } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ensureBuilt, lineStartOf, posAt, rangeOf, ROOT, SERVER, TIMEOUT } from './support/lsp-server'
import { createMessageConnection, StreamMessageReader, StreamMessageWriter, type MessageConnection } from 'vscode-jsonrpc/node'
import {
  CodeActionKind,
  CodeActionRequest,
  DiagnosticSeverity,
  DidChangeTextDocumentNotification,
  DidCloseTextDocumentNotification,
  DidOpenTextDocumentNotification,
  DocumentSymbolRequest,
  ExitNotification,
  HoverRequest,
  InitializedNotification,
  InitializeRequest,
  InlayHintRequest,
  PublishDiagnosticsNotification,
  ShutdownRequest,
  SymbolKind,
  TextDocumentSyncKind,
  type CodeAction,
  type Diagnostic,
  type DocumentSymbol,
  type Hover,
  type InitializeResult,
  type InlayHint,
  type MarkupContent,
  type PublishDiagnosticsParams,
  type Range,
  type SymbolInformation,
} from 'vscode-languageserver-protocol'


// ------------------------------------------------------------------------------------------------
// Independent position helpers (UTF-16 code units, '\n' line breaks: the test documents use only '\n').

function markdownOf(h: Hover | null): string {
  if (!h) return ''
  const c = h.contents
  if (typeof c === 'string') return c
  if (Array.isArray(c)) return c.map((x) => (typeof x === 'string' ? x : x.value)).join('\n')
  return (c as MarkupContent).value
}

function labelText(h: InlayHint): string {
  return typeof h.label === 'string' ? h.label : h.label.map((p) => p.value).join('')
}

// ------------------------------------------------------------------------------------------------
// Build (only when needed), spawn, connect.

let child: ChildProcessWithoutNullStreams
let conn: MessageConnection
let stderr = ''
let exitCode: Promise<number | null>
const published: PublishDiagnosticsParams[] = []
const waiters: { match: (p: PublishDiagnosticsParams) => boolean; resolve: (p: PublishDiagnosticsParams) => void }[] = []

/** The first publishDiagnostics for `uri` (and `version`, when given), already received or yet to come. */
function diagnosticsFor(uri: string, version?: number | ((p: PublishDiagnosticsParams) => boolean)): Promise<PublishDiagnosticsParams> {
  const match = (p: PublishDiagnosticsParams) =>
    p.uri === uri && (version === undefined || (typeof version === 'function' ? version(p) : p.version === version))
  const seen = published.find(match)
  if (seen) return Promise.resolve(seen)
  return new Promise((resolve, reject) => {
    const w = { match, resolve }
    waiters.push(w)
    setTimeout(() => {
      const i = waiters.indexOf(w)
      if (i >= 0) {
        waiters.splice(i, 1)
        reject(new Error(`no publishDiagnostics for ${uri} (${String(version ?? 'any version')}) within ${TIMEOUT} ms; server stderr:\n${stderr}`))
      }
    }, TIMEOUT - 1000)
  })
}

beforeAll(() => {
  ensureBuilt()
  child = spawn(process.execPath, [SERVER, '--stdio'], { cwd: ROOT, stdio: ['pipe', 'pipe', 'pipe'] })
  child.stderr.setEncoding('utf8')
  child.stderr.on('data', (d: string) => (stderr += d))
  exitCode = new Promise((resolve) => child.on('exit', (code) => resolve(code)))
  conn = createMessageConnection(new StreamMessageReader(child.stdout), new StreamMessageWriter(child.stdin))
  conn.onNotification(PublishDiagnosticsNotification.type, (p) => {
    published.push(p)
    for (const w of [...waiters]) {
      if (w.match(p)) {
        waiters.splice(waiters.indexOf(w), 1)
        w.resolve(p)
      }
    }
  })
  // Other notifications the server may send (log messages, telemetry) are ignored.
  conn.onNotification(() => undefined)
  conn.listen()
}, 60_000)

afterAll(() => {
  conn?.dispose()
  if (child && child.exitCode === null && child.signalCode === null) child.kill('SIGKILL')
})

// ------------------------------------------------------------------------------------------------
// The document under test: the KOH example with two deliberate errors appended.

const EXAMPLE = readFileSync(join(ROOT, 'examples', 'koh-from-carbonate.cellrun'), 'utf8')
const WRONG_UNIT_LINE = 'step 9: current 5 V for 1 h'
const SYNTAX_LINE = 'stepp 3: current 1 A for 1 h'
const TEXT = (EXAMPLE.endsWith('\n') ? EXAMPLE : EXAMPLE + '\n') + WRONG_UNIT_LINE + '\n' + SYNTAX_LINE + '\n'
const URI = 'file:///virtual/koh-broken.cellrun'

const wrongUnitStart = lineStartOf(TEXT, WRONG_UNIT_LINE)
const syntaxStart = lineStartOf(TEXT, SYNTAX_LINE)
/** `5 V` on the appended step line: the value in volts after `current`. */
const wrongUnitRange = rangeOf(TEXT, '5 V', wrongUnitStart)
/** `current` on the appended step line: the word the quick fix replaces. */
const currentWordRange = rangeOf(TEXT, 'current', wrongUnitStart)
/** `stepp`: the misspelt keyword. */
const stepRange = rangeOf(TEXT, 'stepp', syntaxStart)

describe('language server over stdio', () => {
  it(
    'initializes with the advertised capabilities',
    async () => {
      const result: InitializeResult = await conn.sendRequest(InitializeRequest.type, {
        processId: process.pid,
        rootUri: null,
        capabilities: {},
        workspaceFolders: null,
      })
      const caps = result.capabilities
      expect(caps.hoverProvider).toBeTruthy()
      expect(caps.inlayHintProvider).toBeTruthy()
      expect(caps.documentSymbolProvider).toBeTruthy()
      expect(caps.codeActionProvider).toBeTruthy()
      const sync = caps.textDocumentSync
      const kind = typeof sync === 'number' ? sync : sync?.change
      expect(kind).toBe(TextDocumentSyncKind.Incremental)
      if (typeof caps.codeActionProvider === 'object') {
        expect(caps.codeActionProvider.codeActionKinds).toContain(CodeActionKind.QuickFix)
      }
      await conn.sendNotification(InitializedNotification.type, {})
    },
    TIMEOUT,
  )

  it(
    'publishes diagnostics with codes, 0-based UTF-16 ranges, severity and source',
    async () => {
      const pending = diagnosticsFor(URI, 1)
      await conn.sendNotification(DidOpenTextDocumentNotification.type, {
        textDocument: { uri: URI, languageId: 'cellrun', version: 1, text: TEXT },
      })
      const { diagnostics, version } = await pending
      expect(version).toBe(1)

      const wrong = diagnostics.filter((d) => d.code === 'wrong-unit')
      expect(wrong).toHaveLength(1)
      expect(wrong[0].range).toEqual(wrongUnitRange)
      expect(wrong[0].severity).toBe(DiagnosticSeverity.Error)
      expect(wrong[0].source).toBe('cellrun')
      expect(wrong[0].message).toMatch(/current/)

      const syn = diagnostics.filter((d) => d.code === 'syntax')
      expect(syn).toHaveLength(1)
      expect(syn[0].range).toEqual(stepRange)
      expect(syn[0].severity).toBe(DiagnosticSeverity.Error)
      expect(syn[0].source).toBe('cellrun')
      expect(syn[0].message).toContain('stepp')

      // The example itself is clean: no other error is reported anywhere in it.
      const otherErrors = diagnostics.filter(
        (d) => d.severity === DiagnosticSeverity.Error && d.code !== 'wrong-unit' && d.code !== 'syntax',
      )
      expect(otherErrors).toEqual([])
      for (const d of diagnostics) expect(d.source).toBe('cellrun')
    },
    TIMEOUT,
  )

  it(
    'gives inlay hints with the charge at the end of each step line and the maximum on `expect KOH`',
    async () => {
      const lines = TEXT.split('\n')
      const hints = (await conn.sendRequest(InlayHintRequest.type, {
        textDocument: { uri: URI },
        range: { start: { line: 0, character: 0 }, end: posAt(TEXT, TEXT.length) },
      })) as InlayHint[]
      expect(Array.isArray(hints)).toBe(true)

      // Steps 1 and 2 of the example can be computed (current and duration both known).
      const stepLines = lines.map((l, i) => ({ l, i })).filter(({ l }) => /^step [12]:/.test(l))
      expect(stepLines).toHaveLength(2)
      for (const { l, i } of stepLines) {
        const atEnd = hints.filter((h) => h.position.line === i && h.position.character === l.length)
        expect(atEnd.length, `hint at the end of line ${i}: ${l}`).toBeGreaterThanOrEqual(1)
        expect(atEnd.some((h) => labelText(h).includes('A·h')), `A·h hint on line ${i}`).toBe(true)
      }

      const expectLine = lines.findIndex((l) => l.startsWith('expect KOH'))
      expect(expectLine).toBeGreaterThan(0)
      const maxHints = hints.filter(
        (h) => h.position.line === expectLine && h.position.character === lines[expectLine].length && labelText(h).includes('max'),
      )
      expect(maxHints).toHaveLength(1)

      // Every hint stands inside the document.
      for (const h of hints) {
        expect(h.position.line).toBeLessThan(lines.length)
        expect(h.position.character).toBeLessThanOrEqual(lines[h.position.line].length)
      }
    },
    TIMEOUT,
  )

  it(
    'hovers: the charge working on a step line, the molar mass on a formula',
    async () => {
      const stepLine = 'step 1: current j * area for 6 h, efficiency 90 %'
      const stepAt = lineStartOf(TEXT, stepLine)
      const onStep = await conn.sendRequest(HoverRequest.type, {
        textDocument: { uri: URI },
        position: posAt(TEXT, TEXT.indexOf('current', stepAt) + 2),
      })
      expect(onStep).not.toBeNull()
      expect(markdownOf(onStep)).toContain('Q = I·t')
      expect(onStep!.range).toEqual(rangeOf(TEXT, stepLine))

      const k2co3 = rangeOf(TEXT, 'K2CO3')
      const onFormula = await conn.sendRequest(HoverRequest.type, {
        textDocument: { uri: URI },
        position: { line: k2co3.start.line, character: k2co3.start.character + 2 },
      })
      const md = markdownOf(onFormula)
      expect(md).toContain('g/mol')
      expect(onFormula!.range).toEqual(k2co3)
      // M(K2CO3) = 2 × 39.0983 + 12.011 + 3 × 15.999 = 138.205 g/mol (IUPAC standard atomic weights).
      const m = /M = ([\d.]+) g\/mol/.exec(md)
      expect(m, md).not.toBeNull()
      expect(Number(m![1])).toBeCloseTo(138.205, 1)

      // A blank line has nothing to show.
      const blank = TEXT.split('\n').findIndex((l) => l === '')
      const none = await conn.sendRequest(HoverRequest.type, { textDocument: { uri: URI }, position: { line: blank, character: 0 } })
      expect(none).toBeNull()
    },
    TIMEOUT,
  )

  it(
    'returns document symbols with the cell and its compartments as children',
    async () => {
      const symbols = (await conn.sendRequest(DocumentSymbolRequest.type, { textDocument: { uri: URI } })) as
        | DocumentSymbol[]
        | SymbolInformation[]
      expect(symbols.length).toBeGreaterThan(0)
      expect('children' in symbols[0] || 'selectionRange' in symbols[0]).toBe(true) // hierarchical form
      const docSymbols = symbols as DocumentSymbol[]
      const cell = docSymbols.find((s) => s.name === 'cell')
      expect(cell).toBeDefined()
      expect(cell!.kind).toBe(SymbolKind.Struct)
      const compartments = (cell!.children ?? []).filter((c) => c.kind === SymbolKind.Field)
      expect(compartments.map((c) => c.name).sort()).toEqual(['feed', 'product'])
      // The selection of a compartment is its name; the cell's range covers all its children.
      expect(compartments.find((c) => c.name === 'feed')!.selectionRange).toEqual(rangeOf(TEXT, 'feed', lineStartOf(TEXT, 'compartment feed')))
      const within = (inner: Range, outer: Range) =>
        (inner.start.line > outer.start.line || (inner.start.line === outer.start.line && inner.start.character >= outer.start.character)) &&
        (inner.end.line < outer.end.line || (inner.end.line === outer.end.line && inner.end.character <= outer.end.character))
      for (const c of cell!.children ?? []) {
        expect(within(c.range, cell!.range), `${c.name} inside the cell`).toBe(true)
        expect(within(c.selectionRange, c.range), `${c.name} selection inside its range`).toBe(true)
      }
      expect(docSymbols.some((s) => s.name === 'step 1')).toBe(true)
    },
    TIMEOUT,
  )

  it(
    'offers quick fixes: `current` → `voltage` for the wrong unit, `stepp` → `step` for the misspelt keyword',
    async () => {
      const { diagnostics } = await diagnosticsFor(URI, 1)
      const wrong = diagnostics.find((d) => d.code === 'wrong-unit') as Diagnostic
      const actions = (await conn.sendRequest(CodeActionRequest.type, {
        textDocument: { uri: URI },
        range: wrong.range,
        context: { diagnostics: [wrong] },
      })) as CodeAction[]
      const change = actions.find((a) => a.title === 'Change `current` to `voltage`')
      expect(change, JSON.stringify(actions.map((a) => a.title))).toBeDefined()
      expect(change!.kind).toBe(CodeActionKind.QuickFix)
      expect(change!.edit?.changes?.[URI]).toEqual([{ range: currentWordRange, newText: 'voltage' }])
      expect(change!.diagnostics?.map((d) => d.code)).toEqual(['wrong-unit'])

      const syn = diagnostics.find((d) => d.code === 'syntax') as Diagnostic
      const synActions = (await conn.sendRequest(CodeActionRequest.type, {
        textDocument: { uri: URI },
        range: syn.range,
        context: { diagnostics: [syn] },
      })) as CodeAction[]
      const toStep = synActions.find((a) => a.edit?.changes?.[URI]?.some((e) => e.newText === 'step'))
      expect(toStep, JSON.stringify(synActions.map((a) => a.title))).toBeDefined()
      expect(toStep!.edit!.changes![URI]).toEqual([{ range: stepRange, newText: 'step' }])
    },
    TIMEOUT,
  )

  it(
    'reanalyses after incremental changes',
    async () => {
      // v2: replace the bad clause word (the quick fix's edit), as an incremental change.
      const v2 = diagnosticsFor(URI, 2)
      await conn.sendNotification(DidChangeTextDocumentNotification.type, {
        textDocument: { uri: URI, version: 2 },
        contentChanges: [{ range: currentWordRange, text: 'voltage' }],
      })
      const d2 = (await v2).diagnostics
      expect(d2.map((d) => d.code)).not.toContain('wrong-unit')
      expect(d2.filter((d) => d.code === 'syntax').map((d) => d.range)).toEqual([stepRange])

      // v3: fix the keyword too; both appended steps now parse, with the clauses as edited.
      const v3 = diagnosticsFor(URI, 3)
      await conn.sendNotification(DidChangeTextDocumentNotification.type, {
        textDocument: { uri: URI, version: 3 },
        contentChanges: [{ range: stepRange, text: 'step' }],
      })
      const d3 = (await v3).diagnostics
      expect(d3.map((d) => d.code)).not.toContain('syntax')
      expect(d3.map((d) => d.code)).not.toContain('wrong-unit')
      const symbols = (await conn.sendRequest(DocumentSymbolRequest.type, { textDocument: { uri: URI } })) as DocumentSymbol[]
      const step9 = symbols.find((s) => s.name === 'step 9')
      const step3 = symbols.find((s) => s.name === 'step 3')
      expect(step9?.detail).toContain('voltage 5 V')
      expect(step9?.detail).not.toContain('current')
      expect(step3?.detail).toContain('current 1 A')
      // The edited step 3 line reads `step 3: ...` at the same place the misspelt line stood.
      expect(step3!.range.start).toEqual(stepRange.start)
    },
    TIMEOUT,
  )

  it(
    'answers requests for an unknown document with null / [] and keeps running',
    async () => {
      const unknown = { uri: 'file:///virtual/never-opened.cellrun' }
      const pos = { line: 0, character: 0 }
      expect(await conn.sendRequest(HoverRequest.type, { textDocument: unknown, position: pos })).toBeNull()
      expect(
        await conn.sendRequest(InlayHintRequest.type, { textDocument: unknown, range: { start: pos, end: { line: 10, character: 0 } } }),
      ).toEqual([])
      expect(await conn.sendRequest(DocumentSymbolRequest.type, { textDocument: unknown })).toEqual([])
      expect(
        await conn.sendRequest(CodeActionRequest.type, { textDocument: unknown, range: { start: pos, end: pos }, context: { diagnostics: [] } }),
      ).toEqual([])
      // Still alive and still serving the open document.
      expect(child.exitCode).toBeNull()
      const k2co3 = rangeOf(TEXT, 'K2CO3')
      const h = await conn.sendRequest(HoverRequest.type, { textDocument: { uri: URI }, position: k2co3.start })
      expect(markdownOf(h)).toContain('g/mol')
    },
    TIMEOUT,
  )

  it(
    'counts positions in UTF-16 code units (non-BMP characters before an error on the same line)',
    async () => {
      const uri = 'file:///virtual/utf16.cellrun'
      // 🧪 (U+1F9EA) and 𝛼 (U+1D6FC) are outside the BMP: two UTF-16 code units each, one code point.
      const runLine = 'run "🧪 batch 𝛼" extra'
      const stepLine = 'step 🧪𝛼: current 5 V for 1 h # 🧪 trailing comment'
      const chargeLine = 'charge feed: 🧪 1 g, K2CO3 10 g # 𝛼' // a non-BMP "formula" before K2CO3
      const text = [
        '# utf-16 positions 🧪',
        runLine,
        'cell',
        '  compartment feed 500 mL',
        '  anode nickel in feed, area 10 cm^2',
        '  cathode nickel in feed, area 10 cm^2',
        chargeLine,
        stepLine,
        '',
      ].join('\n')
      const pending = diagnosticsFor(uri, 1)
      await conn.sendNotification(DidOpenTextDocumentNotification.type, {
        textDocument: { uri, languageId: 'cellrun', version: 1, text },
      })
      const { diagnostics } = await pending

      // `extra` after the run title: a syntax error whose column counts 🧪 and 𝛼 as two units each.
      const extraLine = runLine
      const extraCol = extraLine.indexOf('extra')
      expect(extraCol).not.toBe([...extraLine.slice(0, extraCol)].length) // the test means something
      const syn = diagnostics.filter((d) => d.code === 'syntax')
      expect(syn.map((d) => d.range)).toEqual([{ start: { line: 1, character: extraCol }, end: { line: 1, character: extraCol + 5 } }])

      // `5 V` after a non-BMP step label.
      const vCol = stepLine.indexOf('5 V')
      expect(vCol).not.toBe([...stepLine.slice(0, vCol)].length)
      const wrong = diagnostics.filter((d) => d.code === 'wrong-unit')
      expect(wrong.map((d) => d.range)).toEqual([{ start: { line: 7, character: vCol }, end: { line: 7, character: vCol + 3 } }])

      // The other direction: a hover position given in UTF-16 units finds K2CO3 after 🧪 on its line.
      const shownCharge = chargeLine
      const kCol = shownCharge.indexOf('K2CO3')
      const h = await conn.sendRequest(HoverRequest.type, { textDocument: { uri }, position: { line: 6, character: kCol + 1 } })
      expect(markdownOf(h)).toContain('g/mol')
      expect(h!.range).toEqual({ start: { line: 6, character: kCol }, end: { line: 6, character: kCol + 5 } })

      // Inlay hints sit at the end of the K2CO3 item, counted in UTF-16 units.
      const hints = (await conn.sendRequest(InlayHintRequest.type, {
        textDocument: { uri },
        range: { start: { line: 6, character: 0 }, end: { line: 6, character: shownCharge.length } },
      })) as InlayHint[]
      const itemEnd = shownCharge.indexOf('10 g') + 4
      expect(hints.some((x) => x.position.line === 6 && x.position.character === itemEnd)).toBe(true)

      // Closing the document clears its diagnostics.
      expect(diagnostics.length).toBeGreaterThan(0)
      const cleared = diagnosticsFor(uri, (p) => p.version === undefined && p.diagnostics.length === 0)
      await conn.sendNotification(DidCloseTextDocumentNotification.type, { textDocument: { uri } })
      await cleared
      expect(await conn.sendRequest(HoverRequest.type, { textDocument: { uri }, position: { line: 6, character: kCol + 1 } })).toBeNull()
    },
    TIMEOUT,
  )

  it(
    'shuts down and exits with code 0',
    async () => {
      expect(await conn.sendRequest(ShutdownRequest.type)).toBeNull()
      await conn.sendNotification(ExitNotification.type)
      const code = await Promise.race([exitCode, new Promise<'timeout'>((r) => setTimeout(() => r('timeout'), TIMEOUT - 1000))])
      expect(code, `server stderr:\n${stderr}`).toBe(0)
    },
    TIMEOUT,
  )
})
