// Protocol-level test of the editor features of the BUILT language server (completion, formatting,
// rename, semantic tokens, folding, code lens, definition, references, the formula hover): spawns
// `node dist/server.js --stdio` and speaks LSP to it over stdio with vscode-jsonrpc, as an editor
// would. Follows test/lsp.test.ts.
//
// Expected ranges are computed from the document text here (indexOf + a line/column helper that
// is independent of the server's LineIndex), never copied from server output.
import { spawn, type ChildProcessWithoutNullStreams } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ensureBuilt, lineStartOf, posAt, rangeOf, ROOT, SERVER, TIMEOUT } from './support/lsp-server'
import { createMessageConnection, ResponseError, StreamMessageReader, StreamMessageWriter, type MessageConnection } from 'vscode-jsonrpc/node'
import {
  CodeLensRequest,
  CompletionItemKind,
  CompletionRequest,
  DefinitionRequest,
  DidOpenTextDocumentNotification,
  DocumentFormattingRequest,
  ExitNotification,
  FoldingRangeRequest,
  HoverRequest,
  InitializedNotification,
  InitializeRequest,
  PrepareRenameRequest,
  PublishDiagnosticsNotification,
  ReferencesRequest,
  RenameRequest,
  SemanticTokensRequest,
  ShutdownRequest,
  type CodeLens,
  type CompletionItem,
  type CompletionList,
  type FoldingRange,
  type InitializeResult,
  type Location,
  type MarkupContent,
  type PublishDiagnosticsParams,
  type Range,
  type SemanticTokensLegend,
  type TextEdit,
  type WorkspaceEdit,
} from 'vscode-languageserver-protocol'
import { TextDocument } from 'vscode-languageserver-textdocument'


// ------------------------------------------------------------------------------------------------
// Independent position helpers (UTF-16 code units, '\n' line breaks: the test documents use only '\n').

/** 0-based line number of the line that contains `needle`. */
function lineOf(text: string, needle: string): number {
  return posAt(text, lineStartOf(text, needle)).line
}

// ------------------------------------------------------------------------------------------------
// Build (only when needed), spawn, connect.

let child: ChildProcessWithoutNullStreams
let conn: MessageConnection
let stderr = ''
let exitCode: Promise<number | null>
const published: PublishDiagnosticsParams[] = []
/** The semantic-token legend from `initialize`. */
let legend: SemanticTokensLegend = { tokenTypes: [], tokenModifiers: [] }
const waiters: { uri: string; resolve: () => void }[] = []

/** Resolves once diagnostics were published for `uri`: the server has the document. */
function opened(uri: string): Promise<void> {
  if (published.some((p) => p.uri === uri)) return Promise.resolve()
  return new Promise((resolve, reject) => {
    const w = { uri, resolve }
    waiters.push(w)
    setTimeout(() => reject(new Error(`no publishDiagnostics for ${uri}; server stderr:\n${stderr}`)), TIMEOUT - 1000)
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
      if (w.uri === p.uri) {
        waiters.splice(waiters.indexOf(w), 1)
        w.resolve()
      }
    }
  })
  conn.onNotification(() => undefined)
  conn.listen()
}, 60_000)

afterAll(() => {
  conn?.dispose()
  if (child && child.exitCode === null && child.signalCode === null) child.kill('SIGKILL')
})

async function open(uri: string, text: string): Promise<void> {
  const ready = opened(uri)
  await conn.sendNotification(DidOpenTextDocumentNotification.type, { textDocument: { uri, languageId: 'cellrun', version: 1, text } })
  await ready
}

// ------------------------------------------------------------------------------------------------
// The documents under test.

const EXAMPLE = readFileSync(join(ROOT, 'examples', 'koh-from-carbonate.cellrun'), 'utf8')
const URI = 'file:///virtual/koh-features.cellrun'
const TEXT = EXAMPLE.endsWith('\n') ? EXAMPLE : EXAMPLE + '\n'

const MESSY_URI = 'file:///virtual/messy.cellrun'
const MESSY = [
  'run   "messy"  ',
  'let   area=50 cm^2',
  'cell',
  '\tcompartment feed 500 mL',
  '    compartment product 250 mL',
  '  separator cation-exchange between feed and  product ,area area',
  '  anode mmo-titanium in feed, area area',
  '  cathode nickel in product, area area',
  '',
  '',
  '',
  '',
  'charge feed : K2CO3 180 g,water 420 mL   # the feed',
  'step 1: current 5 A   for 2 h',
  '',
].join('\n')
const MESSY_FORMATTED = [
  'run "messy"',
  'let area = 50 cm^2',
  'cell',
  '  compartment feed 500 mL',
  '  compartment product 250 mL',
  '  separator cation-exchange between feed and product, area area',
  '  anode mmo-titanium in feed, area area',
  '  cathode nickel in product, area area',
  '',
  '',
  'charge feed: K2CO3 180 g, water 420 mL # the feed',
  'step 1: current 5 A for 2 h',
  '',
].join('\n')

const COMPLETE_URI = 'file:///virtual/complete.cellrun'
const COMPLETE_LINE = 'step 3: '
const COMPLETE_TEXT = TEXT + COMPLETE_LINE + '\n'

describe('editor features over stdio', () => {
  it(
    'initializes with the new capabilities advertised',
    async () => {
      const result: InitializeResult = await conn.sendRequest(InitializeRequest.type, {
        processId: process.pid,
        rootUri: null,
        capabilities: {},
        workspaceFolders: null,
      })
      const caps = result.capabilities
      expect(caps.completionProvider).toBeTruthy()
      expect(caps.codeLensProvider).toBeTruthy()
      expect(caps.foldingRangeProvider).toBeTruthy()
      expect(caps.documentFormattingProvider).toBeTruthy()
      expect(caps.definitionProvider).toBeTruthy()
      expect(caps.referencesProvider).toBeTruthy()
      expect(caps.renameProvider).toEqual({ prepareProvider: true })
      legend = (caps.semanticTokensProvider as { legend: SemanticTokensLegend; full?: boolean }).legend
      expect((caps.semanticTokensProvider as { full?: boolean }).full).toBe(true)
      // Standard token types and modifiers only (LSP 3.17 SemanticTokenTypes / SemanticTokenModifiers).
      const standardTypes = ['namespace', 'type', 'class', 'enum', 'interface', 'struct', 'typeParameter', 'parameter', 'variable', 'property', 'enumMember', 'event', 'function', 'method', 'macro', 'keyword', 'modifier', 'comment', 'string', 'number', 'regexp', 'operator', 'decorator', 'label']
      const standardModifiers = ['declaration', 'definition', 'readonly', 'static', 'deprecated', 'abstract', 'async', 'modification', 'documentation', 'defaultLibrary']
      for (const t of legend.tokenTypes) expect(standardTypes).toContain(t)
      for (const m of legend.tokenModifiers) expect(standardModifiers).toContain(m)
      // Still there: the features of the first version.
      expect(caps.hoverProvider).toBeTruthy()
      expect(caps.codeActionProvider).toBeTruthy()
      await conn.sendNotification(InitializedNotification.type, {})
      await open(URI, TEXT)
      await open(MESSY_URI, MESSY)
      await open(COMPLETE_URI, COMPLETE_TEXT)
    },
    TIMEOUT,
  )

  it(
    'completes the clause words after `step N:`',
    async () => {
      const cursor = posAt(COMPLETE_TEXT, lineStartOf(COMPLETE_TEXT, COMPLETE_LINE) + COMPLETE_LINE.length)
      const result = (await conn.sendRequest(CompletionRequest.type, { textDocument: { uri: COMPLETE_URI }, position: cursor })) as
        | CompletionItem[]
        | CompletionList
      const items = Array.isArray(result) ? result : result.items
      expect(items.map((i) => i.label).sort()).toEqual(['current', 'efficiency', 'for', 'voltage'])
      for (const i of items) {
        expect(i.kind).toBe(CompletionItemKind.Keyword)
        const edit = i.textEdit as TextEdit
        expect(edit.range).toEqual({ start: cursor, end: cursor })
        expect(edit.newText.startsWith(i.label)).toBe(true)
      }
    },
    TIMEOUT,
  )

  it(
    'completes formulas with their molar mass and units inside an expression',
    async () => {
      const line = lineStartOf(COMPLETE_TEXT, 'charge product:')
      // After `charge product: ` (the start of the first item).
      const cursor = posAt(COMPLETE_TEXT, line + 'charge product: '.length)
      const result = (await conn.sendRequest(CompletionRequest.type, { textDocument: { uri: COMPLETE_URI }, position: cursor })) as CompletionItem[]
      const koh = result.find((i) => i.label === 'KOH')
      expect(koh?.kind).toBe(CompletionItemKind.Struct)
      const doc = (koh!.documentation as MarkupContent).value
      // M(KOH) = 39.0983 + 15.999 + 1.008 = 56.1053 g/mol (IUPAC 2021 standard atomic weights)
      expect(Number(/M = ([\d.]+) g\/mol/.exec(doc)?.[1])).toBeCloseTo(56.1053, 3)
      expect(doc).toContain('IUPAC 2021 standard atomic weights')

      const step = lineStartOf(COMPLETE_TEXT, 'step 2: current 3 A')
      const afterThree = posAt(COMPLETE_TEXT, step + 'step 2: current 3 '.length)
      const units = (await conn.sendRequest(CompletionRequest.type, { textDocument: { uri: COMPLETE_URI }, position: afterThree })) as CompletionItem[]
      expect(units.find((i) => i.label === 'mA')?.kind).toBe(CompletionItemKind.Unit)
      expect(units.find((i) => i.label === 'area')?.kind).toBe(CompletionItemKind.Variable)
    },
    TIMEOUT,
  )

  it(
    'formats a document with edits that give the formatted text',
    async () => {
      const edits = (await conn.sendRequest(DocumentFormattingRequest.type, {
        textDocument: { uri: MESSY_URI },
        options: { tabSize: 2, insertSpaces: true },
      })) as TextEdit[]
      expect(edits.length).toBeGreaterThan(0)
      const doc = TextDocument.create(MESSY_URI, 'cellrun', 1, MESSY)
      expect(TextDocument.applyEdits(doc, edits)).toBe(MESSY_FORMATTED)
      // A formatted document needs no edits.
      const clean = (await conn.sendRequest(DocumentFormattingRequest.type, { textDocument: { uri: URI }, options: { tabSize: 2, insertSpaces: true } })) as TextEdit[]
      expect(clean).toEqual([])
    },
    TIMEOUT,
  )

  it(
    'renames a `let` value with a WorkspaceEdit, after preparing it; refuses a unit name',
    async () => {
      const letArea = rangeOf(TEXT, 'area', lineStartOf(TEXT, 'let area'))
      const prepared = await conn.sendRequest(PrepareRenameRequest.type, { textDocument: { uri: URI }, position: letArea.start })
      expect(prepared).toEqual({ range: letArea, placeholder: 'area' })

      const edit = (await conn.sendRequest(RenameRequest.type, { textDocument: { uri: URI }, position: letArea.start, newName: 'electrodeArea' })) as WorkspaceEdit
      const changes = edit.changes![URI]
      // `area` as a name: the let, the separator and both electrodes (`area area`: the second word), step 1.
      const expected: Range[] = [letArea]
      for (const l of ['  separator cation-exchange', '  anode mmo-titanium', '  cathode nickel']) {
        const at = lineStartOf(TEXT, l)
        const line = TEXT.slice(at, TEXT.indexOf('\n', at))
        expected.push(rangeOf(TEXT, 'area', at + line.lastIndexOf('area')))
      }
      expected.push(rangeOf(TEXT, 'area', lineStartOf(TEXT, 'step 1:')))
      expect(changes.map((c) => c.range)).toEqual(expected)
      expect(changes.every((c) => c.newText === 'electrodeArea')).toBe(true)

      await expect(conn.sendRequest(RenameRequest.type, { textDocument: { uri: URI }, position: letArea.start, newName: 'min' })).rejects.toBeInstanceOf(ResponseError)
    },
    TIMEOUT,
  )

  it(
    'goes to the definition of a compartment and finds its references',
    async () => {
      const chargeLine = lineStartOf(TEXT, 'charge feed:')
      const mention = rangeOf(TEXT, 'feed', chargeLine)
      const def = (await conn.sendRequest(DefinitionRequest.type, { textDocument: { uri: URI }, position: mention.start })) as Location
      expect(def).toEqual({ uri: URI, range: rangeOf(TEXT, 'feed', lineStartOf(TEXT, 'compartment feed')) })
      const refs = (await conn.sendRequest(ReferencesRequest.type, {
        textDocument: { uri: URI },
        position: mention.start,
        context: { includeDeclaration: true },
      })) as Location[]
      const sep = lineStartOf(TEXT, '  separator')
      expect(refs.map((r) => r.range)).toEqual([
        rangeOf(TEXT, 'feed', lineStartOf(TEXT, 'compartment feed')),
        rangeOf(TEXT, 'feed', sep),
        rangeOf(TEXT, 'feed', lineStartOf(TEXT, '  anode')),
        mention,
      ])
    },
    TIMEOUT,
  )

  it(
    'gives semantic tokens that decode to the expected types on the separator line',
    async () => {
      const result = await conn.sendRequest(SemanticTokensRequest.type, { textDocument: { uri: URI } })
      // The legend the server advertised in `initialize`.
      expect(legend.tokenTypes.length).toBeGreaterThan(0)
      // Decode: deltas of line and start, length, type index, modifier bits.
      const lines = TEXT.split('\n')
      const decoded: { line: number; text: string; type: string; modifiers: string[] }[] = []
      let line = 0
      let char = 0
      const d = result!.data
      for (let i = 0; i < d.length; i += 5) {
        line += d[i]
        char = d[i] === 0 ? char + d[i + 1] : d[i + 1]
        const modifiers = legend.tokenModifiers.filter((_, b) => (d[i + 4] >> b) & 1)
        decoded.push({ line, text: lines[line].slice(char, char + d[i + 2]), type: legend.tokenTypes[d[i + 3]], modifiers })
      }
      const sepLine = lineOf(TEXT, '  separator cation-exchange')
      expect(decoded.filter((t) => t.line === sepLine).map((t) => `${t.text}:${t.type}${t.modifiers.map((m) => '.' + m).join('')}`)).toEqual([
        'separator:keyword',
        'cation-exchange:type',
        'between:keyword',
        'feed:variable',
        'and:keyword',
        'product:variable',
        'area:keyword',
        'area:variable.readonly',
      ])
      const letLine = lineOf(TEXT, 'let j =')
      expect(decoded.filter((t) => t.line === letLine).slice(0, 2).map((t) => `${t.text}:${t.type}:${t.modifiers.join(',')}`)).toEqual([
        'let:keyword:',
        'j:variable:declaration,readonly',
      ])
      expect(decoded.find((t) => t.text === 'K2CO3')?.type).toBe('struct')
    },
    TIMEOUT,
  )

  it(
    'folds the cell block',
    async () => {
      const ranges = (await conn.sendRequest(FoldingRangeRequest.type, { textDocument: { uri: URI } })) as FoldingRange[]
      const cell = lineOf(TEXT, 'cell\n')
      const last = lineOf(TEXT, '  cathode nickel')
      expect(ranges).toContainEqual({ startLine: cell, endLine: last })
      // The three comment lines at the top fold as comments.
      expect(ranges).toContainEqual({ startLine: 0, endLine: 2, kind: 'comment' })
    },
    TIMEOUT,
  )

  it(
    'puts a code lens with the run summary on the `run` line',
    async () => {
      const lenses = (await conn.sendRequest(CodeLensRequest.type, { textDocument: { uri: URI } })) as CodeLens[]
      expect(lenses).toHaveLength(1)
      const runLine = 'run "KOH from carbonate, batch 3"'
      expect(lenses[0].range).toEqual(rangeOf(TEXT, runLine))
      expect(lenses[0].command?.command).toBe('cellrun.showPreview')
      expect(lenses[0].command?.arguments).toEqual([URI])
      expect(lenses[0].command?.title).toMatch(/KOH [\d.]+ g/)
      expect(lenses[0].command?.title).toMatch(/H₂ [\d.]+ L/)
      expect(lenses[0].command?.title).toContain('7 h')
    },
    TIMEOUT,
  )

  it(
    'shows the solubility at the run temperature in the formula hover',
    async () => {
      const k2co3 = rangeOf(TEXT, 'K2CO3')
      const h = await conn.sendRequest(HoverRequest.type, { textDocument: { uri: URI }, position: { line: k2co3.start.line, character: k2co3.start.character + 1 } })
      const md = (h!.contents as MarkupContent).value
      expect(md).toContain('g/mol')
      expect(md).toContain('Solubility at 30 °C')
      expect(md).toContain('Density table at 20 °C')
    },
    TIMEOUT,
  )

  it(
    'answers the new requests for an unknown document with empty results',
    async () => {
      const unknown = { uri: 'file:///virtual/never-opened.cellrun' }
      const pos = { line: 0, character: 0 }
      expect(await conn.sendRequest(CompletionRequest.type, { textDocument: unknown, position: pos })).toEqual([])
      expect(await conn.sendRequest(CodeLensRequest.type, { textDocument: unknown })).toEqual([])
      expect(await conn.sendRequest(FoldingRangeRequest.type, { textDocument: unknown })).toEqual([])
      expect(await conn.sendRequest(DocumentFormattingRequest.type, { textDocument: unknown, options: { tabSize: 2, insertSpaces: true } })).toEqual([])
      expect(await conn.sendRequest(DefinitionRequest.type, { textDocument: unknown, position: pos })).toBeNull()
      expect(await conn.sendRequest(ReferencesRequest.type, { textDocument: unknown, position: pos, context: { includeDeclaration: true } })).toEqual([])
      expect(child.exitCode).toBeNull()
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
