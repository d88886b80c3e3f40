// `npm run bench`: how fast the analysis is, as ratios measured in one run (so that a busy machine
// shifts every figure alike), and the keystroke latency through the real language server over stdio.
// Not a test: it prints, it does not fail. Figures go into the README by hand.
//
//   npm run bench                 all of it
//   npm run bench -- --quick      smaller rounds (a minute or so)
//   node dist/bench.cjs --smoke   a few seconds, small sizes: that the benchmark itself still works
//                                 (test/bench.test.ts runs it; its figures mean nothing)
//
// What is compared (same content, see generate.ts):
//   split   `text.split('\n')`: the floor, nothing can read the text faster
//   yaml    the `yaml` package parsing the same protocol written as YAML (a general-purpose parser)
//   parse   Cellrun's parser alone
//   first   a full analysis with nothing kept from before (compiled expressions, formulas, engine
//           and simulation results all forgotten): what opening a file costs
//   edit    a full analysis after a one-character edit, with what the last analysis left (what
//           every keystroke costs in the editor)
import { spawn } from 'node:child_process'
import { existsSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { createMessageConnection, StreamMessageReader, StreamMessageWriter } from 'vscode-jsonrpc/node'
import YAML from 'yaml'
import { analyze, clearAnalysisCaches, type Analysis } from '../../server/src/core/analyze'
import { parse } from '../../server/src/core/parser'
import { generateProtocol } from './generate'

const smoke = process.argv.includes('--smoke')
const quick = smoke || process.argv.includes('--quick')
const gc = (globalThis as { gc?: () => void }).gc ?? (() => undefined)

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2
}
function quantile(xs: number[], q: number): number {
  const s = [...xs].sort((a, b) => a - b)
  return s[Math.min(s.length - 1, Math.floor(q * s.length))]
}
const ms = (x: number) => (x >= 100 ? x.toFixed(0) : x >= 10 ? x.toFixed(1) : x.toFixed(2))
const pad = (s: string | number, n: number) => String(s).padStart(n)

/** One character typed into the step on line `line` (an efficiency digit changed), then typed back. */
function editStep(text: string, round: number): string {
  const at = text.indexOf('efficiency 9', text.length >> 1) + 'efficiency '.length
  const next = round % 2 ? '9' : '8'
  return text.slice(0, at) + next + text.slice(at + 1)
}

function time(f: () => void): number {
  const t = performance.now()
  f()
  return performance.now() - t
}

// ------------------------------------------------------------------------------------------------
// 1. Whole-document analysis at four sizes.

interface Row {
  lines: number
  steps: number
  split: number
  yaml: number
  parse: number
  first: number
  /** The fastest and slowest first analysis over the rounds. */
  firstBest: number
  firstWorst: number
  edit: number
  retainedMB: number
  afterEditsMB: number
  rssMB: number
}

function measureSize(lines: number, rounds: number): Row {
  const g = generateProtocol(lines)
  const t: Record<'split' | 'yaml' | 'parse' | 'first' | 'edit', number[]> = { split: [], yaml: [], parse: [], first: [], edit: [] }
  let prev: Analysis | undefined
  let text = g.text
  for (let r = 0; r < rounds; r++) {
    // Interleaved, so that a slow moment of the machine falls on all of them alike.
    t.split.push(time(() => g.text.split('\n')))
    t.yaml.push(time(() => YAML.parse(g.yaml)))
    t.parse.push(time(() => parse(g.text)))
    clearAnalysisCaches()
    t.first.push(time(() => (prev = analyze(g.text))))
    text = g.text
    // Two edits: the first re-analysis fills what the edit changed; the second is the steady state.
    for (let k = 0; k < 2; k++) {
      const next = editStep(text, k)
      const took = time(() => (prev = analyze(next, {}, prev)))
      if (k === 1) t.edit.push(took)
      text = next
    }
  }
  // Memory: the heap an analysis keeps (the result and the caches it filled), and the process's RSS.
  clearAnalysisCaches()
  prev = undefined
  gc()
  gc()
  const before = process.memoryUsage().heapUsed
  const kept = analyze(g.text)
  gc()
  gc()
  const retained = process.memoryUsage().heapUsed - before
  const rss = process.memoryUsage().rss
  if (kept.tree.lines.length !== g.lines + 1) throw new Error(`generated ${g.lines} lines, analysed ${kept.tree.lines.length - 1}`)
  // And after 20 edits that each change the chemistry (a different step's efficiency each time):
  // what the caches hold once they are full.
  let after: Analysis = kept
  let edited = g.text
  for (let k = 0; k < 20; k++) {
    let found = edited.indexOf('efficiency ', Math.floor(((k + 1) * edited.length) / 22))
    if (found < 0) found = edited.indexOf('efficiency ')
    const at = found + 'efficiency '.length
    edited = edited.slice(0, at) + String(k % 9 + 1) + edited.slice(at + 1)
    after = analyze(edited, {}, after)
  }
  gc()
  gc()
  const retainedAfterEdits = process.memoryUsage().heapUsed - before
  if (after.tree.lines.length !== kept.tree.lines.length) throw new Error('an edit changed the line count')
  return {
    lines: g.lines,
    steps: g.steps,
    split: median(t.split),
    yaml: median(t.yaml),
    parse: median(t.parse),
    first: median(t.first),
    firstBest: Math.min(...t.first),
    firstWorst: Math.max(...t.first),
    edit: median(t.edit),
    // (a small document keeps less than the measurement's noise: shown as 0.0)
    retainedMB: Math.max(0, retained / 2 ** 20),
    afterEditsMB: Math.max(0, retainedAfterEdits / 2 ** 20),
    rssMB: rss / 2 ** 20,
  }
}

function sizes(): Row[] {
  // Warm the JIT on a small document first: the figures are for a server that has been running.
  for (let i = 0; i < (smoke ? 2 : 20); i++) {
    clearAnalysisCaches()
    analyze(generateProtocol(300).text)
  }
  const plan: [number, number][] = smoke
    ? [[100, 3], [1_000, 3]]
    : quick
    ? [[100, 15], [1_000, 9], [10_000, 5], [50_000, 3]]
    : [[100, 41], [1_000, 21], [10_000, 15], [50_000, 5]]
  const rows: Row[] = []
  for (const [n, rounds] of plan) rows.push(measureSize(n, rounds))
  return rows
}

function printSizes(rows: Row[]): void {
  console.log('Whole-document analysis (median ms; generated membrane-cell protocols, one step per 10 lines)')
  console.log('')
  console.log(`${pad('lines', 7)} ${pad('steps', 6)} ${pad('split', 7)} ${pad('yaml', 8)} ${pad('parse', 7)} ${pad('first', 8)} ${pad('edit', 7)}  ${pad('first/yaml', 10)} ${pad('parse/yaml', 10)} ${pad('first/split', 11)}  ${pad('heap kept', 9)} ${pad('…20 edits', 9)} ${pad('rss', 6)}`)
  for (const r of rows) {
    console.log(
      `${pad(r.lines, 7)} ${pad(r.steps, 6)} ${pad(ms(r.split), 7)} ${pad(ms(r.yaml), 8)} ${pad(ms(r.parse), 7)} ${pad(ms(r.first), 8)} ${pad(ms(r.edit), 7)}  ` +
        `${pad((r.first / r.yaml).toFixed(2) + '×', 10)} ${pad((r.parse / r.yaml).toFixed(2) + '×', 10)} ${pad((r.first / r.split).toFixed(0) + '×', 11)}  ${pad(r.retainedMB.toFixed(1) + ' MB', 9)} ${pad(r.afterEditsMB.toFixed(1) + ' MB', 9)} ${pad(r.rssMB.toFixed(0) + ' MB', 6)}`,
    )
  }
  console.log('')
  // The spread: a busy machine slows some rounds more than others (garbage collection, which runs
  // partly on a second thread, suffers most); the best round is the least disturbed.
  console.log('First analysis over the rounds (ms: best · median · worst)')
  for (const r of rows) console.log(`${pad(r.lines, 7)}  ${ms(r.firstBest)} · ${ms(r.first)} · ${ms(r.firstWorst)}`)
  console.log('')
  // Linear scaling: the cost per 1,000 lines should not grow with the document.
  const base = rows.find((r) => r.lines === 1_000)!
  const per = (r: Row, k: 'first' | 'edit' | 'parse') => (r[k] / r.lines) * 1000
  console.log('Scaling (cost per 1,000 lines, relative to the 1,000-line document; 1.00 = linear)')
  for (const r of rows) {
    console.log(`${pad(r.lines, 7)}  first ${pad((per(r, 'first') / per(base, 'first')).toFixed(2), 5)}  edit ${pad((per(r, 'edit') / per(base, 'edit')).toFixed(2), 5)}  parse ${pad((per(r, 'parse') / per(base, 'parse')).toFixed(2), 5)}`)
  }
  console.log('')
}

// ------------------------------------------------------------------------------------------------
// 2. Keystroke latency through the real server over stdio.

async function keystrokes(): Promise<void> {
  const server = join(process.cwd(), 'dist', 'server.js')
  if (!existsSync(server)) throw new Error('dist/server.js is missing: run `npm run build` first')
  const child = spawn(process.execPath, [server, '--stdio'], { stdio: ['pipe', 'pipe', 'pipe'] })
  const conn = createMessageConnection(new StreamMessageReader(child.stdout), new StreamMessageWriter(child.stdin))
  const waiting = new Map<number, () => void>()
  conn.onNotification('textDocument/publishDiagnostics', (p: { version?: number }) => {
    if (p.version !== undefined) waiting.get(p.version)?.()
  })
  conn.onNotification(() => undefined)
  conn.onRequest(() => null)
  conn.listen()
  await conn.sendRequest('initialize', { processId: process.pid, rootUri: null, capabilities: { textDocument: { inlayHint: {}, publishDiagnostics: { versionSupport: true } } } })
  conn.sendNotification('initialized', {})
  const idleRss = rssOf(child.pid)

  const g = generateProtocol(1_000)
  const uri = 'file:///bench/generated-1000.cellrun'
  let version = 1
  const opened = new Promise<void>((resolve) => waiting.set(1, resolve))
  conn.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'cellrun', version, text: g.text } })
  await opened

  const lines = g.text.split('\n')
  /** The position of one character to type over, in a step line (chemistry changes) or a note (it does not). */
  const stepLine = lines.findIndex((l, i) => i > 500 && l.startsWith('step '))
  const noteLine = lines.findIndex((l, i) => i > 500 && l.startsWith('note Sample'))
  const stepChar = lines[stepLine].indexOf('efficiency 9') + 'efficiency '.length
  const noteChar = lines[noteLine].indexOf('taken')

  async function typeAt(line: number, character: number, round: number): Promise<number> {
    version++
    const text = line === stepLine ? (round % 2 ? '9' : '8') : round % 2 ? 't' : 'T'
    const done = new Promise<void>((resolve) => waiting.set(version, resolve))
    const t0 = performance.now()
    conn.sendNotification('textDocument/didChange', {
      textDocument: { uri, version },
      contentChanges: [{ range: { start: { line, character }, end: { line, character: character + 1 } }, text }],
    })
    await done
    // The hints for a screenful around the edit, as the editor asks for them after the diagnostics.
    const hints = await conn.sendRequest<unknown[]>('textDocument/inlayHint', {
      textDocument: { uri },
      range: { start: { line: Math.max(0, line - 30), character: 0 }, end: { line: line + 30, character: 0 } },
    })
    const took = performance.now() - t0
    waiting.delete(version)
    if (!Array.isArray(hints) || hints.length === 0) throw new Error('no inlay hints came back')
    return took
  }

  const rounds = smoke ? 5 : quick ? 41 : 101
  const floor: number[] = []
  const note: number[] = []
  const step: number[] = []
  const warm = smoke ? 2 : 10
  for (let r = 0; r < rounds + warm; r++) {
    const t0 = performance.now()
    await conn.sendRequest('cellrun/no-such-method').catch(() => undefined)
    const f = performance.now() - t0
    const n = await typeAt(noteLine, noteChar, r)
    const s = await typeAt(stepLine, stepChar, r)
    if (r >= warm) {
      floor.push(f)
      note.push(n)
      step.push(s)
    }
  }
  console.log('Keystroke latency on a 1,000-line protocol (real server over stdio: didChange → diagnostics → inlay hints for 60 lines)')
  console.log('')
  console.log(`${pad('', 22)} ${pad('median', 8)} ${pad('p90', 8)} ${pad('÷ floor', 8)}`)
  const row = (name: string, xs: number[]) =>
    console.log(`${name.padEnd(22)} ${pad(ms(median(xs)) + ' ms', 8)} ${pad(ms(quantile(xs, 0.9)) + ' ms', 8)} ${pad((median(xs) / median(floor)).toFixed(1) + '×', 8)}`)
  row('floor (empty request)', floor)
  row('typing in a note', note)
  row('typing in a step', step)
  console.log('')

  // The server's memory: idle, with the 1,000-line document, and with a 10,000-line one as well.
  const with1k = rssOf(child.pid)
  const big = generateProtocol(smoke ? 2_000 : 10_000)
  const bigOpened = new Promise<void>((resolve) => waiting.set(1_000_000, resolve))
  conn.sendNotification('textDocument/didOpen', { textDocument: { uri: 'file:///bench/generated-10000.cellrun', languageId: 'cellrun', version: 1_000_000, text: big.text } })
  await bigOpened
  const with10k = rssOf(child.pid)
  console.log('Language server memory (resident set, from /proc)')
  console.log('')
  console.log(`idle after start           ${pad(idleRss?.toFixed(0) ?? '?', 5)} MB`)
  console.log(`with the 1,000-line file   ${pad(with1k?.toFixed(0) ?? '?', 5)} MB`)
  const bigName = `${big.lines.toLocaleString('en-US')}-line file`
  console.log(`and a ${bigName.padEnd(21)}${pad(with10k?.toFixed(0) ?? '?', 5)} MB  (the ${bigName} adds ${with10k !== undefined && with1k !== undefined ? (with10k - with1k).toFixed(0) : '?'} MB)`)
  console.log('')
  conn.dispose()
  child.kill()
}

/** Resident set size of a process in MB (Linux /proc), or undefined elsewhere. */
function rssOf(pid: number | undefined): number | undefined {
  try {
    const status = readFileSync(`/proc/${pid}/status`, 'utf8')
    const kb = /VmRSS:\s+(\d+)\s+kB/.exec(status)
    return kb ? Number(kb[1]) / 1024 : undefined
  } catch {
    return undefined
  }
}

async function main(): Promise<void> {
  console.log(`Cellrun benchmark, node ${process.version}, ${smoke ? 'smoke' : quick ? 'quick' : 'full'} rounds`)
  console.log('')
  printSizes(sizes())
  await keystrokes()
}

main().catch((e) => {
  console.error(e)
  process.exit(1)
})
