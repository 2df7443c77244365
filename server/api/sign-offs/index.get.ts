import { signOffListQuerySchema } from '#shared/schemas/catalog'
import { listSignOffs } from '../../services/catalog/sign-offs'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { includeRevoked, ...filter } = readQueryAs(event, signOffListQuerySchema)
  return listSignOffs(useDb(), { ...filter, includeRevoked: includeRevoked === 'true' })
})
