import { Inject, Injectable } from '@nestjs/common';
import { Role, type CreateStudyRequest, type Study } from '@kiln/shared';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { DB, type Db } from '../database/database.module';
import { StudiesRepository } from './studies.repository';
import { StudyAccessService } from './study-access.service';
import { toStudy } from './studies.mapper';

@Injectable()
export class StudiesService {
  constructor(
    @Inject(DB) private readonly db: Db,
    private readonly studies: StudiesRepository,
    private readonly access: StudyAccessService,
  ) {}

  async list(user: AuthenticatedUser): Promise<Study[]> {
    if (user.role === Role.Admin) {
      const mine = new Map((await this.studies.listForMember(user.id)).map((row) => [row.id, row.my_role]));
      return (await this.studies.listAll()).map((row) => toStudy(row, mine.get(row.id) ?? null, []));
    }
    return (await this.studies.listForMember(user.id)).map((row) => toStudy(row, row.my_role, []));
  }

  async get(user: AuthenticatedUser, id: string): Promise<Study> {
    const myRole = await this.access.assertCanView(user, id);
    const row = (await this.studies.findById(id))!;
    const members = (await this.studies.members(id)).map((m) => ({ userId: m.user_id, name: m.name, email: m.email, role: m.role }));
    return toStudy(row, myRole, members);
  }

  async create(user: AuthenticatedUser, body: CreateStudyRequest): Promise<Study> {
    const row = await this.db.transaction().execute((trx) => this.studies.create(body.name, body.description, user.id, trx));
    return this.get(user, row.id);
  }
}
