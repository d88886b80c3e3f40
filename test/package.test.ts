// `npm run package` makes an installable .vsix offline; check its manifest and contents.
import { execFileSync } from 'node:child_process'
import { mkdtempSync, readFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { inflateRawSync } from 'node:zlib'
import { describe, expect, it } from 'vitest'

const root = join(__dirname, '..')

describe('vsix packaging', () => {
  it('packages the built extension with its grammar, language configuration and bundles', () => {
    const out = join(mkdtempSync(join(tmpdir(), 'cellrun-vsix-')), 'cellrun.vsix')
    execFileSync(process.execPath, [join(root, 'node_modules/@vscode/vsce/vsce'), 'package', '--no-dependencies', '--allow-missing-repository', '--out', out], {
      cwd: root,
      stdio: 'pipe',
      timeout: 120_000,
    })
    const zip = readZip(readFileSync(out))
    const listing = [...zip.keys()].join('\n')
    for (const f of ['extension/package.json', 'extension/dist/client.js', 'extension/dist/server.js', 'extension/dist/cli.js', 'extension/syntaxes/cellrun.tmLanguage.json', 'extension/language-configuration.json']) {
      expect(listing).toContain(f)
    }
    expect(listing).not.toMatch(/\.map\b|node_modules|server\/src|\.test\.ts/)
    const manifest = zip.get('extension.vsixmanifest') ?? ''
    expect(manifest).toContain('Microsoft.VisualStudio.Code.Engine" Value="^1.100.0"')
    const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8'))
    expect(pkg.contributes.languages[0].extensions).toContain('.cellrun')
  }, 120_000)
})

/** A minimal zip reader (central directory; stored or deflated entries), so the test needs no unzip tool. */
function readZip(buf: Buffer): Map<string, string> {
  let eocd = buf.length - 22
  while (eocd >= 0 && buf.readUInt32LE(eocd) !== 0x06054b50) eocd--
  if (eocd < 0) throw new Error('not a zip file')
  const count = buf.readUInt16LE(eocd + 10)
  let p = buf.readUInt32LE(eocd + 16)
  const files = new Map<string, string>()
  for (let i = 0; i < count; i++) {
    const method = buf.readUInt16LE(p + 10)
    const size = buf.readUInt32LE(p + 20)
    const nameLen = buf.readUInt16LE(p + 28)
    const extraLen = buf.readUInt16LE(p + 30)
    const commentLen = buf.readUInt16LE(p + 32)
    const local = buf.readUInt32LE(p + 42)
    const name = buf.toString('utf8', p + 46, p + 46 + nameLen)
    const dataStart = local + 30 + buf.readUInt16LE(local + 26) + buf.readUInt16LE(local + 28)
    const raw = buf.subarray(dataStart, dataStart + size)
    files.set(name, (method === 8 ? inflateRawSync(raw) : raw).toString('utf8'))
    p += 46 + nameLen + extraLen + commentLen
  }
  return files
}
