import type { Kysely } from 'kysely';
import type { Database } from '@kiln/shared/db';
import { PasswordService } from '../../backend/src/auth/password.service';
import { DEMO_PEOPLE, seedDemoLab, type DemoPersonKey } from '../../backend/src/seed/demo-lab';

export type DemoCredentials = Record<DemoPersonKey, { email: string; name: string; password: string }>;

/** Seeds the fictional demo lab with known passwords and returns them. */
export async function seedDemoLabForTests(db: Kysely<Database>): Promise<DemoCredentials> {
  const hasher = new PasswordService();
  const credentials = {} as DemoCredentials;
  const passwordHashes = {} as Record<DemoPersonKey, string>;
  for (const person of DEMO_PEOPLE) {
    const password = `demo-${person.key}-password`;
    credentials[person.key] = { email: person.email, name: person.name, password };
    passwordHashes[person.key] = await hasher.hash(password);
  }
  await seedDemoLab(db, { passwordHashes });
  return credentials;
}
