// Bundles the benchmark (TypeScript, importing the analysis core) into dist/bench.cjs.
import * as esbuild from 'esbuild'

await esbuild.build({
  entryPoints: ['test/bench/bench.ts'],
  outfile: 'dist/bench.cjs',
  bundle: true,
  platform: 'node',
  format: 'cjs',
  target: 'node20',
  sourcemap: true,
  logLevel: 'warning',
})
