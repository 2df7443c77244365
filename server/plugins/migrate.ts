// Bring the schema up to date as the server starts, so a fresh clone just works; close the connections as it stops.
export default defineNitroPlugin((nitro) => {
  databaseReady().catch((error) => {
    console.error('[db] migration failed:', error)
    process.exitCode = 1
  })
  nitro.hooks.hook('close', () => closeDatabase())
})
