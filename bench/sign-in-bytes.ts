import { readFileSync } from 'node:fs'
import { join } from 'node:path'

interface ManifestChunk {
  file: string
  isEntry?: boolean
  imports?: string[]
  css?: string[]
}

/**
 * The files the browser loads for the sign-in page of a client build: the entry, the sign-in
 * view and everything they import statically, with their CSS (from Vite's manifest).
 */
export function signInFiles(distDir: string): string[] {
  const manifest = JSON.parse(
    readFileSync(join(distDir, '.vite', 'manifest.json'), 'utf8'),
  ) as Record<string, ManifestChunk>
  const files = new Set<string>()
  const visit = (key: string) => {
    const chunk = manifest[key]
    if (!chunk || files.has(chunk.file)) return
    files.add(chunk.file)
    for (const css of chunk.css ?? []) files.add(css)
    for (const imported of chunk.imports ?? []) visit(imported)
  }
  visit('index.html')
  visit('src/views/SignInView.vue')
  return [...files]
}
