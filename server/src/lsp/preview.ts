// The `cellrun/preview` request: the run preview page (core/preview.ts) for an open document,
// from the analysis the server already caches. Params { uri }, result { html }.
import type { Connection } from 'vscode-languageserver'
import type { Analysis } from '../core/analyze'
import { previewHtml } from '../core/preview'

export const PREVIEW_REQUEST = 'cellrun/preview'

export interface PreviewParams {
  uri: string
}
export interface PreviewResult {
  html: string
}

/** Answer `cellrun/preview`; `getAnalysis` returns the cached analysis of an open document, or undefined. */
export function registerPreview(connection: Pick<Connection, 'onRequest'>, getAnalysis: (uri: string) => Analysis | undefined): void {
  connection.onRequest(PREVIEW_REQUEST, (params: PreviewParams): PreviewResult => previewFor(params, getAnalysis))
}

export function previewFor({ uri }: PreviewParams, getAnalysis: (uri: string) => Analysis | undefined): PreviewResult {
  const name = decodeURIComponent(uri.replace(/[?#].*$/, '').replace(/^.*\//, '')) || 'Cellrun run'
  const nonce = makeNonce()
  const analysis = typeof uri === 'string' ? getAnalysis(uri) : undefined
  if (!analysis) {
    return { html: `<!DOCTYPE html><html lang="en"><head><meta charset="utf-8"><meta http-equiv="Content-Security-Policy" content="default-src 'none'"><title>Cellrun</title></head><body><p>${escapeText(name)} is not open in the editor.</p></body></html>` }
  }
  return { html: previewHtml(analysis, { title: name, nonce }) }
}

function escapeText(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;')
}

/** A fresh nonce for the page's Content-Security-Policy, from the platform's crypto (Node 20 and browsers alike). */
function makeNonce(): string {
  const bytes = new Uint8Array(18)
  globalThis.crypto.getRandomValues(bytes)
  let bin = ''
  for (const b of bytes) bin += String.fromCharCode(b)
  return btoa(bin)
}
