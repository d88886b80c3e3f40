// The Cellrun command line: `cellrun check FILE...` and `cellrun annotate FILE...`.
// A thin layer over the same analysis core as the language server.
import { readFileSync } from 'node:fs'
import { analyze } from '../core/analyze'
import type { Severity } from '../core/diagnostics'
import { annotate, diagnosticLines, jsonReport } from '../core/report'
import { RULES } from '../rules'

const USAGE = `usage:
  cellrun check [--format text|json] FILE...   report diagnostics; exit 1 when any is an error
  cellrun annotate FILE...                     print each line with its computed values
  cellrun explain [CODE]                       a rule's full text; without CODE, the list of rules
Options:
  --efficiency-floor PERCENT   report a simulated step efficiency below this (default 80)
  --rule CODE=SEVERITY         error | warning | information | off, for one rule (repeatable)
  cellrun --help | --version

Diagnostics print as FILE:LINE:COLUMN: error|warning|note: MESSAGE [CODE] (1-based).
Exit codes: 0 no errors, 1 errors found, 2 usage or file problems.`

export function run(argv: string[], out: (s: string) => void, err: (s: string) => void): number {
  const args = [...argv]
  const cmd = args.shift()
  if (!cmd || cmd === '--help' || cmd === '-h' || cmd === 'help') {
    out(USAGE)
    return cmd ? 0 : 2
  }
  if (cmd === '--version') {
    out('cellrun 0.1.0')
    return 0
  }
  if (cmd === 'explain') return explain(args[0], out, err)
  if (cmd !== 'check' && cmd !== 'annotate') {
    err(`cellrun: unknown command '${cmd}'\n${USAGE}`)
    return 2
  }
  let format = 'text'
  let floor = 80
  const severities: Record<string, Severity | 'off'> = {}
  const files: string[] = []
  for (let i = 0; i < args.length; i++) {
    const a = args[i]
    if (a === '--efficiency-floor' || a.startsWith('--efficiency-floor=')) {
      const v = Number(a.includes('=') ? a.slice(a.indexOf('=') + 1) : args[++i])
      if (!(v >= 0 && v <= 100)) {
        err('cellrun: --efficiency-floor takes a percentage from 0 to 100')
        return 2
      }
      floor = v
    } else if (a === '--rule' || a.startsWith('--rule=')) {
      const v = a.includes('=') && a.startsWith('--rule=') ? a.slice('--rule='.length) : args[++i] ?? ''
      const m = /^([a-z0-9-]+)=(error|warning|information|off)$/.exec(v)
      if (!m || !RULES.some((r) => r.code === m[1])) {
        err(`cellrun: --rule takes CODE=error|warning|information|off with a known rule code (see 'cellrun explain')`)
        return 2
      }
      severities[m[1]] = m[2] as Severity | 'off'
    } else if (a === '--format') format = args[++i] ?? ''
    else if (a.startsWith('--format=')) format = a.slice('--format='.length)
    else if (a.startsWith('-')) {
      err(`cellrun: unknown option '${a}'`)
      return 2
    } else files.push(a)
  }
  if (format !== 'text' && format !== 'json') {
    err(`cellrun: --format must be text or json`)
    return 2
  }
  if (files.length === 0) {
    err(`cellrun: no files given\n${USAGE}`)
    return 2
  }
  let errors = 0
  let unreadable = 0
  const reports = []
  for (const file of files) {
    let text: string
    try {
      text = readFileSync(file, 'utf8')
    } catch (e) {
      err(`cellrun: cannot read ${file}: ${e instanceof Error ? e.message : String(e)}`)
      unreadable++
      continue
    }
    const a = analyze(text, { efficiencyFloor: floor / 100, severities })
    errors += a.diagnostics.filter((d) => d.severity === 'error').length
    if (cmd === 'annotate') out(annotate(a, file))
    else if (format === 'json') reports.push(jsonReport(a, file))
    else for (const l of diagnosticLines(a, file)) out(l)
  }
  if (cmd === 'check' && format === 'json') out(JSON.stringify({ files: reports }, null, 2))
  if (unreadable > 0) return 2
  return cmd === 'check' && errors > 0 ? 1 : 0
}

/** `cellrun explain CODE`: a rule's full text; without a code, the list. */
function explain(code: string | undefined, out: (s: string) => void, err: (s: string) => void): number {
  if (!code) {
    for (const r of RULES) out(`${r.code.padEnd(24)} ${r.severity.padEnd(12)} ${r.summary}`)
    return 0
  }
  const r = RULES.find((x) => x.code === code)
  if (!r) {
    err(`cellrun: no rule '${code}'; 'cellrun explain' lists them`)
    return 2
  }
  out(`${r.code} (${r.category === 'safety' ? 'hazard rule' : 'consistency rule'}, default ${r.severity})`)
  out('')
  out(r.summary)
  if (r.details) out(`\n${r.details}`)
  if (r.caution) out(`\nCaution: ${r.caution}`)
  if (r.source) out(`\nSource: ${r.source}`)
  out(`\nTo accept a finding on a line, say why in its comment: # noted ${r.code}: REASON`)
  out(`To change its severity: setting cellrun.rules {"${r.code}": "warning"}, or --rule ${r.code}=warning`)
  return 0
}

if (require.main === module) {
  // `cellrun explain | head` closes the pipe early: that is not an error.
  process.stdout.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(0)
    throw e
  })
  process.exitCode = run(
    process.argv.slice(2),
    (s) => process.stdout.write(s + '\n'),
    (s) => process.stderr.write(s + '\n'),
  )
}
