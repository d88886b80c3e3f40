// The Cellrun command line: `cellrun check FILE...` and `cellrun annotate FILE...`.
// A thin layer over the same analysis core as the language server.
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs'
import { join, relative, resolve } from 'node:path'
import { analyze, type Analysis } from '../core/analyze'
import type { Severity } from '../core/diagnostics'
import { compareOutcomes } from '../core/compare'
import { sheetHtml, sheetMarkdown } from '../core/sheet'
import { annotate, diagnosticLines, jsonReport, sarifReport } from '../core/report'
import { RULES } from '../rules'

const USAGE = `usage:
  cellrun check [--format text|json|sarif] PATH...
                                               report diagnostics; exit 1 when any is an error
                                               PATH: files, folders (every *.cellrun below) or globs (*, **)
  cellrun annotate FILE...                     print each line with its computed values
  cellrun explain [CODE]                       a rule's full text; without CODE, the list of rules
  cellrun compare OLD NEW                      how the computed outcome changed between two versions
  cellrun sheet [--html] FILE                  a printable run sheet (Markdown, or HTML with the plots)
Options:
  --efficiency-floor PERCENT   report a simulated step efficiency below this (default 80)
  --rule CODE=SEVERITY         error | warning | information | off, for one rule (repeatable)
  --max-warnings N             also exit 1 when there are more than N warnings
  --quiet                      report errors only
  cellrun --help | --version

Diagnostics print as FILE:LINE:COLUMN: error|warning|note: MESSAGE [CODE] (1-based).
Exit codes: 0 no errors, 1 errors found (or more warnings than --max-warnings),
2 usage or file problems.`

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
  if (cmd === 'compare') return compare(args, out, err)
  if (cmd === 'sheet') {
    const html = args.includes('--html')
    const file = args.filter((x) => x !== '--html')[0]
    if (!file || args.filter((x) => x !== '--html').length !== 1) {
      err('cellrun: sheet takes one file: cellrun sheet [--html] FILE')
      return 2
    }
    let text: string
    try {
      text = readFileSync(file, 'utf8')
    } catch (e) {
      err(`cellrun: cannot read ${file}: ${e instanceof Error ? e.message : String(e)}`)
      return 2
    }
    const a = analyze(text)
    out(html ? sheetHtml(a, file) : sheetMarkdown(a, file))
    return 0
  }
  if (cmd !== 'check' && cmd !== 'annotate') {
    err(`cellrun: unknown command '${cmd}'\n${USAGE}`)
    return 2
  }
  let format = 'text'
  let floor = 80
  let maxWarnings = Infinity
  let quiet = false
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
    } else if (a === '--max-warnings') {
      const v = Number(args[++i])
      if (!Number.isInteger(v) || v < 0) {
        err('cellrun: --max-warnings takes a whole number')
        return 2
      }
      maxWarnings = v
    } else if (a === '--quiet') quiet = true
    else if (a === '--format') format = args[++i] ?? ''
    else if (a.startsWith('--format=')) format = a.slice('--format='.length)
    else if (a.startsWith('-')) {
      err(`cellrun: unknown option '${a}'`)
      return 2
    } else files.push(a)
  }
  if (format !== 'text' && format !== 'json' && format !== 'sarif') {
    err(`cellrun: --format must be text, json or sarif`)
    return 2
  }
  if (files.length === 0) {
    err(`cellrun: no files given\n${USAGE}`)
    return 2
  }
  let errors = 0
  let warnings = 0
  let unreadable = 0
  const reports = []
  const analysed: { file: string; analysis: Analysis }[] = []
  const expanded = expandPaths(files, err)
  unreadable += expanded.missing
  for (const file of expanded.files) {
    let text: string
    try {
      text = readFileSync(file, 'utf8')
    } catch (e) {
      err(`cellrun: cannot read ${file}: ${e instanceof Error ? e.message : String(e)}`)
      unreadable++
      continue
    }
    const full = analyze(text, { efficiencyFloor: floor / 100, severities, includes: includesFor(file) })
    const a = quiet ? { ...full, diagnostics: full.diagnostics.filter((d) => d.severity === 'error') } : full
    errors += a.diagnostics.filter((d) => d.severity === 'error').length
    warnings += a.diagnostics.filter((d) => d.severity === 'warning').length
    if (cmd === 'annotate') out(annotate(a, file))
    else if (format === 'json') reports.push(jsonReport(a, file))
    else if (format === 'sarif') analysed.push({ file, analysis: a })
    else for (const l of diagnosticLines(a, file)) out(l)
  }
  if (cmd === 'check' && format === 'json') out(JSON.stringify({ files: reports }, null, 2))
  if (cmd === 'check' && format === 'sarif') out(JSON.stringify(sarifReport(analysed, RULES, VERSION), null, 2))
  if (unreadable > 0) return 2
  if (cmd !== 'check') return 0
  return errors > 0 || warnings > maxWarnings ? 1 : 0
}

const VERSION = '0.1.0'

/** Includes resolve against the disk, inside the folder cellrun runs from. */
function includesFor(file: string) {
  const abs = (p: string) => resolve(p).replace(/\\/g, '/')
  return {
    file: abs(file),
    root: abs('.'),
    read: (p: string) => {
      try {
        return readFileSync(p, 'utf8')
      } catch {
        return undefined
      }
    },
  }
}

/** Files, folders (every *.cellrun below them) and globs (`*`, `**`, `?`) to a sorted list of files. */
function expandPaths(paths: string[], err: (s: string) => void): { files: string[]; missing: number } {
  const out = new Set<string>()
  let missing = 0
  const walk = (dir: string, into: (f: string) => void) => {
    for (const e of readdirSync(dir, { withFileTypes: true })) {
      if (e.name === 'node_modules' || e.name.startsWith('.')) continue
      const p = join(dir, e.name)
      if (e.isDirectory()) walk(p, into)
      else into(p)
    }
  }
  for (const p of paths) {
    if (/[*?]/.test(p)) {
      const base = p.split('/').filter((seg, i, all) => !/[*?]/.test(seg) && all.slice(0, i + 1).every((x) => !/[*?]/.test(x))).join('/') || '.'
      const re = new RegExp(
        '^' +
          p
            .replace(/^\.\//, '')
            .split('/')
            .map((seg) => (seg === '**' ? '(?:.*/)?' : seg.replace(/[.+^${}()|[\]\\]/g, '\\$&').replace(/\*/g, '[^/]*').replace(/\?/g, '[^/]') + '/'))
            .join('')
            .replace(/\(\?:\.\*\/\)\?$/, '.*')
            .replace(/\/$/, '') +
          '$',
      )
      const before = out.size
      if (existsSync(base)) walk(base, (f) => re.test(relative('.', f).replace(/\\/g, '/')) && out.add(f))
      if (out.size === before) {
        err(`cellrun: no file matches ${p}`)
        missing++
      }
    } else if (existsSync(p) && statSync(p).isDirectory()) {
      walk(p, (f) => f.endsWith('.cellrun') && out.add(f))
    } else out.add(p)
  }
  return { files: [...out].sort(), missing }
}

/** `cellrun compare OLD NEW`: the outcome's changes, one per line (also usable as a git difftool). */
function compare(args: string[], out: (s: string) => void, err: (s: string) => void): number {
  if (args.length !== 2) {
    err('cellrun: compare takes two files: OLD NEW')
    return 2
  }
  const texts: string[] = []
  for (const f of args) {
    try {
      texts.push(readFileSync(f, 'utf8'))
    } catch (e) {
      err(`cellrun: cannot read ${f}: ${e instanceof Error ? e.message : String(e)}`)
      return 2
    }
  }
  const lines = compareOutcomes(analyze(texts[0]), analyze(texts[1]))
  out(`== ${args[0]} → ${args[1]}`)
  out(lines.length ? lines.join('\n') : '(no change in the computed outcome)')
  return 0
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
