/**
 * Who may do what (PRODUCT.md §10), as data plus one interpreter.
 *
 * The server guards every route with `can`, and the web hides the buttons with
 * the same call, so the two never disagree.
 */

export const roles = ['office', 'inspector', 'agent', 'client'] as const;
export type Role = (typeof roles)[number];

/** A person's role on one order. */
export const partyRoles = ['buyers_agent', 'listing_agent', 'buyer', 'seller'] as const;
export type PartyRole = (typeof partyRoles)[number];

export const sides = ['buyer', 'seller'] as const;
export type Side = (typeof sides)[number];

export function sideOf(partyRole: PartyRole): Side {
  return partyRole === 'buyers_agent' || partyRole === 'buyer' ? 'buyer' : 'seller';
}

/** The other side of the sale. */
export function otherSide(side: Side): Side {
  return side === 'buyer' ? 'seller' : 'buyer';
}

export const orderStatuses = ['requested', 'scheduled', 'recorded', 'in_review', 'published', 'cancelled'] as const;
export type OrderStatus = (typeof orderStatuses)[number];

export type Actor =
  | { kind: 'user'; userId: string; role: Role; companyId: string }
  /** Someone holding a live share link; the server only builds this for a link that is neither expired nor revoked. */
  | { kind: 'guest'; reportId: string };

/** What a rule needs to know about an order; the server loads it, the web gets it from the API. */
export interface OrderAccess {
  companyId: string;
  status: OrderStatus;
  assignedInspectorId: string | null;
  orderingSide: Side;
  parties: readonly { userId: string; partyRole: PartyRole }[];
  /** Sides the published report has been released to: the ordering side once released, the other side after disclosure. */
  releasedTo: readonly Side[];
  /** The report that belongs to this order, once a first revision is published (amendments keep it readable). */
  reportId: string | null;
  /** True while the order stands published: inspection data is frozen (an amendment in progress reopens it). */
  published: boolean;
}

export interface Resource {
  /** The company the action happens in (for company-wide actions such as creating an order or editing the price book). */
  companyId?: string;
  order?: OrderAccess;
  /** Company setting: whether trusted inspectors may publish and amend. */
  inspectorsMayPublish?: boolean;
}

export const actions = [
  'order.create',
  'order.view',
  'order.schedule',
  'order.cancel',
  'inspection.edit',
  'company.manage',
  'report.publish',
  'report.read',
  'report.disclose',
  'shareLink.manage',
  'question.ask',
  'question.answer',
  'order.pay',
  'report.viewLog',
] as const;
export type Action = (typeof actions)[number];

/** The named conditions the table uses. Each is a plain predicate below. */
export type Rule =
  | 'no'
  | 'ownCompany'
  | 'anyInOwnCompany'
  | 'assigned'
  | 'assignedUntilPublished'
  | 'ownCompanyUntilPublished'
  | 'assignedIfCompanyAllows'
  | 'onOrder'
  | 'onOrderBeforeScheduled'
  | 'orderingSide'
  | 'releasedToTheirSide'
  | 'thatReportOnly';

export type Column = Role | 'guest';

/**
 * PRODUCT.md §10, row by row. "agent" and "client" mean a person with that
 * account role who is a party on the order, except for creating an order.
 */
export const permissionTable: Record<Action, Record<Column, Rule>> = {
  'order.create': { office: 'anyInOwnCompany', inspector: 'no', agent: 'anyInOwnCompany', client: 'no', guest: 'no' },
  'order.view': { office: 'ownCompany', inspector: 'assigned', agent: 'onOrder', client: 'onOrder', guest: 'no' },
  'order.schedule': { office: 'ownCompany', inspector: 'no', agent: 'no', client: 'no', guest: 'no' },
  'order.cancel': { office: 'ownCompany', inspector: 'no', agent: 'onOrderBeforeScheduled', client: 'no', guest: 'no' },
  'inspection.edit': {
    office: 'ownCompanyUntilPublished',
    inspector: 'assignedUntilPublished',
    agent: 'no',
    client: 'no',
    guest: 'no',
  },
  'company.manage': { office: 'anyInOwnCompany', inspector: 'no', agent: 'no', client: 'no', guest: 'no' },
  'report.publish': { office: 'ownCompany', inspector: 'assignedIfCompanyAllows', agent: 'no', client: 'no', guest: 'no' },
  'report.read': {
    office: 'ownCompany',
    inspector: 'assigned',
    agent: 'releasedToTheirSide',
    client: 'releasedToTheirSide',
    guest: 'thatReportOnly',
  },
  'report.disclose': { office: 'no', inspector: 'no', agent: 'orderingSide', client: 'orderingSide', guest: 'no' },
  'shareLink.manage': { office: 'ownCompany', inspector: 'no', agent: 'orderingSide', client: 'no', guest: 'no' },
  'question.ask': { office: 'no', inspector: 'no', agent: 'releasedToTheirSide', client: 'releasedToTheirSide', guest: 'no' },
  'question.answer': { office: 'ownCompany', inspector: 'assigned', agent: 'no', client: 'no', guest: 'no' },
  'order.pay': { office: 'no', inspector: 'no', agent: 'onOrder', client: 'onOrder', guest: 'no' },
  'report.viewLog': { office: 'ownCompany', inspector: 'no', agent: 'orderingSide', client: 'no', guest: 'no' },
};

type UserActor = Extract<Actor, { kind: 'user' }>;

function partyOf(actor: UserActor, order: OrderAccess) {
  return order.parties.filter((p) => p.userId === actor.userId);
}

function sameCompany(actor: UserActor, order: OrderAccess) {
  return order.companyId === actor.companyId;
}

const rules: Record<Exclude<Rule, 'thatReportOnly'>, (actor: UserActor, resource: Resource) => boolean> = {
  no: () => false,
  anyInOwnCompany: (a, r) => r.companyId === a.companyId,
  ownCompany: (a, r) => !!r.order && sameCompany(a, r.order),
  ownCompanyUntilPublished: (a, r) => !!r.order && sameCompany(a, r.order) && !r.order.published,
  assigned: (a, r) => !!r.order && sameCompany(a, r.order) && r.order.assignedInspectorId === a.userId,
  assignedUntilPublished: (a, r) => !!r.order && sameCompany(a, r.order) && r.order.assignedInspectorId === a.userId && !r.order.published,
  assignedIfCompanyAllows: (a, r) =>
    !!r.order && sameCompany(a, r.order) && r.order.assignedInspectorId === a.userId && r.inspectorsMayPublish === true,
  onOrder: (a, r) => !!r.order && sameCompany(a, r.order) && partyOf(a, r.order).length > 0,
  onOrderBeforeScheduled: (a, r) =>
    !!r.order && sameCompany(a, r.order) && partyOf(a, r.order).length > 0 && r.order.status === 'requested',
  orderingSide: (a, r) => {
    const order = r.order;
    return !!order && sameCompany(a, order) && partyOf(a, order).some((p) => sideOf(p.partyRole) === order.orderingSide);
  },
  releasedToTheirSide: (a, r) => {
    const order = r.order;
    return (
      !!order &&
      sameCompany(a, order) &&
      order.reportId !== null &&
      partyOf(a, order).some((p) => order.releasedTo.includes(sideOf(p.partyRole)))
    );
  },
};

/** May this actor do this action on this resource? */
export function can(actor: Actor | null | undefined, action: Action, resource: Resource = {}): boolean {
  if (!actor) return false;
  if (actor.kind === 'guest') {
    const rule = permissionTable[action].guest;
    return rule === 'thatReportOnly' && !!resource.order && resource.order.reportId !== null && resource.order.reportId === actor.reportId;
  }
  const rule = permissionTable[action][actor.role];
  if (rule === 'thatReportOnly') return false;
  return rules[rule](actor, resource);
}

/** The landing area of each role in the web app. */
export const homeAreaOf: Record<Role, 'office' | 'field' | 'portal'> = {
  office: 'office',
  inspector: 'field',
  agent: 'portal',
  client: 'portal',
};
