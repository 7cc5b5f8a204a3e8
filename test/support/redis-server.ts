import { spawn, type ChildProcess } from 'node:child_process';
import { freePort, portIsOpen, waitFor } from './ports';

export interface TestRedis {
  port: number;
  url: string;
  stop(): Promise<void>;
}

/** A throwaway redis-server (Debian's) on its own loopback port, no persistence. */
export async function startTestRedis(): Promise<TestRedis> {
  const port = await freePort();
  const child: ChildProcess = spawn('redis-server', ['--bind', '127.0.0.1', '--port', String(port), '--save', '', '--appendonly', 'no'], {
    stdio: 'ignore',
  });
  await waitFor(`redis-server on ${port}`, () => portIsOpen(port));
  return {
    port,
    url: `redis://127.0.0.1:${port}`,
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null) return;
      const exited = new Promise((resolve) => child.once('exit', resolve));
      child.kill('SIGKILL');
      await exited;
    },
  };
}
