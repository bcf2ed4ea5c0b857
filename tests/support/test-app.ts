import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Express } from 'express';
import knex from 'knex';
import request from 'supertest';
import type { Role } from '@underfoot/core';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { startFakePayments, startFakeSmtp, type FakePayments, type FakeSmtp } from '@underfoot/fakes';
import { createApp, createServices, hashPassword, parseConfig, type Config, type Services } from '@underfoot/server';

export const TEST_PASSWORD = 'correct horse battery';

export interface TestContext {
  app: Express;
  config: Config;
  services: Services;
  mail: FakeSmtp;
  /** The fake payment provider; its webhooks reach this app, which listens on a loopback port. */
  payments: FakePayments;
  baseUrl: string;
  companyId: string;
  users: Record<Role, { id: string; email: string }>;
  addUser(role: Role, email: string, companyId?: string): Promise<{ id: string; email: string }>;
  addCompany(name: string): Promise<string>;
  close(): Promise<void>;
}

/** A whole app on a temporary SQLite file (or a PostgreSQL database of its own, see createScratchDatabase), with the fake SMTP server on free loopback ports. */
export async function createTestContext(env: Record<string, string> = {}): Promise<TestContext> {
  const dataDir = mkdtempSync(path.join(tmpdir(), 'underfoot-api-'));
  const database = process.env.DATABASE_URL ? await createScratchDatabase(process.env.DATABASE_URL) : undefined;
  const mail = await startFakeSmtp();
  const config = parseConfig({
    NODE_ENV: 'test',
    DATA_DIR: dataDir,
    LOG_LEVEL: process.env.TEST_LOG_LEVEL ?? 'silent',
    PASSWORD_HASH_COST: '10',
    MAIL_POLL_MS: '50',
    PUBLIC_URL: 'http://underfoot.test',
    ...(database ? { DATABASE_URL: database.url } : {}),
    ...env,
  });
  const payments = await startFakePayments({
    webhookUrl: 'http://127.0.0.1:9/not-yet',
    webhookSecret: config.payments.webhookSecret,
    webhookRetryDelaysMs: [100, 200],
  });
  const services = await createServices(config, {
    fakeMail: { host: mail.host, smtpPort: mail.smtpPort, httpPort: mail.httpPort },
    fakePayments: { host: payments.host, port: payments.port },
  });
  const app = createApp(config, services);
  const server: Server = await new Promise((resolve) => {
    const listening = app.listen(0, '127.0.0.1', () => resolve(listening));
  });
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  payments.setWebhookUrl(`${baseUrl}/api/payments/webhook`);
  const { db } = services;
  const now = new Date().toISOString();
  const passwordHash = await hashPassword(TEST_PASSWORD, 10);

  const addCompany = async (name: string) => {
    const id = crypto.randomUUID();
    await db('companies').insert({ id, name, created_at: now, updated_at: now });
    return id;
  };
  const companyId = await addCompany('Mudlark Drain Testing');
  const addUser = async (role: Role, email: string, company = companyId) => {
    const id = crypto.randomUUID();
    await db('users').insert({
      id,
      company_id: company,
      email,
      name: `${role} person`,
      role,
      password_hash: passwordHash,
      email_verified_at: now,
      created_at: now,
      updated_at: now,
    });
    return { id, email };
  };
  const users = {
    office: await addUser('office', 'office@mudlark.test'),
    inspector: await addUser('inspector', 'inspector@mudlark.test'),
    agent: await addUser('agent', 'agent@realty.test'),
    client: await addUser('client', 'buyer@home.test'),
  };

  return {
    app,
    config,
    services,
    mail,
    payments,
    baseUrl,
    companyId,
    users,
    addUser,
    addCompany,
    async close() {
      server.closeAllConnections();
      await new Promise((resolve) => server.close(resolve));
      await payments.close();
      await services.close();
      await mail.close();
      await database?.drop();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/**
 * With DATABASE_URL set (`npm run test:pg`), each test context gets a fresh PostgreSQL database
 * of its own, made and dropped through an admin connection to that URL.
 */
async function createScratchDatabase(adminUrl: string) {
  const name = `underfoot_t_${crypto.randomUUID().replaceAll('-', '')}`;
  const admin = () => knex({ client: 'pg', connection: adminUrl, pool: { min: 0, max: 1 } });
  const creator = admin();
  try {
    await creator.raw('create database ??', [name]);
  } finally {
    await creator.destroy();
  }
  const url = new URL(adminUrl);
  url.pathname = `/${name}`;
  return {
    url: url.toString(),
    async drop() {
      const dropper = admin();
      try {
        // FORCE: a connection the app left behind must not keep the database alive.
        await dropper.raw('drop database if exists ?? with (force)', [name]);
      } finally {
        await dropper.destroy();
      }
    },
  };
}

/** A cookie-keeping client that fetches a CSRF token first, as the web app does. */
export async function browserLikeAgent(app: Express) {
  const agent = request.agent(app);
  const csrfResponse = await agent.get('/api/auth/csrf').expect(200);
  let token: string = csrfResponse.body.token;
  return {
    agent,
    get token() {
      return token;
    },
    set token(value: string) {
      token = value;
    },
    /** POST with the token; a response that starts a new session hands back its new token, kept here. */
    async post(url: string, body?: object) {
      const res = await agent
        .post(url)
        .set('x-csrf-token', token)
        .send(body ?? {});
      if (typeof res.body?.csrfToken === 'string') token = res.body.csrfToken;
      return res;
    },
    signIn(email: string, password = TEST_PASSWORD) {
      return this.post('/api/auth/sign-in', { email, password });
    },
  };
}

/** Wait until the fake mailbox holds a message for this address (the outbox sends asynchronously). */
export async function waitForMail(mail: FakeSmtp, to: string, subjectIncludes = '', timeoutMs = 5_000) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const found = mail.messages().find((m) => m.to.includes(to) && m.subject.includes(subjectIncludes));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 25));
  }
  throw new Error(`no mail to ${to} with "${subjectIncludes}" within ${timeoutMs} ms`);
}

export function linkIn(text: string, pathPrefix: string): string {
  const match = text.match(new RegExp(`https?://[^\\s]+${pathPrefix.replace(/[/?]/g, '\\$&')}[^\\s]*`));
  if (!match) throw new Error(`no ${pathPrefix} link in: ${text}`);
  return match[0];
}
