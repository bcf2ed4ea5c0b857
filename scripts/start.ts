import type { Server } from 'node:http';
import { startFakePayments, startFakeSmtp, type FakePayments, type FakeSmtp } from '@underfoot/fakes';
import { ConfigError, createApp, createServices, parseConfig, webDistDir } from '@underfoot/server';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { DEMO_PASSWORD, demoAccounts, seedDemo } from '../seeds/demo.ts';

/**
 * `npm start`: the whole product on one machine with its embedded defaults —
 * the fake mail server (unless SMTP_URL is set), migrations, the demo data on
 * an empty database, and the server with the built web app.
 */
async function main() {
  // The demo console shows the start-up banner and problems, not every request.
  process.env.LOG_LEVEL ??= 'warn';
  let config;
  try {
    config = parseConfig();
  } catch (err) {
    if (err instanceof ConfigError) {
      console.error(err.message);
      process.exit(1);
    }
    throw err;
  }

  let fakeMail: FakeSmtp | undefined;
  if (!config.mail.smtpUrl) {
    try {
      fakeMail = await startFakeSmtp({ smtpPort: config.mail.fakeSmtpPort, httpPort: config.mail.fakeSmtpHttpPort });
    } catch (err) {
      console.error(
        `The demo mail server could not listen on ports ${config.mail.fakeSmtpPort}/${config.mail.fakeSmtpHttpPort} (${(err as Error).message}).\n` +
          'Another Underfoot may be running; stop it, or set FAKE_SMTP_PORT and FAKE_SMTP_HTTP_PORT.',
      );
      process.exit(1);
    }
  }

  let fakePayments: FakePayments | undefined;
  if (!config.payments.secretKey) {
    try {
      fakePayments = await startFakePayments({
        port: config.payments.fakePort,
        webhookUrl: `http://127.0.0.1:${config.port}/api/payments/webhook`,
        webhookSecret: config.payments.webhookSecret,
      });
    } catch (err) {
      console.error(
        `The demo payment provider could not listen on port ${config.payments.fakePort} (${(err as Error).message}).\n` +
          'Another Underfoot may be running; stop it, or set FAKE_PAYMENTS_PORT.',
      );
      process.exit(1);
    }
  }

  const services = await createServices(config, {
    ...(fakeMail ? { fakeMail: { host: fakeMail.host, smtpPort: fakeMail.smtpPort, httpPort: fakeMail.httpPort } } : {}),
    ...(fakePayments ? { fakePayments: { host: fakePayments.host, port: fakePayments.port } } : {}),
  });
  if (!(await services.db('companies').first('id'))) {
    console.log('Adding the demo data: the first start draws the demo pictures and video, which can take a minute…');
  }
  const { seeded, disclosureLinkPath } = await seedDemo(services.db, {
    passwordHashCost: config.passwordHashCost,
    mediaDir: config.media.dir,
  });
  const app = createApp(config, services);

  const server: Server = app.listen(config.port, config.host);
  server.on('error', (err) => {
    console.error(`Underfoot could not listen on ${config.host}:${config.port}: ${err.message}. Set PORT to use another port.`);
    process.exit(1);
  });
  server.on('listening', () => {
    const lines = [
      '',
      `  Underfoot is running at ${config.publicUrl}`,
      existsSync(path.join(webDistDir, 'index.html')) ? '' : '  (the web app is not built: run `npm run build`, or use `npm run dev`)',
      fakeMail
        ? `  Demo mailbox (every e-mail the app sends): ${config.publicUrl}/mailbox`
        : `  Mail goes out through ${new URL(config.mail.smtpUrl!).host}`,
      fakePayments
        ? `  Payments go to a local test provider (no real money): ${fakePayments.url}`
        : '  Payments go to the configured provider',
      disclosureLinkPath ? `  Pre-listing disclosure link (anyone can open it): ${config.publicUrl}${disclosureLinkPath}` : '',
      `  Data folder: ${config.dataDir}${seeded ? ' (demo data added)' : ''}`,
      '',
      `  Demo accounts — every one uses the password: ${DEMO_PASSWORD}`,
      ...demoAccounts.map((a) => `    ${a.email.padEnd(38)} ${a.name.padEnd(18)} ${a.part}`),
      '',
    ].filter((line, i, all) => line !== '' || all[i - 1] !== '');
    console.log(lines.join('\n'));
  });

  const stop = () => {
    server.close(() => {
      void services
        .close()
        .then(() => fakeMail?.close())
        .then(() => fakePayments?.close())
        .then(() => process.exit(0));
    });
    // Keep-alive connections would hold close() open; end them.
    server.closeAllConnections();
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

void main();
