import { Global, Module, type DynamicModule } from '@nestjs/common';
import type { KilnConfig } from './config.schema';

export const KILN_CONFIG = Symbol('KILN_CONFIG');

/** Makes the checked configuration injectable everywhere as `@Inject(KILN_CONFIG)`. */
@Global()
@Module({})
export class ConfigModule {
  static forRoot(config: KilnConfig): DynamicModule {
    return { module: ConfigModule, providers: [{ provide: KILN_CONFIG, useValue: config }], exports: [KILN_CONFIG] };
  }
}
