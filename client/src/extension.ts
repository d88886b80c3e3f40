// Thin VS Code client: starts the Cellrun language server (dist/server.js) and offers a restart
// command and the run preview (a webview whose HTML the server renders: `cellrun/preview`).
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
    vscode.commands.registerCommand('cellrun.showPreview', () => showPreview(context)),
  )

  await client.start()
}

// ---- run preview: one panel beside the editor, following the active cellrun document ----------

let panel: vscode.WebviewPanel | undefined
let previewUri: vscode.Uri | undefined
let timer: ReturnType<typeof setTimeout> | undefined

function showPreview(context: vscode.ExtensionContext): void {
  const editor = vscode.window.activeTextEditor
  if (editor?.document.languageId !== 'cellrun') {
    void vscode.window.showInformationMessage('Cellrun: open a .cellrun protocol to preview its run.')
    return
  }
  previewUri = editor.document.uri
  if (panel) {
    panel.reveal(vscode.ViewColumn.Beside, true)
  } else {
    // No scripts and no local resources: the page is static HTML with inline styles.
    panel = vscode.window.createWebviewPanel('cellrun.preview', 'Cellrun Preview', { viewColumn: vscode.ViewColumn.Beside, preserveFocus: true }, { enableScripts: false, localResourceRoots: [] })
    const subs = [
      vscode.workspace.onDidChangeTextDocument((e) => {
        if (e.document.uri.toString() === previewUri?.toString()) schedule(300)
      }),
      vscode.window.onDidChangeActiveTextEditor((e) => {
        if (e?.document.languageId === 'cellrun' && e.document.uri.toString() !== previewUri?.toString()) {
          previewUri = e.document.uri
          schedule(0)
        }
      }),
    ]
    panel.onDidDispose(() => {
      subs.forEach((d) => d.dispose())
      clearTimeout(timer)
      panel = undefined
    })
    context.subscriptions.push(panel)
  }
  schedule(0)
}

function schedule(ms: number): void {
  clearTimeout(timer)
  timer = setTimeout(() => void refresh(), ms)
}

async function refresh(): Promise<void> {
  const uri = previewUri
  if (!panel || !uri || !client) return
  try {
    const { html } = await client.sendRequest<{ html: string }>('cellrun/preview', { uri: uri.toString() })
    // A later edit or editor switch may have started another request; show only the latest.
    if (panel && uri === previewUri) {
      panel.title = `Preview ${uri.path.replace(/^.*\//, '')}`
      panel.webview.html = html
    }
  } catch (e) {
    void vscode.window.showWarningMessage(`Cellrun preview: ${e instanceof Error ? e.message : String(e)}`)
  }
}

export async function deactivate(): Promise<void> {
  const c = client
  client = undefined
  await c?.stop()
}
