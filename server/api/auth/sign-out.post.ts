export default defineApiHandler(async (event) => {
  await endUserSession(event)
  return { ok: true }
})
