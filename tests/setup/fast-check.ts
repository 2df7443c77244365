// Every fast-check property in the unit project runs from one seed, so a run can be repeated exactly: the default
// below, or KERFBOOK_FC_SEED=<integer> to repeat a failure or to explore other inputs. A property given its own
// `seed` keeps it. On a failed property the seed of the run is printed with the command that repeats it.
import fc from 'fast-check'
import { beforeEach } from 'vitest'

const DEFAULT_SEED = 20_261_204

function seedFromEnvironment(): number {
  const text = process.env.KERFBOOK_FC_SEED
  if (text === undefined || text === '') return DEFAULT_SEED
  const seed = Number(text)
  if (!Number.isSafeInteger(seed)) throw new Error(`KERFBOOK_FC_SEED must be an integer, not "${text}"`)
  return seed
}

export const FAST_CHECK_SEED = seedFromEnvironment()

fc.configureGlobal({ seed: FAST_CHECK_SEED })

beforeEach(({ onTestFailed }) => {
  onTestFailed(({ task }) => {
    const propertyFailed = task.result?.errors?.some((error) => /Property failed/.test(error.message ?? ''))
    if (propertyFailed) console.error(`fast-check seed ${FAST_CHECK_SEED}: KERFBOOK_FC_SEED=${FAST_CHECK_SEED} npx vitest run ${task.file.name} repeats this run`)
  })
})
