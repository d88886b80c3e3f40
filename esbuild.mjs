// Builds the bundles: the VS Code client, the language server and the CLI (and their browser forms).
// `node esbuild.mjs` builds once; `node esbuild.mjs --watch` rebuilds on change.
// `node esbuild.mjs bench` or `node esbuild.mjs fuzz` builds only that developer tool (npm run bench,
// npm run fuzz), with the same settings.
import * as esbuild from 'esbuild'

const watch = process.argv.includes('--watch')
const common = {
  bundle: true,
  platform: 'node',
  format: 'cjs',
  target: 'node20',
  sourcemap: true,
  logLevel: 'warning',
}
const builds = [
  { ...common, entryPoints: ['client/src/extension.ts'], outfile: 'dist/client.js', external: ['vscode'] },
  { ...common, entryPoints: ['server/src/lsp/main.ts'], outfile: 'dist/server.js' },
  { ...common, entryPoints: ['server/src/cli/main.ts'], outfile: 'dist/cli.js', banner: { js: '#!/usr/bin/env node' } },
  // The browser build, for browser-hosted editors: a web-worker server and a browser client.
  { ...common, platform: 'browser', format: 'cjs', target: 'es2022', entryPoints: ['client/src/browser.ts'], outfile: 'dist/browser/client.js', external: ['vscode'] },
  { ...common, platform: 'browser', format: 'iife', target: 'es2022', entryPoints: ['server/src/lsp/browser.ts'], outfile: 'dist/browser/server.js' },
]
const tools = {
  bench: { ...common, entryPoints: ['test/bench/bench.ts'], outfile: 'dist/bench.cjs' },
  fuzz: { ...common, entryPoints: ['test/fuzz/run.ts'], outfile: 'dist/fuzz.cjs' },
}
const tool = process.argv.slice(2).find((a) => Object.hasOwn(tools, a))

if (tool) {
  await esbuild.build(tools[tool])
} else if (watch) {
  for (const b of builds) await (await esbuild.context(b)).watch()
} else {
  await Promise.all(builds.map((b) => esbuild.build(b)))
}
