import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { freePort, portIsOpen, waitFor } from '../support/ports';

// The README's start command, end to end: services on loopback, migrations, demo
// lab, SMTP sink, API with the web app, a worker; Ctrl-C stops everything; a
// second start reuses the data. The build itself was done by `npm test`.
describe('npm start (scripts/start.sh)', () => {
  const dataDir = mkdtempSync(path.join(os.tmpdir(), 'kiln-start-'));
  afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

  async function start(ports: Record<string, number>, extraEnv: Record<string, string> = {}) {
    const env = {
      ...process.env,
      KILN_DATA_DIR: dataDir,
      PORT: String(ports.api),
      KILN_PG_PORT: String(ports.pg),
      KILN_REDIS_PORT: String(ports.redis),
      KILN_SMTP_PORT: String(ports.smtp),
      KILN_SKIP_BUILD: '1',
      ...extraEnv,
    };
    for (const name of ['DATABASE_URL', 'REDIS_URL', 'SMTP_URL', 'JWT_SECRET', 'KILN_PG_DATABASE', 'KILN_PG_FSYNC']) delete env[name];
    const child = spawn('bash', ['scripts/start.sh'], { env, stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    child.stdout!.on('data', (chunk) => (output += chunk));
    child.stderr!.on('data', (chunk) => (output += chunk));
    await waitFor('"Kiln is running"', async () => output.includes('Kiln is running') || (child.exitCode !== null && Promise.reject(new Error(output))), 120_000).catch(
      (error) => {
        throw new Error(`start failed: ${String(error)}\n${output}`);
      },
    );
    return { child, output: () => output };
  }

  async function stop(child: ChildProcess): Promise<number | null> {
    const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
    child.kill('SIGINT');
    return exited;
  }

  const passwordFor = (output: string, email: string) => {
    const line = output.split('\n').find((text) => text.includes(email));
    return line?.trim().split(/\s+/).pop() ?? '';
  };

  const login = (apiPort: number, email: string, password: string) =>
    fetch(`http://127.0.0.1:${apiPort}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email, password }),
    });

  it('starts everything with demo data, stops everything on Ctrl-C, and reuses the data on a second start', async () => {
    const ports = { api: await freePort(), pg: await freePort(), redis: await freePort(), smtp: await freePort() };
    const first = await start(ports);
    try {
      expect(first.output()).toContain(`http://127.0.0.1:${ports.api}`);
      const health = await waitFor('a worker heartbeat', async () => {
        const body = await (await fetch(`http://127.0.0.1:${ports.api}/api/health`)).json();
        return body.workers.alive >= 1 ? body : undefined;
      });
      expect(health).toMatchObject({ status: 'ok', db: { status: 'up' }, redis: { status: 'up' } });

      const password = passwordFor(first.output(), 'joren.askeland@vellmar.example');
      expect(password.length).toBeGreaterThan(8);
      const signedIn = await login(ports.api, 'joren.askeland@vellmar.example', password);
      expect(signedIn.status).toBe(200);
      const { accessToken } = await signedIn.json();
      // The demo sweeps run on the started workers.
      await waitFor('a demo run to finish', async () => {
        const runs = await (await fetch(`http://127.0.0.1:${ports.api}/api/runs?scope=mine&state=finished`, { headers: { authorization: `Bearer ${accessToken}` } })).json();
        return runs.total > 0;
      }, 60_000);
      const page = await fetch(`http://127.0.0.1:${ports.api}/studies/deep/link`);
      expect(page.status).toBe(200);
      expect(await page.text()).toContain('<div id="root">');
      expect(await portIsOpen(ports.smtp)).toBe(true);
    } finally {
      await stop(first.child);
    }
    for (const port of Object.values(ports)) expect(await portIsOpen(port), `port ${port} still open`).toBe(false);

    const admin = { KILN_ADMIN_EMAIL: 'head@vellmar.example', KILN_ADMIN_PASSWORD: 'a-long-admin-password' };
    const second = await start(ports, admin);
    try {
      expect(second.output()).toContain('database schema is up to date');
      const password = passwordFor(first.output(), 'joren.askeland@vellmar.example');
      expect((await login(ports.api, 'joren.askeland@vellmar.example', password)).status).toBe(200);
      const adminLogin = await login(ports.api, admin.KILN_ADMIN_EMAIL, admin.KILN_ADMIN_PASSWORD);
      expect(adminLogin.status).toBe(200);
      expect((await adminLogin.json()).user.role).toBe('admin');
    } finally {
      expect(await stop(second.child)).not.toBeNull();
    }
    for (const port of Object.values(ports)) expect(await portIsOpen(port), `port ${port} still open`).toBe(false);
  }, 300_000);
});
