// Bundles the worker threads (the render worker, with the codecs' .wasm files, and the checkpoint
// thread) and the fit's child process with esbuild next to the built server, because Nitro bundles
// only what the server imports and a worker thread or a child process needs a file of its own.
import { copyFile, mkdir } from 'node:fs/promises'
import { createRequire } from 'node:module'
import { basename, dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { build } from 'esbuild'
import { WASM_FILES } from '../core/imaging/codecs'

const here = dirname(fileURLToPath(import.meta.url))

/**
 * Writes <serverDir>/workers/render-worker.mjs, <serverDir>/workers/wasm/*.wasm and
 * <serverDir>/workers/checkpoint-worker.mjs (which loads better-sqlite3 from the server's node_modules).
 */
export async function buildRenderWorker(serverDir: string) {
  const out = join(resolve(serverDir), 'workers')
  await mkdir(join(out, 'wasm'), { recursive: true })
  await build({
    entryPoints: [join(here, 'render-worker.ts'), join(here, 'checkpoint-worker.ts')],
    outdir: out,
    outExtension: { '.js': '.mjs' },
    // The native driver stays a package (Nitro traces it into the server's node_modules).
    external: ['better-sqlite3'],
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    logLevel: 'warning',
    // Bundled CommonJS helpers call require(); give the ES module one.
    banner: { js: 'import { createRequire as __glintRequire } from \'node:module\'; const require = __glintRequire(import.meta.url);' },
  })
  const require = createRequire(import.meta.url)
  for (const spec of Object.values(WASM_FILES)) {
    const [scope, name, ...rest] = spec.split('/')
    const packageDir = dirname(require.resolve(`${scope}/${name}/package.json`))
    await copyFile(join(packageDir, ...rest), join(out, 'wasm', basename(spec)))
  }
  return join(out, 'render-worker.mjs')
}

/**
 * Writes <serverDir>/workers/fit-child.mjs. The optimizer's native package stays outside the
 * bundle: Nitro's trace copies it to <serverDir>/node_modules (nuxt.config's traceInclude), where
 * the child finds it.
 */
export async function buildFitChild(serverDir: string) {
  const outfile = join(resolve(serverDir), 'workers', 'fit-child.mjs')
  await build({
    entryPoints: [join(here, 'fit-child.ts')],
    outfile,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    logLevel: 'warning',
    external: ['@open-spaced-repetition/binding'],
    banner: { js: 'import { createRequire as __glintRequire } from \'node:module\'; const require = __glintRequire(import.meta.url);' },
  })
  return outfile
}
