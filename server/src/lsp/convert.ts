// Conversions from the core's plain data to LSP types. Positions go through the core's LineIndex,
// the one place that handles UTF-16 offsets.
import {
  CodeActionKind,
  CompletionItemKind,
  DiagnosticSeverity,
  FoldingRangeKind,
  InlayHintKind,
  InsertTextFormat,
  MarkupKind,
  SymbolKind,
  type CodeAction,
  type CodeLens,
  type CompletionItem,
  type Diagnostic as LspDiagnostic,
  type DocumentSymbol,
  type FoldingRange,
  type InlayHint,
  type Location,
  type Range,
  type SemanticTokens,
  type SemanticTokensLegend,
  type TextEdit,
} from 'vscode-languageserver'
import type { Analysis, OutlineItem } from '../core/analyze'
import { hintGroup, type HintSettings } from './settings'
import type { CompletionItem as CoreCompletionItem, CompletionKind as CoreCompletionKind } from '../core/complete'
import type { Diagnostic, Edit, Severity } from '../core/diagnostics'
import type { FoldingRange as CoreFoldingRange } from '../core/folding'
import type { Lens } from '../core/lens'
import type { LineIndex, Span } from '../core/positions'
import { TOKEN_MODIFIERS, TOKEN_TYPES, type SemanticToken } from '../core/tokens'

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

export function toInlayHints(a: Analysis, range?: Range, settings: HintSettings = { groups: {}, brief: false }): InlayHint[] {
  const from = range ? a.index.offsetAt(range.start) : 0
  const to = range ? a.index.offsetAt(range.end) : a.text.length
  return a.computed
    .filter((c) => c.anchor >= from && c.anchor <= to && settings.groups[hintGroup(c.key)] !== false)
    .map((c) => ({
      position: a.index.positionAt(c.anchor),
      label: settings.brief ? c.label.split(' · ')[0] : c.label,
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

// ------------------------------------------------------------------------------------------------
// Editor features: completion, code lens, folding, semantic tokens, formatting, names.

const COMPLETION_KIND: Record<CoreCompletionKind, CompletionItemKind> = {
  keyword: CompletionItemKind.Keyword,
  clause: CompletionItemKind.Keyword,
  kind: CompletionItemKind.EnumMember,
  material: CompletionItemKind.Value,
  compartment: CompletionItemKind.Field,
  value: CompletionItemKind.Variable,
  unit: CompletionItemKind.Unit,
  formula: CompletionItemKind.Struct,
  option: CompletionItemKind.Property,
}

export function toCompletionItems(a: Analysis, items: CoreCompletionItem[]): CompletionItem[] {
  return items.map((i) => ({
    label: i.label,
    kind: COMPLETION_KIND[i.kind],
    ...(i.detail ? { detail: i.detail } : {}),
    ...(i.documentation ? { documentation: { kind: MarkupKind.Markdown, value: i.documentation } } : {}),
    ...(i.sortText ? { sortText: i.sortText } : {}),
    insertTextFormat: InsertTextFormat.PlainText,
    textEdit: { range: toRange(a.index, i.replace), newText: i.insertText ?? i.label },
  }))
}

export function toCodeLenses(a: Analysis, lenses: Lens[], uri: string): CodeLens[] {
  return lenses.map((l) => ({ range: toRange(a.index, l.span), command: { title: l.title, command: l.command, arguments: [uri] } }))
}

export function toFoldingRanges(ranges: CoreFoldingRange[]): FoldingRange[] {
  return ranges.map((r) => ({
    startLine: r.startLine,
    endLine: r.endLine,
    ...(r.kind === 'comment' ? { kind: FoldingRangeKind.Comment } : r.kind === 'region' ? { kind: FoldingRangeKind.Region } : {}),
  }))
}

export const SEMANTIC_TOKENS_LEGEND: SemanticTokensLegend = { tokenTypes: [...TOKEN_TYPES], tokenModifiers: [...TOKEN_MODIFIERS] }

/** The LSP encoding: per token, line and start relative to the previous token, length, type, modifier bits. */
export function toSemanticTokens(a: Analysis, tokens: SemanticToken[]): SemanticTokens {
  const data: number[] = []
  let prevLine = 0
  let prevChar = 0
  for (const t of tokens) {
    const start = a.index.positionAt(t.span.start)
    // Every token lies within one line; clamp to the line end all the same.
    const end = Math.min(t.span.end, a.index.lineEnd(start.line))
    const length = end - t.span.start
    if (length <= 0) continue
    const bits = t.modifiers.reduce((b, m) => b | (1 << TOKEN_MODIFIERS.indexOf(m)), 0)
    data.push(start.line - prevLine, start.line === prevLine ? start.character - prevChar : start.character, length, TOKEN_TYPES.indexOf(t.type), bits)
    prevLine = start.line
    prevChar = start.character
  }
  return { data }
}

export function toTextEdits(a: Analysis, edits: Edit[]): TextEdit[] {
  return edits.map((e) => ({ range: toRange(a.index, e.span), newText: e.newText }))
}

export function toLocations(a: Analysis, uri: string, spans: Span[]): Location[] {
  return spans.map((s) => ({ uri, range: toRange(a.index, s) }))
}
