import type { Role } from '@localis/shared';
import type { RouteLocationRaw } from 'vue-router';

export interface NavItem {
  label: string;
  to: RouteLocationRaw;
  icon: string;
  testId: string;
  /** Shown to holders of any of these roles; none means everyone signed in. */
  roles?: Role[];
}

/** The main navigation. Later slices append their features here. */
export const NAV_ITEMS: NavItem[] = [
  { label: 'Home', to: { name: 'home' }, icon: 'pi pi-home', testId: 'nav-home' },
  { label: 'Campaigns', to: { name: 'campaigns' }, icon: 'pi pi-briefcase', testId: 'nav-campaigns', roles: ['researcher', 'pi', 'committee', 'admin'] },
  { label: 'Committee', to: { name: 'committee' }, icon: 'pi pi-inbox', testId: 'nav-committee', roles: ['committee', 'admin'] },
  { label: 'Invoices', to: { name: 'invoices' }, icon: 'pi pi-receipt', testId: 'nav-invoices', roles: ['admin', 'billing'] },
  { label: 'Profile', to: { name: 'profile' }, icon: 'pi pi-user', testId: 'nav-profile' },
  { label: 'Rounds', to: { name: 'admin-rounds' }, icon: 'pi pi-calendar', testId: 'nav-rounds', roles: ['admin'] },
  { label: 'People', to: { name: 'admin-people' }, icon: 'pi pi-users', testId: 'nav-people', roles: ['admin'] },
  { label: 'Institutions', to: { name: 'admin-institutions' }, icon: 'pi pi-building', testId: 'nav-institutions', roles: ['admin'] },
  { label: 'Audit log', to: { name: 'admin-audit' }, icon: 'pi pi-history', testId: 'nav-audit', roles: ['admin'] },
];

export function visibleNavItems(items: readonly NavItem[], roles: readonly Role[]): NavItem[] {
  return items.filter((item) => !item.roles || item.roles.some((role) => roles.includes(role)));
}
