// Bundles the standalone fuzz runner (test/fuzz/run.ts) to dist/fuzz.cjs for `npm run fuzz`.
import { fileURLToPath } from 'node:url'
import * as esbuild from 'esbuild'

await esbuild.build({
  entryPoints: [fileURLToPath(new URL('./run.ts', import.meta.url))],
  outfile: fileURLToPath(new URL('../../dist/fuzz.cjs', import.meta.url)),
  bundle: true,
  platform: 'node',
  format: 'cjs',
  target: 'node20',
  sourcemap: true,
  logLevel: 'warning',
})
