import type { Role } from '#shared/roles'

export interface NavItem {
  label: string
  to: string
  roles: Role[]
}

// The one list of top-level pages; the layout shows each item to the roles named.
export const NAV_ITEMS: NavItem[] = [
  { label: 'Overview', to: '/', roles: ['member', 'staff', 'admin'] },
  { label: 'My jobs', to: '/jobs', roles: ['member', 'staff', 'admin'] },
  { label: 'Calendar', to: '/calendar', roles: ['member', 'staff', 'admin'] },
  { label: 'My bookings', to: '/bookings', roles: ['member'] },
  { label: 'Review', to: '/staff/review', roles: ['staff', 'admin'] },
  { label: 'Check a file', to: '/check', roles: ['member', 'staff', 'admin'] },
  { label: 'What can I cut', to: '/catalog', roles: ['member', 'staff', 'admin'] },
  { label: 'Workshop setup', to: '/staff/setup/cutters', roles: ['staff', 'admin'] },
  { label: 'Members', to: '/staff/members', roles: ['staff', 'admin'] },
  { label: 'Outbox', to: '/staff/outbox', roles: ['staff', 'admin'] },
  { label: 'People & roles', to: '/admin/users', roles: ['admin'] },
]
