// The full fuzz run (`npm run fuzz`): N mutated documents (mutations of every examples/*.cellrun,
// grammar-shaped protocols and mutations of those) through the whole analysis and the invariant
// checks of test/fuzz/invariants.ts. The vitest suite runs a CI-sized subset of the same property.
//
//   npm run fuzz                              100,000 documents, a random seed
//   npm run fuzz -- --runs 5000 --seed 42     fewer, reproducibly
//   npm run fuzz -- --seed 42 --path 17:3:0   replay a failure (the seed and path it printed)
//
// Bundled by `node esbuild.mjs fuzz` to dist/fuzz.cjs. Exit 0: no failure; 1: a failure (the shrunk
// counterexample is printed and written to dist/fuzz-counterexample.cellrun); 2: bad arguments.
import { existsSync, mkdirSync, writeFileSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import * as fc from 'fast-check'
import { fuzzDocument, loadExamples } from './generators'
import { checkAll } from './invariants'

interface Options {
  runs: number
  seed: number
  path?: string
  examples: string
}

const USAGE = 'usage: node dist/fuzz.cjs [--runs N] [--seed S] [--path P] [--examples DIR]'

function parseArgs(argv: string[]): Options {
  // dist/fuzz.cjs sits one level below the repository root; fall back to the working directory.
  const beside = resolve(dirname(process.argv[1] ?? '.'), '..', 'examples')
  const opts: Options = {
    runs: 100_000,
    seed: (Date.now() ^ (Math.random() * 0x7fffffff)) | 0,
    examples: existsSync(beside) ? beside : resolve('examples'),
  }
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]
    const value = () => {
      const v = argv[++i]
      if (v === undefined) usage(`${a} needs a value`)
      return v
    }
    const int = (v: string, what: string) => {
      const n = Number(v.replace(/_/g, ''))
      if (!Number.isInteger(n)) usage(`${what} must be an integer, not \`${v}\``)
      return n
    }
    if (a === '--runs') {
      opts.runs = int(value(), '--runs')
      if (opts.runs < 1) usage('--runs must be at least 1')
    } else if (a === '--seed') opts.seed = int(value(), '--seed') | 0
    else if (a === '--path') opts.path = value()
    else if (a === '--examples') opts.examples = resolve(value())
    else if (a === '--help' || a === '-h') {
      console.log(USAGE)
      process.exit(0)
    } else usage(`unknown argument \`${a}\``)
  }
  return opts
}

function usage(message: string): never {
  console.error(`fuzz: ${message}\n${USAGE}`)
  process.exit(2)
}

const num = (n: number) => Math.round(n).toLocaleString('en-US')

function main(): void {
  const opts = parseArgs(process.argv.slice(2))
  const examples = loadExamples(opts.examples)
  if (examples.length === 0) usage(`no *.cellrun files in ${opts.examples}`)
  console.log(
    opts.path
      ? `fuzz: replaying seed ${opts.seed}, path ${opts.path}`
      : `fuzz: ${num(opts.runs)} documents, seed ${opts.seed}; mutating ${examples.map((e) => e.name).join(', ')} and grammar-shaped protocols`,
  )

  let calls = 0
  let slowest = { ms: 0, length: 0, call: 0 }
  const started = performance.now()
  let lastReport = started
  const property = fc.property(fuzzDocument(examples), (text) => {
    calls++
    const t0 = performance.now()
    try {
      checkAll(text)
    } finally {
      const t1 = performance.now()
      if (t1 - t0 > slowest.ms) slowest = { ms: t1 - t0, length: text.length, call: calls }
      if (t1 - lastReport >= 5000) {
        lastReport = t1
        const secs = (t1 - started) / 1000
        const phase = calls > opts.runs ? ' (shrinking a failure)' : ''
        console.log(
          `  ${num(Math.min(calls, opts.runs)).padStart(9)} / ${num(opts.runs)}  ${secs.toFixed(0).padStart(4)} s  ` +
            `${num(calls / secs)} runs/s  slowest ${slowest.ms.toFixed(1)} ms${phase}`,
        )
      }
    }
  })

  const details = fc.check(property, { numRuns: opts.runs, seed: opts.seed, ...(opts.path ? { path: opts.path } : {}) })
  const secs = (performance.now() - started) / 1000

  if (!details.failed) {
    if (details.numRuns !== opts.runs && !opts.path) {
      console.error(`fuzz: fast-check ran ${details.numRuns} of ${opts.runs} documents (${details.numSkips} skipped)`)
      process.exit(1)
    }
    console.log(
      `fuzz: ${num(details.numRuns)} documents, no failure, in ${secs.toFixed(1)} s ` +
        `(${num(details.numRuns / secs)} runs/s; slowest analysis ${slowest.ms.toFixed(1)} ms on a ${num(slowest.length)}-character document); seed ${opts.seed}`,
    )
    return
  }

  const text = details.counterexample ? String(details.counterexample[0]) : ''
  const error = details.errorInstance
  const message = error instanceof Error ? (error.stack ?? error.message) : String(error)
  const out = join(dirname(opts.examples), 'dist', 'fuzz-counterexample.cellrun')
  let saved = ''
  try {
    mkdirSync(dirname(out), { recursive: true })
    writeFileSync(out, text)
    saved = `written to ${out}`
  } catch (e) {
    saved = `could not be written to ${out}: ${e instanceof Error ? e.message : String(e)}`
  }
  console.error(
    [
      '',
      `fuzz: FAILED after ${num(details.numRuns)} documents and ${num(details.numShrinks)} shrinks, in ${secs.toFixed(1)} s`,
      `seed ${details.seed}, path ${details.counterexamplePath}`,
      `replay: npm run fuzz -- --seed ${details.seed} --path ${details.counterexamplePath}`,
      '',
      `shrunk counterexample (${text.length} characters; ${saved}), as a JSON string:`,
      JSON.stringify(text),
      '',
      'as text, line by line:',
      ...text.split(/\r\n|\r|\n/).map((l, i) => `${String(i + 1).padStart(4)} | ${l}`),
      '',
      'error:',
      message,
    ].join('\n'),
  )
  process.exit(1)
}

main()
