// The Cellrun language server in a web worker, for browser-hosted editors: the same server over
// the worker's message channel. The core it runs has no Node-only imports.
import { BrowserMessageReader, BrowserMessageWriter, createConnection } from 'vscode-languageserver/browser'
import { startServer } from './server'

declare const self: unknown
const port = self as ConstructorParameters<typeof BrowserMessageReader>[0]
startServer(createConnection(new BrowserMessageReader(port), new BrowserMessageWriter(port)))
