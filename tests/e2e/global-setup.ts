import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { chromiumPath } from './browser.ts';
import { freePort } from '../support/free-port.ts';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    mailApiUrl: string;
  }
}

// A fresh clone generates the demo's stills and video on first start (cached afterwards), which takes a minute on a busy 2-core machine.
async function waitForHealth(url: string, child: ChildProcess, output: () => string, timeoutMs = 240_000) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`the app exited with ${child.exitCode} before it was ready:\n${output()}`);
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`the app did not answer ${url}/api/health within ${timeoutMs} ms:\n${output()}`);
}

/**
 * Browser tests run against the real thing: the built web app served by the
 * same start script as `npm start`, with the fake mail server, on free loopback
 * ports and a throw-away data folder.
 */
export default async function setup(project: TestProject) {
  const browser = chromiumPath();
  if (!existsSync(browser)) {
    throw new Error(
      `Browser tests need Chromium at ${browser}, and it is not there.\n` +
        'Install it with:  sudo apt-get update && sudo apt-get install -y chromium\n' +
        '(or point CHROMIUM_PATH at another Chromium).',
    );
  }
  const root = path.resolve(import.meta.dirname, '../..');
  if (!existsSync(path.join(root, 'apps/web/dist/index.html'))) {
    throw new Error('Browser tests need the built web app: run `npm run build` first (`npm test` does).');
  }

  const dataDir = mkdtempSync(path.join(tmpdir(), 'underfoot-e2e-'));
  const [port, smtpPort, mailHttpPort, paymentsPort] = [await freePort(), await freePort(), await freePort(), await freePort()];
  const baseUrl = `http://127.0.0.1:${port}`;
  let output = '';
  const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/start.ts'], {
    cwd: root,
    env: {
      ...process.env,
      NODE_ENV: 'development',
      PORT: String(port),
      PUBLIC_URL: baseUrl,
      DATA_DIR: dataDir,
      FAKE_SMTP_PORT: String(smtpPort),
      FAKE_SMTP_HTTP_PORT: String(mailHttpPort),
      FAKE_PAYMENTS_PORT: String(paymentsPort),
      PASSWORD_HASH_COST: '12',
      MAIL_POLL_MS: '200',
      LOG_LEVEL: 'warn',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout?.on('data', (chunk) => (output += chunk));
  child.stderr?.on('data', (chunk) => (output += chunk));

  try {
    await waitForHealth(baseUrl, child, () => output);
  } catch (err) {
    child.kill('SIGKILL');
    throw err;
  }
  project.provide('baseUrl', baseUrl);
  project.provide('mailApiUrl', `http://127.0.0.1:${mailHttpPort}`);

  return async () => {
    child.kill('SIGTERM');
    await new Promise((resolve) => {
      const timer = setTimeout(() => {
        child.kill('SIGKILL');
        resolve(undefined);
      }, 5_000);
      child.once('exit', () => {
        clearTimeout(timer);
        resolve(undefined);
      });
    });
    rmSync(dataDir, { recursive: true, force: true });
  };
}
