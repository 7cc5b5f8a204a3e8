import { Global, Inject, Module, type OnApplicationShutdown } from '@nestjs/common';
import type { Kysely } from 'kysely';
import { createDatabase, type Database } from '@kiln/shared/db';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';

export const DB = Symbol('DB');
export type Db = Kysely<Database>;

/** One Kysely instance per API process, destroyed on shutdown. */
@Global()
@Module({
  providers: [
    {
      provide: DB,
      inject: [KILN_CONFIG],
      useFactory: (config: KilnConfig) =>
        createDatabase({ connectionString: config.DATABASE_URL, applicationName: 'kiln-api' }),
    },
  ],
  exports: [DB],
})
export class DatabaseModule implements OnApplicationShutdown {
  constructor(@Inject(DB) private readonly db: Db) {}

  async onApplicationShutdown(): Promise<void> {
    await this.db.destroy();
  }
}
