import { homeAreaOf, type CurrentUser } from '@underfoot/core';
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
  return [{ label: areaLabels[area], to: areaHomePaths[area] }];
}

export const accountNavItem: NavItem = { label: 'Account', to: paths.account.getHref() };
