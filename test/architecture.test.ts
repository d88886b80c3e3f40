// The architecture invariants of DEVELOPERS.md that a test can check.
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'

const root = join(__dirname, '..')
function sources(dir: string): string[] {
  return readdirSync(join(root, dir), { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? sources(join(dir, e.name)) : e.name.endsWith('.ts') ? [join(dir, e.name)] : [],
  )
}
const importsOf = (file: string) =>
  [...readFileSync(join(root, file), 'utf8').matchAll(/^\s*(?:import|export)[^'"]*from\s+['"]([^'"]+)['"]/gm)].map((m) => m[1])

describe('architecture', () => {
  const pure = [...sources('server/src/core'), ...sources('server/src/rules')]

  it('has core and rule modules to check', () => {
    expect(pure.length).toBeGreaterThan(10)
  })

  it('keeps the core and the rules free of editor, LSP and Node imports', () => {
    for (const f of pure) {
      for (const spec of importsOf(f)) {
        expect(spec, `${f} imports ${spec}`).not.toMatch(/^(vscode|vscode-languageserver|vscode-languageclient|node:|fs$|path$|child_process$)/)
      }
    }
  })

  it('has exactly one mathjs instance, in units.ts', () => {
    const users = pure.filter((f) => importsOf(f).includes('mathjs'))
    expect(users).toEqual([join('server/src/core', 'units.ts')])
  })

  it('converts positions only in positions.ts', () => {
    // Line/character arithmetic belongs to LineIndex; other modules must not split lines themselves.
    for (const f of [...pure, ...sources('server/src/lsp'), ...sources('server/src/cli')]) {
      if (f.endsWith('positions.ts')) continue
      const text = readFileSync(join(root, f), 'utf8')
      expect(text, f).not.toMatch(/split\(\s*\/\\r\?\\n\//)
      expect(text, f).not.toMatch(/\.split\(['"]\\n['"]\)/)
    }
  })

  it('keeps the declared dependency versions the toolchain notes require', () => {
    const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8'))
    const [maj, min] = pkg.dependencies.mathjs.split('.').map(Number)
    expect(maj > 15 || (maj === 15 && min >= 2)).toBe(true) // mathjs >= 15.2.0 (older: evaluate sandbox escapes)
    expect(pkg.engines.vscode).toBe('^1.100.0')
    expect(pkg.devDependencies['@types/vscode']).toBe('1.100.0')
    expect(pkg.activationEvents).toEqual(['onLanguage:cellrun'])
  })
})
