// What the client does when the language server stops without being asked to (a crash, a kill):
// restart it and say so, up to a limit, then stop restarting and say how to start it by hand.
// Pure (no `vscode`, only types from vscode-languageclient), so that test/client-restart.test.ts
// can run it with a fake clock; common.ts wires it to the LanguageClient and to VS Code's messages.
import type { CloseAction, CloseHandlerResult, ErrorAction, ErrorHandler, ErrorHandlerResult } from 'vscode-languageclient'

/** As vscode-languageclient's default: up to 4 restarts within 3 minutes. */
export const MAX_RESTARTS = 4
export const RESTART_WINDOW_MS = 3 * 60 * 1000

export const RESTART_COMMAND_TITLE = 'Cellrun: Restart Server'

export type RestartDecision = { restart: true; message: string } | { restart: false; message: string }

/** Counts unexpected stops in a sliding window and decides whether to restart. */
export class RestartPolicy {
  private stops: number[] = []

  constructor(
    private readonly now: () => number = Date.now,
    readonly maxRestarts = MAX_RESTARTS,
    readonly windowMs = RESTART_WINDOW_MS,
  ) {}

  /** The server stopped unexpectedly: restart it unless it already did so `maxRestarts` times within the window. */
  closed(): RestartDecision {
    const t = this.now()
    this.stops = this.stops.filter((s) => t - s < this.windowMs)
    this.stops.push(t)
    if (this.stops.length <= this.maxRestarts) {
      return { restart: true, message: 'Cellrun: the language server stopped unexpectedly and was restarted.' }
    }
    const minutes = Math.round(this.windowMs / 60_000)
    return {
      restart: false,
      message:
        `Cellrun: the language server stopped unexpectedly ${this.stops.length} times in ${minutes} minutes and will not be restarted again. ` +
        `Run "${RESTART_COMMAND_TITLE}" from the Command Palette (or click the Cellrun status bar item) to start it again.`,
    }
  }

  /** Errors on the connection: carry on for the first three, then shut down (the library's default). */
  error(count: number | undefined): 'continue' | 'shutdown' {
    return count !== undefined && count > 0 && count <= 3 ? 'continue' : 'shutdown'
  }

  /** The user restarted the server by hand: start counting afresh. */
  reset(): void {
    this.stops = []
  }
}

/** The enum values of vscode-languageclient, passed in so that this module does not load it (it needs `vscode`). */
export interface Actions {
  Restart: CloseAction
  DoNotRestart: CloseAction
  Continue: ErrorAction
  Shutdown: ErrorAction
}

/** How the user is told; both are called from the handler, neither may throw. */
export interface RestartNotices {
  /** The server is being restarted: tell the user once it runs again. */
  restarting(message: string): void
  /** The server will not be restarted: tell the user now, with a way to restart it. */
  gaveUp(message: string): void
}

/**
 * An ErrorHandler for LanguageClientOptions: `policy` decides, `notices` tells the user, and the
 * result says `handled` so that the library only logs the message in its output channel.
 */
export function restartingErrorHandler(policy: RestartPolicy, actions: Actions, notices: RestartNotices): ErrorHandler {
  return {
    error(_error, _message, count): ErrorHandlerResult {
      return { action: policy.error(count) === 'continue' ? actions.Continue : actions.Shutdown }
    },
    closed(): CloseHandlerResult {
      const d = policy.closed()
      if (d.restart) {
        notices.restarting(d.message)
        return { action: actions.Restart, message: d.message, handled: true }
      }
      notices.gaveUp(d.message)
      return { action: actions.DoNotRestart, message: d.message, handled: true }
    },
  }
}
