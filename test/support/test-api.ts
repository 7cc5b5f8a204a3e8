import type { INestApplication } from '@nestjs/common';
import type { AddressInfo } from 'node:net';
import { createApp } from '../../backend/src/app.factory';
import { loadConfig } from '../../backend/src/config/config.schema';
import { testEnv } from './test-env';

export const TEST_JWT_SECRET = 'test-secret-that-is-long-enough-for-hs256-signing';

export interface TestApi {
  app: INestApplication;
  baseUrl: string;
  close(): Promise<void>;
  /** fetch against the API with JSON in and out. */
  request(method: string, path: string, options?: { body?: unknown; token?: string; rawBody?: string }): Promise<{ status: number; body: any; text: string }>;
}

/** The real API (real PostgreSQL and Redis) listening on a random loopback port. */
export async function startTestApi(databaseUrl: string, env: Record<string, string> = {}): Promise<TestApi> {
  const config = loadConfig({
    DATABASE_URL: databaseUrl,
    REDIS_URL: testEnv.redisUrl,
    JWT_SECRET: TEST_JWT_SECRET,
    KILN_WEB_DIR: 'frontend/dist',
    ...env,
  });
  const app = await createApp(config, { logger: false });
  await app.listen(0, '127.0.0.1');
  const { port } = app.getHttpServer().address() as AddressInfo;
  const baseUrl = `http://127.0.0.1:${port}`;
  return {
    app,
    baseUrl,
    close: () => app.close(),
    async request(method, path, options = {}) {
      const headers: Record<string, string> = {};
      if (options.token) headers.authorization = `Bearer ${options.token}`;
      let body: string | undefined;
      if (options.rawBody !== undefined) body = options.rawBody;
      else if (options.body !== undefined) body = JSON.stringify(options.body);
      if (body !== undefined) headers['content-type'] = 'application/json';
      const response = await fetch(`${baseUrl}${path}`, { method, headers, body });
      const text = await response.text();
      let parsed: unknown;
      try {
        parsed = JSON.parse(text);
      } catch {
        parsed = undefined;
      }
      return { status: response.status, body: parsed, text };
    },
  };
}
