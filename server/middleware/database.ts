// No request touches the database before the migrations have run.
export default defineEventHandler(async () => {
  await databaseReady()
})
