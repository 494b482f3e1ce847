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
    { to: '/plume-calculator', label: 'Plume calculator' },
    { to: '/monitoring', label: 'Monitoring' },
    { to: '/rivers', label: 'Rivers' },
    { to: '/advisers', label: 'Advisers' },
    { to: '/alerts', label: 'Alerts' },
    { to: '/plan', label: 'Plan' },
  ],
  adviser: [
    { to: '/', label: 'Overview' },
    { to: '/leases', label: 'Leases' },
    { to: '/map', label: 'Exposure map' },
    { to: '/compare', label: 'Compare' },
    { to: '/plume-calculator', label: 'Plume calculator' },
    { to: '/monitoring', label: 'Monitoring' },
    { to: '/rivers', label: 'Rivers' },
    { to: '/clients', label: 'Clients' },
    { to: '/alerts', label: 'Alerts' },
    { to: '/plan', label: 'Plan' },
  ],
  regulator: [
    { to: '/', label: 'Overview' },
    { to: '/leases', label: 'Leases' },
    { to: '/map', label: 'Exposure map' },
    { to: '/compare', label: 'Compare' },
    { to: '/plume-calculator', label: 'Plume calculator' },
    { to: '/monitoring', label: 'Monitoring' },
    { to: '/rivers', label: 'Rivers' },
    { to: '/alerts', label: 'Alerts' },
    { to: '/plan', label: 'Plan' },
    { to: '/zones', label: 'Zones' },
    { to: '/closure-check', label: 'Closure check' },
    { to: '/notices', label: 'Notices' },
    { to: '/audit-log', label: 'Audit log' },
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
