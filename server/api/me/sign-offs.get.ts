import { listSignOffs } from '../../services/catalog/sign-offs'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return listSignOffs(useDb(), { userId: user.id, includeRevoked: true })
})
