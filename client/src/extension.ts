// Thin VS Code client: starts the Cellrun language server (dist/server.js) and offers a restart command.
// The `cellrun.trace.server` setting is read by vscode-languageclient from the client id 'cellrun'.
import * as vscode from 'vscode'
import { LanguageClient, type LanguageClientOptions, type ServerOptions, TransportKind } from 'vscode-languageclient/node'

let client: LanguageClient | undefined

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  const serverModule = context.asAbsolutePath('dist/server.js')
  const serverOptions: ServerOptions = {
    run: { module: serverModule, transport: TransportKind.stdio },
    debug: {
      module: serverModule,
      transport: TransportKind.stdio,
      options: { execArgv: ['--nolazy', '--inspect=6011'] },
    },
  }
  const clientOptions: LanguageClientOptions = {
    documentSelector: [
      { scheme: 'file', language: 'cellrun' },
      { scheme: 'untitled', language: 'cellrun' },
    ],
  }
  client = new LanguageClient('cellrun', 'Cellrun', serverOptions, clientOptions)

  context.subscriptions.push(
    vscode.commands.registerCommand('cellrun.restartServer', async () => {
      if (!client) return
      await client.restart()
      void vscode.window.showInformationMessage('Cellrun: language server restarted.')
    }),
  )

  await client.start()
}

export async function deactivate(): Promise<void> {
  const c = client
  client = undefined
  await c?.stop()
}
