import { Injectable } from '@nestjs/common';
import { hash, verify } from '@node-rs/argon2';

// argon2id (the package's default algorithm) with OWASP's second recommended
// parameter set: 19 MiB, 2 passes, 1 lane.
const ARGON2_OPTIONS = { memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

@Injectable()
export class PasswordService {
  // Verifying against a real hash for unknown e-mails keeps response times alike,
  // so sign-in does not reveal which addresses have accounts.
  private readonly decoy = hash('kiln-decoy-password', ARGON2_OPTIONS);

  hash(password: string): Promise<string> {
    return hash(password, ARGON2_OPTIONS);
  }

  async verify(passwordHash: string | null, password: string): Promise<boolean> {
    if (!passwordHash) {
      await verify(await this.decoy, password).catch(() => false);
      return false;
    }
    return verify(passwordHash, password).catch(() => false);
  }
}

export { ARGON2_OPTIONS };
