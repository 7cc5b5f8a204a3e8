import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';

/**
 * Serves the built web app at / beside the API: hashed assets cached for long,
 * index.html never cached, and every non-API GET answered with index.html so
 * deep links and reloads work. /api paths fall through to Nest (JSON 404s).
 */
export function serveWebApp(app: Express, webDir: string): boolean {
  webDir = path.resolve(webDir);
  const index = path.join(webDir, 'index.html');
  if (!existsSync(index)) return false;
  app.use(
    '/assets',
    express.static(path.join(webDir, 'assets'), { immutable: true, maxAge: '365d', index: false, fallthrough: false }),
  );
  app.use(express.static(webDir, { index: false, maxAge: 0 }));
  app.use((req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || req.path === '/api' || req.path.startsWith('/api/')) return next();
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index);
  });
  return true;
}
