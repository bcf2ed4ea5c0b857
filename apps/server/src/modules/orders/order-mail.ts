import type { Knex } from 'knex';
import { formatAddress } from '@underfoot/core';
import type { MailBrand } from '../company/brand.ts';
import { enqueueMail } from '../mail/outbox.repo.ts';
import type { MailTemplateName, MailVars } from '../mail/templates.ts';
import { listParties, type OrderRow } from './orders.repo.ts';

/** How a window reads in an e-mail: "on Tuesday, March 2, 2027, between 08:00 and 10:00". */
export function windowText(date: string, start: string, end: string): string {
  const day = new Intl.DateTimeFormat('en-US', { weekday: 'long', year: 'numeric', month: 'long', day: 'numeric', timeZone: 'UTC' }).format(
    new Date(`${date}T00:00:00Z`),
  );
  return `on ${day}, between ${start} and ${end}`;
}

export function longDate(date: string): string {
  return new Intl.DateTimeFormat('en-US', { weekday: 'long', year: 'numeric', month: 'long', day: 'numeric', timeZone: 'UTC' }).format(
    new Date(`${date}T00:00:00Z`),
  );
}

export async function propertyAddressOf(db: Knex, order: OrderRow): Promise<string> {
  const p = await db('properties').where({ id: order.property_id }).first();
  return formatAddress({ street: p.street, unit: p.unit, city: p.city, region: p.region, postalCode: p.postal_code });
}

/** Send one template to every party on an order (and, optionally, the assigned inspector), each with their own greeting. */
export async function mailOrderParties<T extends MailTemplateName>(
  db: Knex,
  order: OrderRow,
  brand: MailBrand,
  template: T,
  varsFor: (person: { name: string; email: string }) => MailVars<T>,
  options: { includeInspector?: boolean } = {},
): Promise<void> {
  const people = (await listParties(db, order.id)).map((p) => ({ name: p.name, email: p.email }));
  if (options.includeInspector && order.assigned_inspector_id) {
    const inspector = await db('users').where({ id: order.assigned_inspector_id }).first();
    if (inspector) people.push({ name: inspector.name, email: inspector.email });
  }
  const seen = new Set<string>();
  for (const person of people) {
    if (seen.has(person.email)) continue;
    seen.add(person.email);
    await enqueueMail(db, { companyId: order.company_id, ...brand, to: person.email, template, vars: varsFor(person) });
  }
}
