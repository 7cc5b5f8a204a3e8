import { Injectable } from '@nestjs/common';
import type { User } from '@kiln/shared';
import { toUser } from './users.mapper';
import { UsersRepository } from './users.repository';

@Injectable()
export class UsersService {
  constructor(private readonly users: UsersRepository) {}

  async list(): Promise<User[]> {
    return (await this.users.list()).map(toUser);
  }
}
