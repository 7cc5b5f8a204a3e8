// A private PostgreSQL cluster for one test file, so a test can stop and restart
// the server without disturbing the shared test cluster (modelled on
// scripts/lib/postgres.sh: Debian's server binaries, run as the `postgres` user when
// root, data in a temporary folder that user can reach, a free loopback port).
import { execFileSync } from 'node:child_process';
import { chmodSync, chownSync, existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { freePort, portIsOpen, waitFor } from './ports';

export interface TestPostgres {
  port: number;
  /** URL of database `name` on this cluster (user `kiln`, trust auth on loopback). */
  url(name: string): string;
  stop(): Promise<void>;
  start(): Promise<void>;
  /** Stops the server and deletes its files. */
  destroy(): Promise<void>;
}

function binDir(): string {
  const candidates = ['/usr/lib/postgresql/15/bin'];
  if (existsSync('/usr/lib/postgresql')) {
    for (const version of readdirSync('/usr/lib/postgresql').sort().reverse()) candidates.push(`/usr/lib/postgresql/${version}/bin`);
  }
  const found = candidates.find((dir) => existsSync(path.join(dir, 'pg_ctl')));
  if (!found) throw new Error('PostgreSQL server binaries not found under /usr/lib/postgresql');
  return found;
}

const isRoot = process.getuid?.() === 0;

function asPostgres(command: string, args: string[]): void {
  if (isRoot) execFileSync('runuser', ['-u', 'postgres', '--', command, ...args], { stdio: 'pipe' });
  else execFileSync(command, args, { stdio: 'pipe' });
}

export async function startTestPostgres(): Promise<TestPostgres> {
  const bin = binDir();
  const root = mkdtempSync(path.join(os.tmpdir(), 'kiln-pg-'));
  const data = path.join(root, 'data');
  const sockets = path.join(root, 'run');
  mkdirSync(data);
  mkdirSync(sockets);
  if (isRoot) {
    const uid = Number(execFileSync('id', ['-u', 'postgres']).toString().trim());
    const gid = Number(execFileSync('id', ['-g', 'postgres']).toString().trim());
    chmodSync(root, 0o755);
    chownSync(data, uid, gid);
    chownSync(sockets, uid, gid);
  }
  chmodSync(data, 0o700);
  asPostgres(path.join(bin, 'initdb'), ['-D', data, '-U', 'kiln', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8']);
  const port = await freePort();
  const log = path.join(sockets, 'postgres.log');
  const start = async () => {
    asPostgres(path.join(bin, 'pg_ctl'), [
      '-D', data, '-l', log, '-w', '-t', '60',
      '-o', `-p ${port} -c listen_addresses=127.0.0.1 -k ${sockets} -c fsync=off -c max_connections=100`,
      'start',
    ]);
    await waitFor(`PostgreSQL on ${port}`, () => portIsOpen(port));
  };
  const stop = async () => {
    asPostgres(path.join(bin, 'pg_ctl'), ['-D', data, '-m', 'fast', '-w', 'stop']);
  };
  await start();
  return {
    port,
    url: (name) => `postgres://kiln@127.0.0.1:${port}/${name}`,
    start,
    stop,
    async destroy() {
      try {
        await stop();
      } catch {
        // Already stopped.
      }
      rmSync(root, { recursive: true, force: true });
    },
  };
}
