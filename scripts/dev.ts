import { spawn } from 'node:child_process';

/**
 * `npm run dev`: the API (restarting on change) and Vite's dev server with hot
 * reload, which proxies /api to the API. Open the address Vite prints.
 */
const apiPort = process.env.PORT ?? '3000';
const webPort = process.env.WEB_PORT ?? '5173';
const children = [
  spawn('npx', ['tsx', 'watch', '--clear-screen=false', 'scripts/start.ts'], {
    stdio: 'inherit',
    env: { ...process.env, PORT: apiPort, PUBLIC_URL: process.env.PUBLIC_URL ?? `http://localhost:${webPort}` },
  }),
  spawn('npx', ['vite', '--port', webPort, '--strictPort'], {
    cwd: 'apps/web',
    stdio: 'inherit',
    env: { ...process.env, UNDERFOOT_API_URL: `http://127.0.0.1:${apiPort}` },
  }),
];
const stop = () => children.forEach((child) => child.kill('SIGTERM'));
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
for (const child of children) child.on('exit', stop);
