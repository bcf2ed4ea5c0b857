import type { Knex } from 'knex';
import nodemailer, { type Transporter } from 'nodemailer';
import { claimDueMessages, markAttemptFailed, markSent } from './outbox.repo.ts';

export interface MailTransportSettings {
  smtpUrl: string | undefined;
  fakeSmtpHost: string;
  fakeSmtpPort: number;
}

export function createMailTransport(settings: MailTransportSettings): Transporter {
  if (settings.smtpUrl) return nodemailer.createTransport(settings.smtpUrl);
  // The local fake speaks plain SMTP on loopback (STACK.md trap 11).
  return nodemailer.createTransport({
    host: settings.fakeSmtpHost,
    port: settings.fakeSmtpPort,
    secure: false,
    ignoreTLS: true,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 10_000,
  });
}

interface Logger {
  warn(obj: object, msg: string): void;
  error(obj: object, msg: string): void;
}

/** Sends what the outbox holds; a failed send stays in the outbox and is retried with back-off. */
export class OutboxWorker {
  private timer: NodeJS.Timeout | undefined;
  private running: Promise<void> | undefined;
  private again = false;

  constructor(
    private readonly db: Knex,
    private readonly transport: Transporter,
    private readonly from: string,
    private readonly log: Logger,
    private readonly pollMs: number,
    /** First back-off after a failed send (config MAIL_RETRY_BASE_MS). */
    private readonly retryBaseMs = 5_000,
  ) {}

  start(): void {
    if (this.timer) return;
    this.timer = setInterval(() => void this.kick(), this.pollMs);
    this.timer.unref();
    void this.kick();
  }

  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    this.timer = undefined;
    await this.running;
    this.transport.close();
  }

  /** Send what is due now; calls made while a pass runs fold into one more pass. */
  kick(): Promise<void> {
    if (this.running) {
      this.again = true;
      return this.running;
    }
    this.running = (async () => {
      try {
        do {
          this.again = false;
          await this.sendDue();
        } while (this.again);
      } catch (err) {
        this.log.error({ err }, 'mail outbox pass failed');
      } finally {
        this.running = undefined;
      }
    })();
    return this.running;
  }

  private async sendDue(): Promise<void> {
    for (;;) {
      const batch = await claimDueMessages(this.db, 20);
      if (batch.length === 0) return;
      for (const message of batch) {
        try {
          await this.transport.sendMail({
            from: this.from,
            to: message.to,
            subject: message.subject,
            text: message.text,
            html: message.html,
            messageId: message.messageId,
          });
          await markSent(this.db, message.id);
        } catch (err) {
          const reason = err instanceof Error ? err.message : String(err);
          this.log.warn({ outboxId: message.id, reason }, 'mail send failed; will retry');
          await markAttemptFailed(this.db, message, reason, this.retryBaseMs);
        }
      }
    }
  }
}
