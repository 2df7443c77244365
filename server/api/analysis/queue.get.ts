// The signed-in member's own analyses: files waiting for a worker (with how many start before each) and running ones with their stage.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return analysisQueueFor(analysisOwnerKey(user))
})
