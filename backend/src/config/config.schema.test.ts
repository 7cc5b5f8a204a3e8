import { describe, expect, it } from 'vitest';
import { loadConfig } from './config.schema';

const valid = {
  DATABASE_URL: 'postgres://kiln:pw@127.0.0.1:5433/kiln',
  REDIS_URL: 'redis://127.0.0.1:6380',
  JWT_SECRET: 'x'.repeat(32),
};

describe('configuration at start-up', () => {
  it('accepts a complete environment and fills the local defaults', () => {
    const config = loadConfig(valid);
    expect(config.PORT).toBe(8080);
    expect(config.HOST).toBe('127.0.0.1');
    expect(config.SMTP_URL).toBe('smtp://127.0.0.1:2525');
  });

  it('names every missing or bad variable in one message', () => {
    expect(() => loadConfig({})).toThrow(/DATABASE_URL[\s\S]*REDIS_URL[\s\S]*JWT_SECRET/);
    expect(() => loadConfig({ ...valid, DATABASE_URL: 'mysql://x' })).toThrow(/DATABASE_URL must be a URL starting with postgres:\/\//);
    expect(() => loadConfig({ ...valid, JWT_SECRET: 'short' })).toThrow(/JWT_SECRET must be at least 32 characters/);
    expect(() => loadConfig({ ...valid, PORT: 'eighty' })).toThrow(/PORT/);
    expect(() => loadConfig({ ...valid, PORT: '70000' })).toThrow(/PORT/);
  });
});
