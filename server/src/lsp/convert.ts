// Conversions from the core's plain data to LSP types. Positions go through the core's LineIndex,
// the one place that handles UTF-16 offsets.
import {
  CodeActionKind,
  DiagnosticSeverity,
  InlayHintKind,
  SymbolKind,
  type CodeAction,
  type Diagnostic as LspDiagnostic,
  type DocumentSymbol,
  type InlayHint,
  type Range,
} from 'vscode-languageserver'
import type { Analysis, OutlineItem } from '../core/analyze'
import type { Diagnostic, Severity } from '../core/diagnostics'
import type { LineIndex, Span } from '../core/positions'

export function toRange(index: LineIndex, span: Span): Range {
  return { start: index.positionAt(span.start), end: index.positionAt(span.end) }
}

const SEVERITY: Record<Severity, DiagnosticSeverity> = {
  error: DiagnosticSeverity.Error,
  warning: DiagnosticSeverity.Warning,
  information: DiagnosticSeverity.Information,
  hint: DiagnosticSeverity.Hint,
}

export function toLspDiagnostic(a: Analysis, d: Diagnostic): LspDiagnostic {
  return {
    range: toRange(a.index, d.span),
    severity: SEVERITY[d.severity],
    code: d.code,
    source: 'cellrun',
    message: d.caution ? `${d.message}\nCaution: ${d.caution}` : d.message,
  }
}

export function toInlayHints(a: Analysis, range?: Range): InlayHint[] {
  const from = range ? a.index.offsetAt(range.start) : 0
  const to = range ? a.index.offsetAt(range.end) : a.text.length
  return a.computed
    .filter((c) => c.anchor >= from && c.anchor <= to)
    .map((c) => ({
      position: a.index.positionAt(c.anchor),
      label: c.label,
      kind: InlayHintKind.Parameter,
      paddingLeft: true,
      tooltip: { kind: 'markdown', value: `**${c.title}**\n\n${c.working.map((w) => `    ${w}`).join('\n')}` },
    }))
}

/** Quick fixes for the core diagnostics that overlap `range`. */
export function toCodeActions(a: Analysis, uri: string, range: Range): CodeAction[] {
  const from = a.index.offsetAt(range.start)
  const to = a.index.offsetAt(range.end)
  const actions: CodeAction[] = []
  for (const d of a.diagnostics) {
    if (d.span.end < from || d.span.start > to) continue
    for (const f of d.fixes) {
      actions.push({
        title: f.title,
        kind: CodeActionKind.QuickFix,
        diagnostics: [toLspDiagnostic(a, d)],
        isPreferred: d.fixes.length === 1,
        edit: { changes: { [uri]: f.edits.map((e) => ({ range: toRange(a.index, e.span), newText: e.newText })) } },
      })
    }
  }
  return actions
}

const SYMBOL_KIND: Record<OutlineItem['kind'], SymbolKind> = {
  run: SymbolKind.File,
  conditions: SymbolKind.Property,
  value: SymbolKind.Constant,
  cell: SymbolKind.Struct,
  compartment: SymbolKind.Field,
  separator: SymbolKind.Interface,
  electrode: SymbolKind.Property,
  vessel: SymbolKind.Property,
  charge: SymbolKind.Array,
  step: SymbolKind.Event,
  expect: SymbolKind.Key,
  observe: SymbolKind.Key,
  handling: SymbolKind.Object,
  reaction: SymbolKind.Operator,
}

export function toDocumentSymbols(a: Analysis, items: OutlineItem[]): DocumentSymbol[] {
  return items.map((i) => {
    const range = toRange(a.index, i.span)
    let selectionRange = toRange(a.index, i.selection)
    // LSP requires the selection range to lie inside the range.
    if (i.selection.start < i.span.start || i.selection.end > i.span.end) selectionRange = range
    return {
      name: i.name,
      detail: i.detail,
      kind: SYMBOL_KIND[i.kind],
      range,
      selectionRange,
      children: toDocumentSymbols(a, i.children),
    }
  })
}
