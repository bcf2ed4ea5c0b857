import { randomUUID } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import express from 'express';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';

/** One caught message, as the mailbox page shows it. */
export interface CaughtMessage {
  id: string;
  messageId: string | undefined;
  from: string;
  to: string[];
  subject: string;
  date: string;
  text: string;
  html: string;
}

export interface FakeSmtp {
  smtpPort: number;
  httpPort: number;
  host: string;
  messages(): CaughtMessage[];
  clear(): void;
  /** Refuse connections (a mail outage) until `resume()`; used by fault tests. */
  pause(): Promise<void>;
  resume(): Promise<void>;
  close(): Promise<void>;
}

export interface FakeSmtpOptions {
  host?: string;
  smtpPort?: number;
  httpPort?: number;
}

const addressesOf = (value: AddressObject | AddressObject[] | undefined): string[] =>
  (Array.isArray(value) ? value : value ? [value] : []).flatMap((a) => a.value.map((v) => v.address ?? '')).filter(Boolean);

/**
 * A local stand-in for an SMTP provider: accepts every message on loopback,
 * keeps it in memory, and lists it over a small HTTP API for the mailbox page
 * and the tests.
 */
export async function startFakeSmtp(options: FakeSmtpOptions = {}): Promise<FakeSmtp> {
  const host = options.host ?? '127.0.0.1';
  const caught: CaughtMessage[] = [];

  const createSmtp = () =>
    new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS'],
      logger: false,
      banner: 'Underfoot fake mail server',
      onData(stream, _session, callback) {
        simpleParser(stream)
          .then((mail) => {
            caught.unshift({
              id: randomUUID(),
              messageId: mail.messageId,
              from: mail.from?.text ?? '',
              to: addressesOf(mail.to),
              subject: mail.subject ?? '',
              date: (mail.date ?? new Date()).toISOString(),
              text: mail.text ?? '',
              html: typeof mail.html === 'string' ? mail.html : '',
            });
            callback();
          })
          .catch((err: Error) => callback(err));
      },
    });

  let smtp = createSmtp();
  const listenSmtp = (port: number) =>
    new Promise<number>((resolve, reject) => {
      smtp.once('error', reject);
      smtp.listen(port, host, () => resolve((smtp.server.address() as AddressInfo).port));
    });
  const smtpPort = await listenSmtp(options.smtpPort ?? 0);

  const api = express();
  api.get('/messages', (_req, res) => {
    res.json({ messages: caught.map(({ text: _t, html: _h, ...summary }) => summary) });
  });
  api.get('/messages/:id', (req, res) => {
    const message = caught.find((m) => m.id === req.params.id);
    if (!message) res.status(404).json({ error: 'no such message' });
    else res.json(message);
  });
  api.delete('/messages', (_req, res) => {
    caught.length = 0;
    res.status(204).end();
  });
  const http: Server = await new Promise((resolve, reject) => {
    const server = api.listen(options.httpPort ?? 0, host, (err?: Error) => (err ? reject(err) : resolve(server)));
  });
  const httpPort = (http.address() as AddressInfo).port;

  const closeSmtp = () => new Promise<void>((resolve) => smtp.close(() => resolve()));

  return {
    host,
    smtpPort,
    httpPort,
    messages: () => [...caught],
    clear: () => {
      caught.length = 0;
    },
    pause: closeSmtp,
    resume: async () => {
      smtp = createSmtp();
      await listenSmtp(smtpPort);
    },
    close: async () => {
      await closeSmtp();
      await new Promise<void>((resolve) => http.close(() => resolve()));
    },
  };
}
