import { describe, expect, it } from 'vitest';
import { actions, can, type Actor, type OrderAccess, type Resource } from './permissions.ts';

// PRODUCT.md §10, "Who may do what", one test per row. Each row checks every column
// with the situations that make the cell true and those that must make it false.

const COMPANY = 'company-a';
const OTHER_COMPANY = 'company-b';

const office: Actor = { kind: 'user', userId: 'office-1', role: 'office', companyId: COMPANY };
const foreignOffice: Actor = { kind: 'user', userId: 'office-9', role: 'office', companyId: OTHER_COMPANY };
const inspector: Actor = { kind: 'user', userId: 'insp-1', role: 'inspector', companyId: COMPANY };
const otherInspector: Actor = { kind: 'user', userId: 'insp-2', role: 'inspector', companyId: COMPANY };
const buyersAgent: Actor = { kind: 'user', userId: 'agent-b', role: 'agent', companyId: COMPANY };
const listingAgent: Actor = { kind: 'user', userId: 'agent-l', role: 'agent', companyId: COMPANY };
const strangerAgent: Actor = { kind: 'user', userId: 'agent-x', role: 'agent', companyId: COMPANY };
const buyer: Actor = { kind: 'user', userId: 'client-b', role: 'client', companyId: COMPANY };
const seller: Actor = { kind: 'user', userId: 'client-s', role: 'client', companyId: COMPANY };
const strangerClient: Actor = { kind: 'user', userId: 'client-x', role: 'client', companyId: COMPANY };
const guest: Actor = { kind: 'guest', reportId: 'report-1' };
const otherGuest: Actor = { kind: 'guest', reportId: 'report-2' };

/** A pre-purchase order placed by the buyer's side. */
function order(overrides: Partial<OrderAccess> = {}): OrderAccess {
  return {
    companyId: COMPANY,
    status: 'scheduled',
    assignedInspectorId: 'insp-1',
    orderingSide: 'buyer',
    parties: [
      { userId: 'agent-b', partyRole: 'buyers_agent' },
      { userId: 'client-b', partyRole: 'buyer' },
      { userId: 'agent-l', partyRole: 'listing_agent' },
      { userId: 'client-s', partyRole: 'seller' },
    ],
    releasedTo: [],
    reportId: null,
    published: false,
    ...overrides,
  };
}
const published = order({ status: 'published', published: true, reportId: 'report-1', releasedTo: ['buyer'] });
const disclosed = order({ status: 'published', published: true, reportId: 'report-1', releasedTo: ['buyer', 'seller'] });
const r = (o: OrderAccess, extra: Partial<Resource> = {}): Resource => ({ order: o, ...extra });

describe('PRODUCT.md §10 — every row of the table', () => {
  it('create an order: office yes, inspector no, agent yes, client no, guest no', () => {
    const company = { companyId: COMPANY };
    expect(can(office, 'order.create', company)).toBe(true);
    expect(can(foreignOffice, 'order.create', company)).toBe(false);
    expect(can(inspector, 'order.create', company)).toBe(false);
    expect(can(strangerAgent, 'order.create', company)).toBe(true);
    expect(can(buyer, 'order.create', company)).toBe(false);
    expect(can(guest, 'order.create', company)).toBe(false);
  });

  it('see an order and its status: office own company, inspector assigned, agent and client on the order', () => {
    const o = r(order());
    expect(can(office, 'order.view', o)).toBe(true);
    expect(can(foreignOffice, 'order.view', o)).toBe(false);
    expect(can(inspector, 'order.view', o)).toBe(true);
    expect(can(otherInspector, 'order.view', o)).toBe(false);
    expect(can(buyersAgent, 'order.view', o)).toBe(true);
    expect(can(strangerAgent, 'order.view', o)).toBe(false);
    expect(can(buyer, 'order.view', o)).toBe(true);
    expect(can(strangerClient, 'order.view', o)).toBe(false);
    expect(can(guest, 'order.view', r(published))).toBe(false);
  });

  it('schedule, assign, cancel, refund: office yes; agent may only cancel before it is scheduled', () => {
    const requested = r(order({ status: 'requested', assignedInspectorId: null }));
    const scheduled = r(order());
    expect(can(office, 'order.schedule', scheduled)).toBe(true);
    expect(can(foreignOffice, 'order.schedule', scheduled)).toBe(false);
    expect(can(office, 'order.cancel', scheduled)).toBe(true);
    for (const actor of [inspector, buyersAgent, buyer, guest]) expect(can(actor, 'order.schedule', requested)).toBe(false);
    expect(can(buyersAgent, 'order.cancel', requested)).toBe(true);
    expect(can(buyersAgent, 'order.cancel', scheduled)).toBe(false);
    expect(can(strangerAgent, 'order.cancel', requested)).toBe(false);
    expect(can(inspector, 'order.cancel', requested)).toBe(false);
    expect(can(buyer, 'order.cancel', requested)).toBe(false);
    expect(can(guest, 'order.cancel', requested)).toBe(false);
  });

  it('edit inspection data, upload, mark up: office until published, inspector assigned until published', () => {
    const draft = r(order({ status: 'recorded' }));
    expect(can(office, 'inspection.edit', draft)).toBe(true);
    expect(can(office, 'inspection.edit', r(published))).toBe(false);
    expect(can(foreignOffice, 'inspection.edit', draft)).toBe(false);
    expect(can(inspector, 'inspection.edit', draft)).toBe(true);
    expect(can(inspector, 'inspection.edit', r(published))).toBe(false);
    expect(can(otherInspector, 'inspection.edit', draft)).toBe(false);
    for (const actor of [buyersAgent, buyer, guest]) expect(can(actor, 'inspection.edit', draft)).toBe(false);
  });

  it('price book, company settings, users: office only', () => {
    const company = { companyId: COMPANY };
    expect(can(office, 'company.manage', company)).toBe(true);
    expect(can(foreignOffice, 'company.manage', company)).toBe(false);
    for (const actor of [inspector, buyersAgent, buyer, guest]) expect(can(actor, 'company.manage', company)).toBe(false);
  });

  it('publish, amend: office yes; inspector only if the company allows and assigned', () => {
    const ready = order({ status: 'in_review' });
    expect(can(office, 'report.publish', r(ready))).toBe(true);
    expect(can(foreignOffice, 'report.publish', r(ready))).toBe(false);
    expect(can(inspector, 'report.publish', r(ready, { inspectorsMayPublish: true }))).toBe(true);
    expect(can(inspector, 'report.publish', r(ready, { inspectorsMayPublish: false }))).toBe(false);
    expect(can(otherInspector, 'report.publish', r(ready, { inspectorsMayPublish: true }))).toBe(false);
    for (const actor of [buyersAgent, buyer, guest])
      expect(can(actor, 'report.publish', r(ready, { inspectorsMayPublish: true }))).toBe(false);
  });

  it('read the report: office yes, inspector assigned, agent and client when released to their side, guest that report only', () => {
    expect(can(office, 'report.read', r(published))).toBe(true);
    expect(can(foreignOffice, 'report.read', r(published))).toBe(false);
    expect(can(inspector, 'report.read', r(published))).toBe(true);
    expect(can(otherInspector, 'report.read', r(published))).toBe(false);
    // Released to the ordering (buyer) side only.
    expect(can(buyersAgent, 'report.read', r(published))).toBe(true);
    expect(can(buyer, 'report.read', r(published))).toBe(true);
    expect(can(listingAgent, 'report.read', r(published))).toBe(false);
    expect(can(seller, 'report.read', r(published))).toBe(false);
    // After disclosure, the other side reads it too.
    expect(can(listingAgent, 'report.read', r(disclosed))).toBe(true);
    expect(can(seller, 'report.read', r(disclosed))).toBe(true);
    // Not before it is published, even on the ordering side.
    expect(can(buyer, 'report.read', r(order({ releasedTo: ['buyer'] })))).toBe(false);
    expect(can(strangerClient, 'report.read', r(disclosed))).toBe(false);
    expect(can(guest, 'report.read', r(published))).toBe(true);
    expect(can(otherGuest, 'report.read', r(published))).toBe(false);
  });

  it('disclose to the other side: the ordering side only', () => {
    expect(can(buyersAgent, 'report.disclose', r(published))).toBe(true);
    expect(can(buyer, 'report.disclose', r(published))).toBe(true);
    expect(can(listingAgent, 'report.disclose', r(published))).toBe(false);
    expect(can(seller, 'report.disclose', r(published))).toBe(false);
    for (const actor of [office, inspector, guest]) expect(can(actor, 'report.disclose', r(published))).toBe(false);
    const preListing = order({
      orderingSide: 'seller',
      status: 'published',
      published: true,
      reportId: 'report-1',
      releasedTo: ['seller'],
    });
    expect(can(listingAgent, 'report.disclose', r(preListing))).toBe(true);
    expect(can(buyersAgent, 'report.disclose', r(preListing))).toBe(false);
  });

  it('make or revoke a share link: office yes, agent on the ordering side, nobody else', () => {
    expect(can(office, 'shareLink.manage', r(published))).toBe(true);
    expect(can(foreignOffice, 'shareLink.manage', r(published))).toBe(false);
    expect(can(buyersAgent, 'shareLink.manage', r(published))).toBe(true);
    expect(can(listingAgent, 'shareLink.manage', r(disclosed))).toBe(false);
    for (const actor of [inspector, buyer, guest]) expect(can(actor, 'shareLink.manage', r(published))).toBe(false);
  });

  it('ask a question / answer it: agents and clients ask, office and the assigned inspector answer', () => {
    expect(can(buyersAgent, 'question.ask', r(published))).toBe(true);
    expect(can(buyer, 'question.ask', r(published))).toBe(true);
    expect(can(seller, 'question.ask', r(published))).toBe(false);
    expect(can(seller, 'question.ask', r(disclosed))).toBe(true);
    expect(can(office, 'question.ask', r(published))).toBe(false);
    expect(can(guest, 'question.ask', r(published))).toBe(false);
    expect(can(office, 'question.answer', r(published))).toBe(true);
    expect(can(inspector, 'question.answer', r(published))).toBe(true);
    expect(can(otherInspector, 'question.answer', r(published))).toBe(false);
    for (const actor of [buyersAgent, buyer, guest]) expect(can(actor, 'question.answer', r(published))).toBe(false);
  });

  it('pay: agent or client on the order', () => {
    const o = r(order({ status: 'requested' }));
    expect(can(buyersAgent, 'order.pay', o)).toBe(true);
    expect(can(buyer, 'order.pay', o)).toBe(true);
    expect(can(strangerClient, 'order.pay', o)).toBe(false);
    for (const actor of [office, inspector, guest]) expect(can(actor, 'order.pay', o)).toBe(false);
  });

  it('see who viewed the report: office yes, agent on the ordering side', () => {
    expect(can(office, 'report.viewLog', r(published))).toBe(true);
    expect(can(buyersAgent, 'report.viewLog', r(published))).toBe(true);
    expect(can(listingAgent, 'report.viewLog', r(disclosed))).toBe(false);
    for (const actor of [inspector, buyer, guest]) expect(can(actor, 'report.viewLog', r(published))).toBe(false);
  });

  it('nobody signed out may do anything', () => {
    for (const action of actions) expect(can(null, action, r(disclosed, { companyId: COMPANY }))).toBe(false);
  });

  it('no one reaches across companies', () => {
    const foreign = r(
      order({ companyId: OTHER_COMPANY, status: 'published', published: true, reportId: 'report-1', releasedTo: ['buyer', 'seller'] }),
    );
    for (const action of actions) {
      for (const actor of [office, inspector, buyersAgent, buyer])
        expect(can(actor, action, { ...foreign, companyId: OTHER_COMPANY })).toBe(false);
    }
  });
});
