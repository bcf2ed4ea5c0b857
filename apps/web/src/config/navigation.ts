import { can, homeAreaOf, type CurrentUser } from '@underfoot/core';
import { actorOf } from '@/lib/auth';
import { areaHomePaths, paths } from './paths';
import { areaLabels } from './roles';

export interface NavItem {
  label: string;
  to: string;
  /** Match only the exact path (for area homes that have sub-pages later). */
  end?: boolean;
}

/** The main navigation: each person sees their own area only (PRODUCT.md §2, §10). */
export function mainNavigationFor(user: CurrentUser): NavItem[] {
  const area = homeAreaOf[user.role];
  // The office home is the scheduling queue; every order, in any status, is one step away.
  if (area === 'office')
    return [
      { label: areaLabels[area], to: areaHomePaths[area], end: true },
      { label: 'All orders', to: paths.office.orders.getHref() },
      ...(can(actorOf(user), 'company.manage', { companyId: user.companyId }) ? companyNavItem : []),
    ];
  return [{ label: areaLabels[area], to: areaHomePaths[area] }];
}

/** The office's company pages: one link in the main navigation, the sections as tabs inside. */
const companyNavItem: NavItem[] = [{ label: 'Company', to: paths.company.profile.getHref() }];

export const companyNavigation: NavItem[] = [
  { label: 'Profile', to: paths.company.profile.getHref(), end: true },
  { label: 'People', to: paths.company.people.getHref() },
  { label: 'Fee list', to: paths.company.fees.getHref() },
  { label: 'Price book', to: paths.company.priceBook.getHref() },
  { label: 'Report settings', to: paths.company.settings.getHref() },
  { label: 'Audit trail', to: paths.company.audit.getHref() },
];

export const accountNavItem: NavItem = { label: 'Account', to: paths.account.getHref() };
