// Bring the schema up to date as the server starts, so a fresh clone just works.
export default defineNitroPlugin(() => {
  databaseReady().catch((error) => {
    console.error('[db] migration failed:', error)
    process.exitCode = 1
  })
})
