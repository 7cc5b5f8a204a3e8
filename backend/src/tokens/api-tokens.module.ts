import { Global, Module } from '@nestjs/common';
import { ApiTokensController } from './api-tokens.controller';
import { ApiTokensService } from './api-tokens.service';

@Global()
@Module({ controllers: [ApiTokensController], providers: [ApiTokensService], exports: [ApiTokensService] })
export class ApiTokensModule {}
