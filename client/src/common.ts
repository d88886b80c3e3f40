// The client side shared by VS Code on the desktop (extension.ts, a Node language server) and in
// the browser (browser.ts, a web-worker language server): commands, the run preview, the status item.
// The `cellrun.trace.server` setting is read by vscode-languageclient from the client id 'cellrun'.
import * as vscode from 'vscode'
import { CloseAction, ErrorAction, State, type BaseLanguageClient, type LanguageClientOptions } from 'vscode-languageclient'
import { RestartPolicy, restartingErrorHandler } from './restart'

let client: BaseLanguageClient | undefined

/** Unexpected stops of the server (restart.ts decides); a restart notice waits for the server to run again. */
const restarts = new RestartPolicy()
let restartNotice: string | undefined

export const CLIENT_OPTIONS = (selector: LanguageClientOptions['documentSelector']): LanguageClientOptions => ({
  documentSelector: selector,
  errorHandler: restartingErrorHandler(
    restarts,
    { Restart: CloseAction.Restart, DoNotRestart: CloseAction.DoNotRestart, Continue: ErrorAction.Continue, Shutdown: ErrorAction.Shutdown },
    {
      restarting: (message) => (restartNotice = message),
      gaveUp: (message) => {
        restartNotice = undefined
        void vscode.window.showErrorMessage(message, 'Restart Server').then((pick) => {
          if (pick) void vscode.commands.executeCommand('cellrun.restartServer')
        })
      },
    },
  ),
})

/** Start the client made by `make`, and register what the extension offers around it. */
export async function activateWith(context: vscode.ExtensionContext, make: () => BaseLanguageClient): Promise<void> {
  client = make()
  const status = vscode.window.createStatusBarItem(vscode.StatusBarAlignment.Right, 100)
  status.name = 'Cellrun'
  status.command = 'cellrun.restartServer'
  const show = (text: string, tooltip: string) => {
    status.text = text
    status.tooltip = tooltip
  }
  show('$(sync~spin) Cellrun', 'Cellrun language server: starting')
  context.subscriptions.push(
    status,
    client.onDidChangeState((e) => {
      if (e.newState === State.Running) {
        show('$(beaker) Cellrun', 'Cellrun language server: running (click to restart)')
        if (restartNotice) void vscode.window.showWarningMessage(restartNotice)
        restartNotice = undefined
      } else if (e.newState === State.Starting) show('$(sync~spin) Cellrun', 'Cellrun language server: starting')
      else show('$(error) Cellrun', 'Cellrun language server: stopped (click to restart)')
    }),
    vscode.window.onDidChangeActiveTextEditor((e) => (e?.document.languageId === 'cellrun' ? status.show() : status.hide())),
    vscode.commands.registerCommand('cellrun.restartServer', async () => {
      if (!client) return
      restarts.reset()
      restartNotice = undefined
      await client.stop()
      await client.start()
      void vscode.window.showInformationMessage('Cellrun: language server restarted.')
    }),
    vscode.commands.registerCommand('cellrun.showPreview', () => showPreview(context)),
  )
  if (vscode.window.activeTextEditor?.document.languageId === 'cellrun') status.show()
  await client.start()
}

export async function deactivateClient(): Promise<void> {
  const c = client
  client = undefined
  await c?.stop()
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

