// At start, remove stored uploads that no revision refers to (left by a crash between file and row).
export default defineNitroPlugin(() => {
  databaseReady()
    .then(() => sweepOrphanUploads(useDb()))
    .then((removed) => {
      if (removed > 0) console.log(`[uploads] removed ${removed} orphaned file(s)`)
    })
    .catch((error) => console.error('[uploads] sweep failed:', error))
})
