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

  office: {
    home: { path: '/office', getHref: () => '/office' },
    orders: { path: '/office/orders', getHref: () => '/office/orders' },
    newOrder: { path: '/office/orders/new', getHref: () => '/office/orders/new' },
    order: { path: '/office/orders/:orderId', getHref: (orderId: string) => `/office/orders/${encodeURIComponent(orderId)}` },
  },
  field: {
    home: { path: '/field', getHref: (date?: string) => withQuery('/field', { date }) },
    order: { path: '/field/orders/:orderId', getHref: (orderId: string) => `/field/orders/${encodeURIComponent(orderId)}` },
  },
  portal: {
    home: { path: '/portal', getHref: () => '/portal' },
    newOrder: { path: '/portal/orders/new', getHref: () => '/portal/orders/new' },
    order: { path: '/portal/orders/:orderId', getHref: (orderId: string) => `/portal/orders/${encodeURIComponent(orderId)}` },
  },

  /** The office running the company (PRODUCT.md §10: price book, company settings, users). */
  company: {
    profile: { path: '/office/company', getHref: () => '/office/company' },
    people: { path: '/office/company/people', getHref: () => '/office/company/people' },
    fees: { path: '/office/company/fees', getHref: () => '/office/company/fees' },
    priceBook: { path: '/office/company/price-book', getHref: () => '/office/company/price-book' },
    settings: { path: '/office/company/settings', getHref: () => '/office/company/settings' },
    audit: { path: '/office/company/audit', getHref: () => '/office/company/audit' },
  },
  /** Agents joining a company that allows it, and the link from their confirmation e-mail. */
  signUp: {
    form: { path: '/join/:companyId', getHref: (companyId: string) => `/join/${encodeURIComponent(companyId)}` },
    verify: { path: '/join/verify', getHref: (token?: string) => withQuery('/join/verify', { token }) },
  },
  /** The link sent to a new e-mail address; it works signed in or not. */
  confirmEmail: { path: '/account/confirm-email', getHref: (token?: string) => withQuery('/account/confirm-email', { token }) },

  /** Recording the line of one order: the field app's editor; the office opens the same screen from its area. */
  inspection: {
    field: {
      path: '/field/orders/:orderId/inspection',
      getHref: (orderId: string) => `/field/orders/${encodeURIComponent(orderId)}/inspection`,
    },
    office: {
      path: '/office/orders/:orderId/inspection',
      getHref: (orderId: string) => `/office/orders/${encodeURIComponent(orderId)}/inspection`,
    },
  },

  /** Published reports: the reader's page in each area (the office and field pages also hold the review), and guests' links. */
  reports: {
    portal: { path: '/portal/reports/:orderId', getHref: (orderId: string) => `/portal/reports/${encodeURIComponent(orderId)}` },
    office: { path: '/office/reports/:orderId', getHref: (orderId: string) => `/office/reports/${encodeURIComponent(orderId)}` },
    field: { path: '/field/reports/:orderId', getHref: (orderId: string) => `/field/reports/${encodeURIComponent(orderId)}` },
    shared: { path: '/shared/:token', getHref: (token: string) => `/shared/${encodeURIComponent(token)}` },
  },

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
