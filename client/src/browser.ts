// VS Code in the browser: the Cellrun language server runs in a web worker (dist/browser/server.js).
import * as vscode from 'vscode'
import { LanguageClient } from 'vscode-languageclient/browser'
import { activateWith, CLIENT_OPTIONS, deactivateClient } from './common'

// The web-worker constructor of the browser host (this project compiles without the DOM library).
declare const Worker: new (url: string) => ConstructorParameters<typeof LanguageClient>[3]

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  const worker = new Worker(vscode.Uri.joinPath(context.extensionUri, 'dist/browser/server.js').toString(true))
  await activateWith(context, () => new LanguageClient('cellrun', 'Cellrun', CLIENT_OPTIONS([{ language: 'cellrun' }]), worker))
}

export const deactivate = deactivateClient
