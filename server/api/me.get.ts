export default defineApiHandler(async (event) => {
  const { id, email, name, role } = await requireUser(event)
  return { id, email, name, role }
})
