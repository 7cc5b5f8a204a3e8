import { Controller, Get, Inject } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Role } from '@kiln/shared';
import { Roles } from '../auth/auth.decorators';
import { notFound } from '../common/api-error';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { DB, type Db } from '../database/database.module';

export interface SinkMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  raw: string;
}

@ApiTags('lab administration')
@ApiBearerAuth()
@Controller('admin/mail')
export class OutboxController {
  constructor(
    @Inject(KILN_CONFIG) private readonly config: KilnConfig,
    @Inject(DB) private readonly db: Db,
  ) {}

  @Get()
  @Roles(Role.Admin)
  @ApiOperation({ summary: 'Local mode only: every message the SMTP sink received, newest first (lab admins)' })
  async list(): Promise<SinkMessage[]> {
    if (this.config.KILN_MAIL_SINK !== '1') throw notFound('the local mail sink (Kiln sends real mail here)');
    const rows = await this.db.selectFrom('mail_messages').selectAll().orderBy('received_at', 'desc').limit(200).execute();
    return rows.map((row) => ({ id: row.id, receivedAt: row.received_at.toISOString(), from: row.envelope_from, to: row.envelope_to, subject: row.subject, raw: row.raw }));
  }
}
