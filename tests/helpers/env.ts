/** Settings `npm test` passes to the integration and browser tests. */
export function testEnv(): { baseUrl: string; databaseUrl: string; authSecret: string } {
  const baseUrl = process.env.APP_URL;
  const databaseUrl = process.env.DATABASE_URL;
  const authSecret = process.env.AUTH_SECRET;
  if (!baseUrl || !databaseUrl || !authSecret) {
    throw new Error('Integration tests need the database and app that `npm test` starts; run them with `npm test -- integration`.');
  }
  return { baseUrl, databaseUrl, authSecret };
}
