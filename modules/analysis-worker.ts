import { join, resolve } from 'node:path'
import { defineNuxtModule } from 'nuxt/kit'
import { bundleForNode } from '../scripts/lib/node-bundle'

// The analysis worker runs in its own thread, so it needs a file of its own: this module bundles
// server/workers/analysis.worker.ts with esbuild into .nuxt/ for development and next to the
// built server entry (.output/server/analysis-worker.mjs) for production.
export const ANALYSIS_WORKER_FILE = 'analysis-worker.mjs'

function bundleWorker(outfile: string) {
  return bundleForNode(resolve('server/workers/analysis.worker.ts'), outfile)
}

export default defineNuxtModule({
  meta: { name: 'kerfbook-analysis-worker' },
  setup(_options, nuxt) {
    const devBundle = join(nuxt.options.buildDir, ANALYSIS_WORKER_FILE)
    if (nuxt.options.dev) {
      nuxt.hook('ready', async () => {
        await bundleWorker(devBundle)
      })
      nuxt.hook('builder:watch', async (_event, path) => {
        // The worker bundles the engine, its own entry and the shared packed formats and finding types.
        if (/server\/(analysis|workers)\/|shared\/(packed-analysis|finding-groups)\.ts$/.test(path)) await bundleWorker(devBundle)
      })
    }
    nuxt.hook('nitro:init', (nitro) => {
      nitro.hooks.hook('compiled', async () => {
        if (!nuxt.options.dev) await bundleWorker(join(nitro.options.output.serverDir, ANALYSIS_WORKER_FILE))
      })
    })
  },
})
