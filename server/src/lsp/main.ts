// The Cellrun language server over stdio (or IPC when the client asks for it), in Node.
import { readFileSync } from 'node:fs'
import { createConnection, ProposedFeatures } from 'vscode-languageserver/node'
import { startServer } from './server'

startServer(createConnection(ProposedFeatures.all), {
  readFile: (path) => {
    try {
      return readFileSync(path, 'utf8')
    } catch {
      return undefined
    }
  },
})
