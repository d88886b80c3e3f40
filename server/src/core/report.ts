// Text and JSON reports of an analysis, shared by the CLI and the tests (pure functions).
import type { Analysis } from './analyze'
import type { Diagnostic } from './diagnostics'
import { FARADAY } from './constants'
import { fmt } from './units'

export const SEVERITY_WORD: Record<Diagnostic['severity'], string> = {
  error: 'error',
  warning: 'warning',
  information: 'note',
  hint: 'note',
}

/** GNU-style lines: `file:line:col: error: message [code]` (1-based), a caution as a `note:` line after it. */
export function diagnosticLines(a: Analysis, file: string): string[] {
  return a.diagnostics.flatMap((d) => {
    const p = a.index.humanAt(d.span.start)
    const at = `${file}:${p.line}:${p.column}`
    return [`${at}: ${SEVERITY_WORD[d.severity]}: ${d.message} [${d.code}]`, ...(d.caution ? [`${at}: note: caution: ${d.caution} [${d.code}]`] : [])]
  })
}

export interface JsonReport {
  file: string
  diagnostics: {
    line: number
    column: number
    endLine: number
    endColumn: number
    severity: Diagnostic['severity']
    code: string
    message: string
    caution?: string
    noted?: string
    fixes: { title: string; edits: { line: number; column: number; endLine: number; endColumn: number; newText: string }[] }[]
  }[]
  computed: { line: number; key: string; label: string; value?: number; unit?: string; title: string; working: string[] }[]
  totals: { chargeC: number; chargeAh: number; electronMol: number; effectiveElectronMol: number; hours: number; energyWh?: number }
  conditions: { temperatureK: number; pressurePa: number; stated: { temperature: boolean; pressure: boolean } }
  constants: { faraday: number }
  /** The simulated run: per-step state, events (with their 1-based step line) and the end state. */
  simulation?: {
    mainProduct?: { formula: string; compartment: string }
    events: { kind: string; hours: number; line: number; compartment?: string; message: string }[]
    steps: { line: number; hours: number; efficiency?: number; productMol?: number; temperatureC: number; compartments: { name: string; ph: number; volumeL: number; main?: { formula: string; wtPercent: number; molPerL: number } }[] }[]
    gasesMol: Record<string, number>
  }
}

export function jsonReport(a: Analysis, file: string): JsonReport {
  const at = (o: number) => a.index.humanAt(o)
  const t = a.model.totals
  return {
    file,
    diagnostics: a.diagnostics.map((d) => {
      const s = at(d.span.start)
      const e = at(d.span.end)
      return {
        line: s.line,
        column: s.column,
        endLine: e.line,
        endColumn: e.column,
        severity: d.severity,
        code: d.code,
        message: d.message,
        ...(d.caution ? { caution: d.caution } : {}),
        ...(d.noted ? { noted: d.noted } : {}),
        fixes: d.fixes.map((f) => ({
          title: f.title,
          edits: f.edits.map((x) => {
            const es = at(x.span.start)
            const ee = at(x.span.end)
            return { line: es.line, column: es.column, endLine: ee.line, endColumn: ee.column, newText: x.newText }
          }),
        })),
      }
    }),
    computed: a.computed.map((c) => ({
      line: c.line + 1,
      key: c.key,
      label: c.label,
      ...(c.value !== undefined ? { value: c.value } : {}),
      ...(c.unit !== undefined ? { unit: c.unit } : {}),
      title: c.title,
      working: c.working,
    })),
    totals: {
      chargeC: t.chargeC,
      chargeAh: t.chargeC / 3600,
      electronMol: t.electronMol,
      effectiveElectronMol: t.effectiveElectronMol,
      hours: t.seconds / 3600,
      ...(t.energyJ !== undefined ? { energyWh: t.energyJ / 3600 } : {}),
    },
    conditions: { temperatureK: a.model.temperatureK, pressurePa: a.model.pressurePa, stated: a.model.conditionsStated },
    constants: { faraday: FARADAY },
    ...(a.model.simulation ? { simulation: simulationReport(a) } : {}),
  }
}

function simulationReport(a: Analysis): NonNullable<JsonReport['simulation']> {
  const sim = a.model.simulation!
  return {
    ...(sim.mainProduct ? { mainProduct: { formula: sim.mainProduct.formula, compartment: sim.mainProduct.compartment } } : {}),
    events: sim.events.map((e) => ({ kind: e.kind, hours: e.time / 3600, line: e.line + 1, ...(e.compartment ? { compartment: e.compartment } : {}), message: e.message })),
    steps: sim.steps.map((st) => ({
      line: st.line + 1,
      hours: st.endTime / 3600,
      ...(st.product ? { efficiency: st.product.efficiency, productMol: st.product.mol } : {}),
      temperatureC: st.temperatureK - 273.15,
      compartments: st.compartments.map((c) => ({ name: c.name, ph: c.ph, volumeL: c.volumeL, ...(c.main ? { main: { formula: c.main.formula, wtPercent: c.main.wtPercent, molPerL: c.main.molPerL } } : {}) })),
    })),
    gasesMol: { ...sim.gases },
  }
}

/** The annotated view: each line of the protocol followed by its computed values and diagnostics. */
export function annotate(a: Analysis, file: string): string {
  const out: string[] = [`== ${file}`]
  const width = String(a.index.lineCount).length
  const pad = ' '.repeat(width)
  for (let line = 0; line < a.index.lineCount; line++) {
    const text = a.index.lineText(line)
    if (line === a.index.lineCount - 1 && text === '') break
    out.push(`${String(line + 1).padStart(width)} | ${text}`)
    for (const c of a.computed) if (c.line === line) out.push(`${pad} |     => ${c.label}`)
    for (const d of a.diagnostics) {
      if (a.index.lineOf(d.span.start) !== line) continue
      out.push(`${pad} |     !! ${SEVERITY_WORD[d.severity]} [${d.code}] ${d.message}`)
      if (d.caution) out.push(`${pad} |        caution: ${d.caution}`)
    }
  }
  const t = a.model.totals
  if (a.model.steps.length > 0) {
    out.push(
      `${pad} total: ${fmt(t.chargeC / 3600, 4)} A·h (${fmt(t.chargeC, 4)} C), ${fmt(t.electronMol, 4)} mol e⁻ over ${fmt(t.seconds / 3600, 4)} h` +
        (t.energyJ !== undefined ? `, ${fmt(t.energyJ / 3600, 4)} W·h` : ''),
    )
  }
  return out.join('\n') + '\n'
}

/** A SARIF 2.1.0 log of the analyses, with file URIs relative to the `SRCROOT` base. */
export function sarifReport(items: { file: string; analysis: Analysis }[], rules: readonly { code: string; severity: Diagnostic['severity']; summary: string; caution?: string; details?: string; category?: string }[], version: string): object {
  const level = (s: Diagnostic['severity']) => (s === 'error' ? 'error' : s === 'warning' ? 'warning' : 'note')
  const index = new Map(rules.map((r, i) => [r.code, i]))
  const uri = (file: string) => file.replace(/\\/g, '/').replace(/^\.\//, '').split('/').map(encodeURIComponent).join('/')
  return {
    $schema: 'https://json.schemastore.org/sarif-2.1.0.json',
    version: '2.1.0',
    runs: [
      {
        tool: {
          driver: {
            name: 'cellrun',
            version,
            rules: rules.map((r) => ({
              id: r.code,
              shortDescription: { text: r.summary },
              ...(r.details ? { fullDescription: { text: r.details } } : {}),
              ...(r.caution ? { help: { text: r.caution } } : {}),
              defaultConfiguration: { level: level(r.severity) },
              properties: { category: r.category ?? 'consistency' },
            })),
          },
        },
        originalUriBaseIds: { SRCROOT: { description: { text: 'The folder cellrun was run from.' } } },
        artifacts: items.map((x) => ({ location: { uri: uri(x.file), uriBaseId: 'SRCROOT' } })),
        results: items.flatMap((x, artifactIndex) =>
          x.analysis.diagnostics.map((d) => {
            const s = x.analysis.index.humanAt(d.span.start)
            const e = x.analysis.index.humanAt(Math.max(d.span.end, d.span.start))
            return {
              ruleId: d.code,
              ...(index.has(d.code) ? { ruleIndex: index.get(d.code) } : {}),
              level: level(d.severity),
              message: { text: d.caution ? `${d.message} Caution: ${d.caution}` : d.message },
              locations: [
                {
                  physicalLocation: {
                    artifactLocation: { uri: uri(x.file), uriBaseId: 'SRCROOT', index: artifactIndex },
                    region: { startLine: s.line, startColumn: s.column, endLine: e.line, endColumn: e.column },
                  },
                },
              ],
              ...(d.noted ? { suppressions: [{ kind: 'inSource', justification: d.noted }] } : {}),
            }
          }),
        ),
      },
    ],
  }
}
