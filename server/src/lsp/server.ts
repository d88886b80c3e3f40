// The Cellrun language server, whatever carries it (stdio in Node: main.ts; a web worker in the
// browser: browser.ts): a thin layer that keeps the open documents, runs the core analysis once per
// document version, and converts.
import { LSPErrorCodes, ResponseError, TextDocuments, TextDocumentSyncKind, type Connection } from 'vscode-languageserver'
import { TextDocument } from 'vscode-languageserver-textdocument'
import { analyze, outline, type Analysis } from '../core/analyze'
import { completionsAt } from '../core/complete'
import { foldingRanges } from '../core/folding'
import { formatDocument } from '../core/format'
import { hoverWithData } from '../core/hover'
import { codeLenses } from '../core/lens'
import type { ModelOptions } from '../core/model'
import { definitionAt, prepareRename, referencesAt, renameAt } from '../core/references'
import { semanticTokens } from '../core/tokens'
import { registerPreview } from './preview'
import { settingsToOptions, type HintSettings, type Settings } from './settings'
import {
  SEMANTIC_TOKENS_LEGEND,
  toCodeActions,
  toCodeLenses,
  toCompletionItems,
  toDocumentSymbols,
  toFoldingRanges,
  toInlayHints,
  toLocations,
  toLspDiagnostic,
  toRange,
  toSemanticTokens,
  toTextEdits,
} from './convert'

export interface ServerHost {
  /** Read a file from disk by absolute path (Node); absent in the browser, where only open documents are read. */
  readFile?: (path: string) => string | undefined
}

/** The file path of a `file:` URI, '/'-separated; undefined for other schemes. */
function pathOf(uri: string): string | undefined {
  if (!uri.startsWith('file://')) return undefined
  try {
    return decodeURIComponent(new URL(uri).pathname).replace(/^\/([A-Za-z]:)/, '$1')
  } catch {
    return undefined
  }
}

export function startServer(connection: Connection, host: ServerHost = {}): void {
  const documents = new TextDocuments({
    // A didOpen without a string uri or text, or a numeric version (a broken client), is refused: the
    // throw keeps it out of `documents` (the library logs it), where it would break every later pass
    // over the open documents (settings changes, include lookups).
    create: (uri, languageId, version, text) => {
      if (typeof uri !== 'string' || typeof text !== 'string' || typeof version !== 'number') throw new Error('textDocument/didOpen needs a uri, a version and the text')
      return TextDocument.create(uri, languageId, version, text)
    },
    update: TextDocument.update,
  })
  const cache = new Map<string, { version: number; analysis: Analysis }>()
  /** Analysis options from the `cellrun.*` settings (percent in the settings, fraction in the core). */
  let options: ModelOptions = {}
  let hints: HintSettings = { groups: {}, brief: false }
  let canReadSettings = false
  let canRefreshHints = false

  /** The workspace root from `initialize` (includes may not leave it). */
  let root: string | undefined

  /** Include options for a document: open documents are read first, then the disk. */
  function includesFor(doc: TextDocument): ModelOptions['includes'] {
    const file = pathOf(doc.uri)
    if (!file) return undefined
    return {
      file,
      root: root ?? file.slice(0, file.lastIndexOf('/')),
      read: (path) => documents.all().find((d) => pathOf(d.uri) === path)?.getText() ?? host.readFile?.(path),
    }
  }

  function analysisOf(doc: TextDocument): Analysis {
    const hit = cache.get(doc.uri)
    if (hit && hit.version === doc.version) return hit.analysis
    const includes = includesFor(doc)
    // The last analysis of this document lets the parser reuse the lines the edit did not touch.
    const analysis = analyze(doc.getText(), includes ? { ...options, includes } : options, hit?.analysis)
    cache.set(doc.uri, { version: doc.version, analysis })
    return analysis
  }

  connection.onInitialize((params) => {
    const rootUri = params.workspaceFolders?.[0]?.uri ?? params.rootUri ?? undefined
    root = rootUri ? pathOf(rootUri) : undefined
    canReadSettings = !!params.capabilities.workspace?.configuration
    canRefreshHints = !!params.capabilities.workspace?.inlayHint?.refreshSupport
    return {
      capabilities: {
        textDocumentSync: TextDocumentSyncKind.Incremental,
        hoverProvider: true,
        inlayHintProvider: true,
        documentSymbolProvider: true,
        codeActionProvider: { codeActionKinds: ['quickfix'] },
        completionProvider: { triggerCharacters: [' '] },
        codeLensProvider: { resolveProvider: false },
        foldingRangeProvider: true,
        semanticTokensProvider: { legend: SEMANTIC_TOKENS_LEGEND, full: true, range: false },
        documentFormattingProvider: true,
        definitionProvider: true,
        referencesProvider: true,
        renameProvider: { prepareProvider: true },
      },
      serverInfo: { name: 'cellrun-server', version: '0.1.0' },
    }
  })

  /** Read the settings, and re-analyse the open documents when they change. */
  async function readSettings(): Promise<void> {
    if (!canReadSettings) return
    const s = (await connection.workspace.getConfiguration('cellrun')) as Settings | null
    const read = settingsToOptions(s)
    options = read.options
    hints = read.hints
    cache.clear()
    for (const doc of documents.all()) publish(doc)
    if (canRefreshHints) void connection.languages.inlayHint.refresh()
  }

  connection.onInitialized(() => {
    void readSettings()
  })
  connection.onDidChangeConfiguration(() => {
    void readSettings()
  })

  function publish(document: TextDocument): void {
    const a = analysisOf(document)
    void connection.sendDiagnostics({ uri: document.uri, version: document.version, diagnostics: a.diagnostics.map((d) => toLspDiagnostic(a, d)) })
  }

  /** A changed document, and every open document that includes it, are analysed again. */
  function publishWithDependants(document: TextDocument): void {
    publish(document)
    const path = pathOf(document.uri)
    if (!path) return
    let any = false
    for (const other of documents.all()) {
      if (other.uri === document.uri) continue
      if (!cache.get(other.uri)?.analysis.includedFiles.includes(path)) continue
      cache.delete(other.uri)
      publish(other)
      any = true
    }
    if (any && canRefreshHints) void connection.languages.inlayHint.refresh()
  }

  documents.onDidChangeContent(({ document }) => publishWithDependants(document))

  documents.onDidClose(({ document }) => {
    cache.delete(document.uri)
    void connection.sendDiagnostics({ uri: document.uri, diagnostics: [] })
  })

  connection.onHover(({ textDocument, position }) => {
    const doc = documents.get(textDocument.uri)
    if (!doc) return null
    const a = analysisOf(doc)
    const h = hoverWithData(a, a.index.offsetAt(position))
    return h ? { contents: { kind: 'markdown', value: h.markdown }, range: toRange(a.index, h.span) } : null
  })

  connection.languages.inlayHint.on(({ textDocument, range }) => {
    const doc = documents.get(textDocument.uri)
    return doc ? toInlayHints(analysisOf(doc), range, hints) : []
  })

  connection.onDocumentSymbol(({ textDocument }) => {
    const doc = documents.get(textDocument.uri)
    if (!doc) return []
    const a = analysisOf(doc)
    return toDocumentSymbols(a, outline(a))
  })

  connection.onCodeAction(({ textDocument, range }) => {
    const doc = documents.get(textDocument.uri)
    return doc ? toCodeActions(analysisOf(doc), textDocument.uri, range) : []
  })

  connection.onCompletion(({ textDocument, position }) => {
    const doc = documents.get(textDocument.uri)
    if (!doc) return []
    const a = analysisOf(doc)
    return toCompletionItems(a, completionsAt(a, a.index.offsetAt(position)))
  })

  connection.onCodeLens(({ textDocument }) => {
    const doc = documents.get(textDocument.uri)
    if (!doc) return []
    const a = analysisOf(doc)
    return toCodeLenses(a, codeLenses(a), textDocument.uri)
  })

  connection.onFoldingRanges(({ textDocument }) => {
    const doc = documents.get(textDocument.uri)
    return doc ? toFoldingRanges(foldingRanges(analysisOf(doc))) : []
  })

  connection.languages.semanticTokens.on(({ textDocument }) => {
    const doc = documents.get(textDocument.uri)
    if (!doc) return { data: [] }
    const a = analysisOf(doc)
    return toSemanticTokens(a, semanticTokens(a))
  })

  connection.onDocumentFormatting(({ textDocument }) => {
    const doc = documents.get(textDocument.uri)
    if (!doc) return []
    const a = analysisOf(doc)
    return toTextEdits(a, formatDocument(a.text, options, a).edits)
  })

  connection.onDefinition(({ textDocument, position }) => {
    const doc = documents.get(textDocument.uri)
    if (!doc) return null
    const a = analysisOf(doc)
    const span = definitionAt(a, a.index.offsetAt(position))
    return span ? toLocations(a, textDocument.uri, [span])[0] : null
  })

  connection.onReferences(({ textDocument, position, context }) => {
    const doc = documents.get(textDocument.uri)
    if (!doc) return []
    const a = analysisOf(doc)
    return toLocations(a, textDocument.uri, referencesAt(a, a.index.offsetAt(position), context.includeDeclaration))
  })

  connection.onPrepareRename(({ textDocument, position }) => {
    const doc = documents.get(textDocument.uri)
    if (!doc) return null
    const a = analysisOf(doc)
    const r = prepareRename(a, a.index.offsetAt(position))
    if ('error' in r) return new ResponseError(LSPErrorCodes.RequestFailed, r.error)
    return { range: toRange(a.index, r.span), placeholder: r.placeholder }
  })

  connection.onRenameRequest(({ textDocument, position, newName }) => {
    const doc = documents.get(textDocument.uri)
    if (!doc) return null
    const a = analysisOf(doc)
    const r = renameAt(a, a.index.offsetAt(position), newName)
    if ('error' in r) return new ResponseError(LSPErrorCodes.RequestFailed, r.error)
    return { changes: { [textDocument.uri]: toTextEdits(a, r.edits) } }
  })

  registerPreview(connection, (uri) => {
    const d = documents.get(uri)
    return d && analysisOf(d)
  })

  documents.listen(connection)
  connection.listen()
}
