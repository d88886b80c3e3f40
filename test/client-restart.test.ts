// The client's answer to a language server that stops unexpectedly (client/src/restart.ts): restart
// it and tell the user, at most 4 times within 3 minutes; after that, stop restarting and say how to
// start it by hand. The policy runs here on a fake clock; the error handler built from it is what
// common.ts gives vscode-languageclient (the end-to-end check is in test/e2e/code-server.mjs).
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import type { CloseAction, ErrorAction } from 'vscode-languageclient'
import { MAX_RESTARTS, RESTART_WINDOW_MS, RestartPolicy, restartingErrorHandler } from '../client/src/restart'
import { ROOT } from './support/lsp-server'

/** A clock the test moves by hand. */
function fakeClock(start = 1_000_000) {
  let t = start
  return { now: () => t, advance: (ms: number) => (t += ms) }
}

const MINUTE = 60_000
// vscode-languageclient's own enum values (CloseAction.DoNotRestart = 1, Restart = 2; ErrorAction
// Continue = 1, Shutdown = 2). They cannot be imported at run time here: the library loads `vscode`.
const ACTIONS = { DoNotRestart: 1 as CloseAction, Restart: 2 as CloseAction, Continue: 1 as ErrorAction, Shutdown: 2 as ErrorAction }

describe('RestartPolicy', () => {
  it('has the library default limits: 4 restarts within 3 minutes', () => {
    expect(MAX_RESTARTS).toBe(4)
    expect(RESTART_WINDOW_MS).toBe(3 * MINUTE)
  })

  it('restarts after each of the first 4 unexpected stops, and says so', () => {
    const clock = fakeClock()
    const policy = new RestartPolicy(clock.now)
    for (let i = 1; i <= 4; i++) {
      const d = policy.closed()
      expect(d.restart, `stop ${i}`).toBe(true)
      expect(d.message).toBe('Cellrun: the language server stopped unexpectedly and was restarted.')
      clock.advance(10_000)
    }
  })

  it('gives up on the 5th stop within 3 minutes, and names the command that starts it again', () => {
    const clock = fakeClock()
    const policy = new RestartPolicy(clock.now)
    for (let i = 0; i < 4; i++) {
      expect(policy.closed().restart).toBe(true)
      clock.advance(30_000)
    }
    // First stop at 0 s, fifth at 120 s: all five inside the 3-minute window.
    const d = policy.closed()
    expect(d.restart).toBe(false)
    expect(d.message).toContain('stopped unexpectedly 5 times in 3 minutes')
    expect(d.message).toContain('will not be restarted again')
    expect(d.message).toContain('"Cellrun: Restart Server"')
    // It stays given up for further stops inside the window.
    clock.advance(1000)
    expect(policy.closed().restart).toBe(false)
  })

  it('the window slides: stops older than 3 minutes no longer count', () => {
    const clock = fakeClock()
    const policy = new RestartPolicy(clock.now)
    // Four stops at 0, 1, 2 and 3 minutes less a second: all restarted.
    for (const at of [0, MINUTE, 2 * MINUTE, 3 * MINUTE - 1000]) {
      clock.advance(at - (clock.now() - 1_000_000))
      expect(policy.closed().restart).toBe(true)
    }
    // At 3 min + 1 s the stop at 0 is out of the window: 4 stops in it, so restart again.
    clock.advance(2000)
    expect(policy.closed().restart).toBe(true)
    // One second later the window (from 1 min) holds 1, 2, 3-, 3+ and now: 5 stops, give up.
    clock.advance(1000)
    expect(policy.closed().restart).toBe(false)
  })

  it('a stop exactly 3 minutes after another no longer counts it', () => {
    const clock = fakeClock()
    const policy = new RestartPolicy(clock.now)
    for (let i = 0; i < 4; i++) expect(policy.closed().restart).toBe(true)
    // Four stops at t = 0; the fifth exactly at the window's length: the first four have left it.
    clock.advance(RESTART_WINDOW_MS)
    expect(policy.closed().restart).toBe(true)
  })

  it('reset() (the user restarted the server by hand) gives it a fresh budget', () => {
    const clock = fakeClock()
    const policy = new RestartPolicy(clock.now)
    for (let i = 0; i < 5; i++) policy.closed()
    expect(policy.closed().restart).toBe(false)
    policy.reset()
    for (let i = 0; i < 4; i++) expect(policy.closed().restart).toBe(true)
    expect(policy.closed().restart).toBe(false)
  })

  it('honours other limits given to it', () => {
    const clock = fakeClock()
    const policy = new RestartPolicy(clock.now, 1, 10 * MINUTE)
    expect(policy.closed().restart).toBe(true)
    const d = policy.closed()
    expect(d.restart).toBe(false)
    expect(d.message).toContain('2 times in 10 minutes')
  })

  it('connection errors: continue for the first three, then shut down (the library default)', () => {
    const policy = new RestartPolicy()
    expect([1, 2, 3].map((n) => policy.error(n))).toEqual(['continue', 'continue', 'continue'])
    expect(policy.error(4)).toBe('shutdown')
    expect(policy.error(undefined)).toBe('shutdown')
  })
})

describe('restartingErrorHandler', () => {
  function setup() {
    const clock = fakeClock()
    const told: { restarting: string[]; gaveUp: string[] } = { restarting: [], gaveUp: [] }
    const handler = restartingErrorHandler(new RestartPolicy(clock.now), ACTIONS, {
      restarting: (m) => told.restarting.push(m),
      gaveUp: (m) => told.gaveUp.push(m),
    })
    return { clock, told, handler }
  }

  it('closed(): Restart with the message, marked handled so the library does not show its own', async () => {
    const { told, handler } = setup()
    const r = await handler.closed()
    expect(r).toEqual({ action: ACTIONS.Restart, message: 'Cellrun: the language server stopped unexpectedly and was restarted.', handled: true })
    // The user is told (common.ts shows it once the server runs again), and nothing about giving up.
    expect(told.restarting).toEqual([r.message])
    expect(told.gaveUp).toEqual([])
  })

  it('closed() the 5th time in 3 minutes: DoNotRestart, and the user is told how to restart', async () => {
    const { told, handler, clock } = setup()
    for (let i = 0; i < 4; i++) {
      expect((await handler.closed()).action).toBe(ACTIONS.Restart)
      clock.advance(5000)
    }
    const r = await handler.closed()
    expect(r.action).toBe(ACTIONS.DoNotRestart)
    expect(r.handled).toBe(true)
    expect(told.restarting).toHaveLength(4)
    expect(told.gaveUp).toEqual([r.message])
    expect(r.message).toContain('Cellrun: Restart Server')
  })

  it('error(): Continue for the first three errors, Shutdown after', async () => {
    const { handler } = setup()
    const e = new Error('write EPIPE')
    expect((await handler.error(e, undefined, 1)).action).toBe(ACTIONS.Continue)
    expect((await handler.error(e, undefined, 3)).action).toBe(ACTIONS.Continue)
    expect((await handler.error(e, undefined, 4)).action).toBe(ACTIONS.Shutdown)
  })

  it('common.ts installs it: CLIENT_OPTIONS carries this error handler and the enum values of the library', () => {
    // common.ts loads `vscode` and cannot run here; check the wiring in its source instead.
    const src = readFileSync(join(ROOT, 'client', 'src', 'common.ts'), 'utf8')
    expect(src).toMatch(/errorHandler: restartingErrorHandler\(/)
    expect(src).toMatch(/Restart: CloseAction\.Restart, DoNotRestart: CloseAction\.DoNotRestart, Continue: ErrorAction\.Continue, Shutdown: ErrorAction\.Shutdown/)
    // And the values assumed above are the library's (its compiled enums).
    const lib = readFileSync(join(ROOT, 'node_modules', 'vscode-languageclient', 'lib', 'common', 'client.js'), 'utf8')
    expect(lib).toMatch(/CloseAction\[CloseAction\["DoNotRestart"\] = 1\]/)
    expect(lib).toMatch(/CloseAction\[CloseAction\["Restart"\] = 2\]/)
    expect(lib).toMatch(/ErrorAction\[ErrorAction\["Continue"\] = 1\]/)
    expect(lib).toMatch(/ErrorAction\[ErrorAction\["Shutdown"\] = 2\]/)
  })

  it('restart.ts does not load vscode or the language client at run time (only types)', () => {
    const src = readFileSync(join(ROOT, 'client', 'src', 'restart.ts'), 'utf8')
    const imports = [...src.matchAll(/^import (type )?.* from '([^']+)'/gm)]
    for (const m of imports) expect(m[1], `restart.ts imports ${m[2]} at run time`).toBe('type ')
  })
})
