export const ROLES = ['member', 'staff', 'admin'] as const
export type Role = (typeof ROLES)[number]

export interface SessionUser {
  id: number
  email: string
  name: string
  role: Role
}

/** Staff and admins run the workshop: they see and handle every member's things. */
export function isStaff(user: Pick<SessionUser, 'role'>): boolean {
  return user.role === 'staff' || user.role === 'admin'
}
