import type { Role } from '#shared/roles'

export interface NavItem {
  label: string
  to: string
  roles: Role[]
  /** `workshop`: the staff's and admin's own pages, shown on a second row. */
  area?: 'workshop'
}

// The one list of top-level pages; the layout shows each item to the roles named.
export const NAV_ITEMS: NavItem[] = [
  { label: 'Overview', to: '/', roles: ['member', 'staff', 'admin'] },
  { label: 'My jobs', to: '/jobs', roles: ['member', 'staff', 'admin'] },
  { label: 'Calendar', to: '/calendar', roles: ['member', 'staff', 'admin'] },
  { label: 'My bookings', to: '/bookings', roles: ['member'] },
  { label: 'My payments', to: '/payments', roles: ['member'] },
  { label: 'Check a file', to: '/check', roles: ['member', 'staff', 'admin'] },
  { label: 'What can I cut', to: '/catalog', roles: ['member', 'staff', 'admin'] },
  { label: 'Run sheet', to: '/staff/run-sheet', roles: ['staff', 'admin'], area: 'workshop' },
  { label: 'Review', to: '/staff/review', roles: ['staff', 'admin'], area: 'workshop' },
  { label: 'Workshop setup', to: '/staff/setup/cutters', roles: ['staff', 'admin'], area: 'workshop' },
  { label: 'Members', to: '/staff/members', roles: ['staff', 'admin'], area: 'workshop' },
  { label: 'Undelivered mail', to: '/staff/mail', roles: ['staff', 'admin'], area: 'workshop' },
  { label: 'Reports', to: '/staff/reports', roles: ['staff', 'admin'], area: 'workshop' },
  { label: 'People & roles', to: '/admin/users', roles: ['admin'], area: 'workshop' },
  { label: 'Payments', to: '/admin/payments', roles: ['admin'], area: 'workshop' },
  { label: 'Settings', to: '/admin/settings', roles: ['admin'], area: 'workshop' },
  // The local mail sink's outbox exists only under `npm run dev`: reset links must never be readable elsewhere.
  ...(import.meta.dev ? [{ label: 'Outbox', to: '/admin/outbox', roles: ['admin'] as Role[], area: 'workshop' as const }] : []),
]
