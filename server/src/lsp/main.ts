// The Cellrun language server over stdio (or IPC when the client asks for it), in Node.
import { createConnection, ProposedFeatures } from 'vscode-languageserver/node'
import { startServer } from './server'

startServer(createConnection(ProposedFeatures.all))
