import { build } from 'esbuild'

/**
 * Bundles a TypeScript entry into one ES module for Node, as the server's
 * analysis worker is shipped. The benchmark times the engine from such a
 * bundle too, so it measures the code the server runs.
 */
export function bundleForNode(entryPoint: string, outfile: string) {
  return build({
    entryPoints: [entryPoint],
    outfile,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    logLevel: 'warning',
    // CommonJS dependencies inside an ES module bundle need a require of their own.
    banner: { js: "import { createRequire as __kerfbookRequire } from 'node:module'; const require = __kerfbookRequire(import.meta.url);" },
  })
}
