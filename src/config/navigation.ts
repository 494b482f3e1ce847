import type { Role } from '#shared/schemas/roles';

export interface NavItem {
  to: string;
  label: string;
}

/**
 * What each role sees in the top band. Pages join this list as they are built;
 * the server still checks every call, so the list is a convenience, not a guard.
 */
export const NAVIGATION: Record<Role, NavItem[]> = {
  grower: [
    { to: '/', label: 'Overview' },
    { to: '/leases', label: 'Leases' },
    { to: '/map', label: 'Exposure map' },
    { to: '/compare', label: 'Compare' },
    { to: '/rivers', label: 'Rivers' },
    { to: '/monitoring', label: 'Monitoring' },
    { to: '/alerts', label: 'Alerts' },
    { to: '/advisers', label: 'Advisers' },
    { to: '/plan', label: 'Plan' },
    { to: '/plume-calculator', label: 'Plume calculator' },
  ],
  adviser: [
    { to: '/', label: 'Overview' },
    { to: '/clients', label: 'Clients' },
    { to: '/leases', label: 'Leases' },
    { to: '/map', label: 'Exposure map' },
    { to: '/compare', label: 'Compare' },
    { to: '/rivers', label: 'Rivers' },
    { to: '/monitoring', label: 'Monitoring' },
    { to: '/alerts', label: 'Alerts' },
    { to: '/plan', label: 'Plan' },
    { to: '/plume-calculator', label: 'Plume calculator' },
  ],
  // The authority works zone first; alerts are free for it (no Plan), and it has no candidate sites to compare.
  regulator: [
    { to: '/', label: 'Overview' },
    { to: '/zones', label: 'Zones' },
    { to: '/closure-check', label: 'Closure check' },
    { to: '/notices', label: 'Notices' },
    { to: '/leases', label: 'Leases' },
    { to: '/map', label: 'Exposure map' },
    { to: '/rivers', label: 'Rivers' },
    { to: '/monitoring', label: 'Monitoring' },
    { to: '/alerts', label: 'Alerts' },
    { to: '/audit-log', label: 'Audit log' },
    { to: '/plume-calculator', label: 'Plume calculator' },
  ],
  admin: [
    { to: '/', label: 'Overview' },
    { to: '/admin/people', label: 'People' },
    { to: '/admin/outbox', label: 'Outbox' },
    { to: '/admin/audit', label: 'Audit log' },
  ],
};

export const ROLE_LABEL: Record<Role, string> = {
  grower: 'Grower',
  adviser: 'Adviser',
  regulator: 'Regulator',
  admin: 'Administrator',
};
