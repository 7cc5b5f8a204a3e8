// What scripts/test.sh provides to cross-part tests: running PostgreSQL and Redis
// on loopback, and Debian's Chromium. Run the tests with `npm test`.
function required(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: run the tests through \`npm test\`, which starts PostgreSQL and Redis`);
  return value;
}

export const testEnv = {
  /** Superuser-ish URL of the test cluster's maintenance database, for creating databases. */
  get pgAdminUrl() {
    return required('KILN_PG_ADMIN_URL');
  },
  get redisUrl() {
    return required('REDIS_URL');
  },
  get dataDir() {
    return required('KILN_DATA_DIR');
  },
  get chromium() {
    return process.env.KILN_CHROMIUM || '/usr/bin/chromium';
  },
  get artifactsDir() {
    return process.env.KILN_ARTIFACTS_DIR || 'test-artifacts';
  },
};
