export const ROLES = ['member', 'staff', 'admin'] as const
export type Role = (typeof ROLES)[number]

export interface SessionUser {
  id: number
  email: string
  name: string
  role: Role
}
