// The Cellrun language server over stdio (or IPC when the client asks for it), in Node.
import { readFileSync } from 'node:fs'
import { createConnection, ProposedFeatures } from 'vscode-languageserver/node'
import { startServer } from './server'

// The server sends some requests to the client without waiting for the answer (`void` in
// server.ts: workspace/configuration, workspace/inlayHint/refresh). When the client answers one of
// them with an error, the promise rejects with no one to catch it, and Node ends the process on an
// unhandled rejection. Note it on stderr (the client's output channel) and carry on, as a web
// worker does in the browser. Not through `console`, which goes over the connection that may be
// the thing failing.
process.on('unhandledRejection', (reason) => {
  try {
    process.stderr.write(`cellrun-server: a request to the client failed and was ignored: ${reason instanceof Error ? reason.message : String(reason)}\n`)
  } catch {
    // stderr itself is gone: nothing left to tell.
  }
})

startServer(createConnection(ProposedFeatures.all), {
  readFile: (path) => {
    try {
      return readFileSync(path, 'utf8')
    } catch {
      return undefined
    }
  },
})
