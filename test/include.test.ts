// Shared definitions: `include` takes named values and a house cell from a file in the workspace;
// the language server analyses the documents that include a file again when it changes.
import { spawn } from 'node:child_process'
import { describe, expect, it } from 'vitest'
import { createMessageConnection, StreamMessageReader, StreamMessageWriter } from 'vscode-jsonrpc/node'
import { DidChangeTextDocumentNotification, DidOpenTextDocumentNotification, InitializeRequest, InitializedNotification, PublishDiagnosticsNotification, type PublishDiagnosticsParams } from 'vscode-languageserver-protocol'
import { analyze } from '../server/src/core/analyze'
import { completionsAt } from '../server/src/core/complete'
import { ensureBuilt, SERVER } from './support/lsp-server'

const HOUSE = [
  'let area = 50 cm^2',
  'cell',
  '  compartment feed 500 mL',
  '  compartment product 250 mL',
  '  separator cation-exchange between feed and product, area area',
  '  anode mmo-titanium in feed, area area',
  '  cathode nickel in product, area area',
  '',
].join('\n')
const RUN = ['include "house/cell.cellrun"', 'charge feed: K2CO3 180 g, water 420 mL', 'step 1: current 100 mA/cm^2 * area for 6 h', ''].join('\n')

const files: Record<string, string> = { '/ws/house/cell.cellrun': HOUSE, '/ws/run.cellrun': RUN }
const includes = { file: '/ws/run.cellrun', root: '/ws', read: (p: string) => files[p] }

describe('include', () => {
  it('brings in the house cell and its values', () => {
    const a = analyze(RUN, { includes })
    expect(a.diagnostics.filter((d) => d.severity === 'error')).toEqual([])
    expect(a.model.compartments.has('feed')).toBe(true)
    // 100 mA/cm² × 50 cm² = 5 A; 5 A × 6 h = 30 A·h (arithmetic)
    expect(a.model.steps[0].currentA).toBeCloseTo(5, 12)
    expect(a.model.totals.chargeC / 3600).toBeCloseTo(30, 9)
    expect(a.includedFiles).toEqual(['/ws/house/cell.cellrun'])
    // Nothing computed or reported points past the document's own text.
    for (const c of a.computed) expect(c.anchor).toBeLessThanOrEqual(RUN.length)
    for (const d of a.diagnostics) expect(d.span.end).toBeLessThanOrEqual(RUN.length)
  })

  it('offers the house materials of an included file after `anode`', () => {
    const defs: Record<string, string> = { '/ws/house.cellrun': 'material house-mmo: Ti mesh, RuO2/IrO2 coat, batch 2025-11\n' }
    const text = 'include "house.cellrun"\ncell\n  compartment a 1 L\n  anode \n'
    const a = analyze(text, { includes: { file: '/ws/r.cellrun', root: '/ws', read: (p) => defs[p] } })
    const items = completionsAt(a, text.indexOf('anode ') + 'anode '.length)
    expect(items[0].label).toBe('house-mmo')
    expect(items[0].documentation).toContain('RuO2/IrO2')
  })

  it('without the include the names are unknown (so the include is what defines them)', () => {
    const a = analyze(RUN.replace('include "house/cell.cellrun"\n', ''))
    expect(a.diagnostics.some((d) => d.code === 'unknown-name')).toBe(true)
  })

  it('the language server re-analyses an including document when the definitions file changes', async () => {
    ensureBuilt()
    const child = spawn(process.execPath, [SERVER, '--stdio'], { stdio: ['pipe', 'pipe', 'pipe'] })
    const conn = createMessageConnection(new StreamMessageReader(child.stdout), new StreamMessageWriter(child.stdin))
    const published: PublishDiagnosticsParams[] = []
    conn.onNotification(PublishDiagnosticsNotification.type, (p) => {
      published.push(p)
    })
    conn.onNotification(() => undefined)
    conn.listen()
    try {
      await conn.sendRequest(InitializeRequest.type, { processId: null, rootUri: 'file:///ws', capabilities: {}, workspaceFolders: [{ uri: 'file:///ws', name: 'ws' }] })
      await conn.sendNotification(InitializedNotification.type, {})
      const houseUri = 'file:///ws/house/cell.cellrun'
      const runUri = 'file:///ws/run.cellrun'
      await conn.sendNotification(DidOpenTextDocumentNotification.type, { textDocument: { uri: houseUri, languageId: 'cellrun', version: 1, text: HOUSE } })
      await conn.sendNotification(DidOpenTextDocumentNotification.type, { textDocument: { uri: runUri, languageId: 'cellrun', version: 1, text: RUN } })
      const wait = async (pred: () => boolean) => {
        for (let i = 0; i < 200 && !pred(); i++) await new Promise((r) => setTimeout(r, 25))
        expect(pred()).toBe(true)
      }
      const forRun = () => published.filter((p) => p.uri === runUri)
      await wait(() => forRun().length > 0)
      expect(forRun().at(-1)!.diagnostics.filter((d) => d.severity === 1)).toEqual([])
      // Rename the compartment in the house file: the run's `charge feed:` now names nothing.
      const before = forRun().length
      await conn.sendNotification(DidChangeTextDocumentNotification.type, {
        textDocument: { uri: houseUri, version: 2 },
        contentChanges: [{ text: HOUSE.replace(/feed/g, 'anolyte') }],
      })
      await wait(() => forRun().length > before)
      expect(forRun().at(-1)!.diagnostics.some((d) => d.code === 'unknown-name')).toBe(true)
    } finally {
      conn.dispose()
      child.kill('SIGKILL')
    }
  }, 20_000)
})
