/** Every route of the web app, in one place: `path` for the router, `getHref` for links. */

function withQuery(path: string, query: Record<string, string | undefined>): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) if (value) params.set(key, value);
  const search = params.toString();
  return search ? `${path}?${search}` : path;
}

export const paths = {
  home: { path: '/', getHref: () => '/' },

  auth: {
    signIn: { path: '/sign-in', getHref: (next?: string) => withQuery('/sign-in', { next }) },
    forgotPassword: { path: '/forgot-password', getHref: () => '/forgot-password' },
    resetPassword: { path: '/reset-password', getHref: (token?: string) => withQuery('/reset-password', { token }) },
    invitation: { path: '/invitation', getHref: (token?: string) => withQuery('/invitation', { token }) },
  },

  office: { home: { path: '/office', getHref: () => '/office' } },
  field: { home: { path: '/field', getHref: () => '/field' } },
  portal: { home: { path: '/portal', getHref: () => '/portal' } },

  account: { path: '/account', getHref: () => '/account' },
  mailbox: { path: '/mailbox', getHref: (messageId?: string) => withQuery('/mailbox', { message: messageId }) },
} as const;

/** The areas of the app that belong to one kind of account. */
export type Area = 'office' | 'field' | 'portal';

export const areaHomePaths: Record<Area, string> = {
  office: paths.office.home.getHref(),
  field: paths.field.home.getHref(),
  portal: paths.portal.home.getHref(),
};

/** Which area a path belongs to, if any. */
export function areaOfPath(pathname: string): Area | null {
  for (const [area, home] of Object.entries(areaHomePaths) as [Area, string][]) {
    if (pathname === home || pathname.startsWith(`${home}/`)) return area;
  }
  return null;
}
