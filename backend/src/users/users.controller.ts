import { Controller, Get } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Role, type User } from '@kiln/shared';
import { Roles } from '../auth/auth.decorators';
import { UsersService } from './users.service';

@ApiTags('people')
@ApiBearerAuth()
@Controller('users')
export class UsersController {
  constructor(private readonly users: UsersService) {}

  @Get()
  @Roles(Role.Admin)
  @ApiOperation({ summary: "The lab's people (lab admins only)" })
  list(): Promise<User[]> {
    return this.users.list();
  }
}
