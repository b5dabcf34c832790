import type { IconName } from '@/components/Icon';
import type { Permission } from './permissions';

/** The signed-in menu. Each entry shows only to roles the permission table allows. */
/**
 * `phone`: the place in the phone's bottom bar (lower first). The bar shows the
 * first four entries a role may see; the rest sit under "More".
 */
export type NavItem = { href: string; label: string; icon: IconName; permission: Permission; phone?: number };
export const PHONE_BAR_SIZE = 4;

export const NAV_ITEMS: NavItem[] = [
  { href: '/', label: 'Overview', icon: 'home', permission: 'scheme:read', phone: 0 },
  { href: '/funds', label: 'Funds', icon: 'pie', permission: 'funds:read' },
  { href: '/assumptions', label: 'Assumptions', icon: 'sliders', permission: 'assumptions:read' },
  { href: '/options', label: 'Options', icon: 'path', permission: 'options:read' },
  { href: '/members', label: 'Members', icon: 'card', permission: 'members:read' },
  { href: '/projections', label: 'Projections', icon: 'chart', permission: 'runs:read', phone: 1 },
  { href: '/reports', label: 'Reports', icon: 'document', permission: 'reports:read', phone: 3 },
  { href: '/reviews', label: 'Reviews', icon: 'seal', permission: 'reviews:read' },
  { href: '/statements', label: 'Statements', icon: 'document', permission: 'statements:export', phone: 3 },
  { href: '/outbox', label: 'Outbox', icon: 'upload', permission: 'people:manage' },
  { href: '/people', label: 'People', icon: 'people', permission: 'people:manage', phone: 2 },
  { href: '/activity', label: 'Activity', icon: 'log', permission: 'audit:read' },
  { href: '/settings', label: 'Settings', icon: 'gear', permission: 'settings:read' },
  { href: '/account', label: 'Account', icon: 'person', permission: 'scheme:read' },
];
