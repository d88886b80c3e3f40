// VS Code on the desktop: the Cellrun language server runs in Node (dist/server.js) over stdio.
import type * as vscode from 'vscode'
import { LanguageClient, TransportKind, type ServerOptions } from 'vscode-languageclient/node'
import { activateWith, CLIENT_OPTIONS, deactivateClient } from './common'

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  const serverModule = context.asAbsolutePath('dist/server.js')
  const serverOptions: ServerOptions = {
    run: { module: serverModule, transport: TransportKind.stdio },
    debug: { module: serverModule, transport: TransportKind.stdio, options: { execArgv: ['--nolazy', '--inspect=6011'] } },
  }
  const options = CLIENT_OPTIONS([
    { scheme: 'file', language: 'cellrun' },
    { scheme: 'untitled', language: 'cellrun' },
  ])
  await activateWith(context, () => new LanguageClient('cellrun', 'Cellrun', serverOptions, options))
}

export const deactivate = deactivateClient
