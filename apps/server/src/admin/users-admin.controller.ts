import { Body, Controller, Get, HttpCode, Inject, Param, Patch, Post, Put } from '@nestjs/common';
import { createUserSchema, resetPasswordSchema, setRolesSchema, updateUserSchema, type AdminUser, type CreateUserRequest, type Role } from '@steadyhand/shared';
import { CurrentUser, Roles } from '../auth/auth.decorators.js';
import type { SessionUser } from '../auth/session-user.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { UsersAdminService } from './users-admin.service.js';

@Controller('admin/users')
@Roles('admin')
export class UsersAdminController {
  constructor(@Inject(UsersAdminService) private readonly people: UsersAdminService) {}

  @Get()
  list(): { users: AdminUser[] } {
    return { users: this.people.list() };
  }

  @Post()
  async create(@CurrentUser() actor: SessionUser, @Body(new ZodValidationPipe(createUserSchema)) body: CreateUserRequest): Promise<{ user: AdminUser }> {
    return { user: await this.people.create(actor, body) };
  }

  @Patch(':userId')
  rename(@CurrentUser() actor: SessionUser, @Param('userId') id: string, @Body(new ZodValidationPipe(updateUserSchema)) body: { displayName: string }): { user: AdminUser } {
    return { user: this.people.rename(actor, id, body.displayName) };
  }

  @Put(':userId/roles')
  setRoles(@CurrentUser() actor: SessionUser, @Param('userId') id: string, @Body(new ZodValidationPipe(setRolesSchema)) body: { roles: Role[] }): { user: AdminUser } {
    return { user: this.people.setRoles(actor, id, body.roles) };
  }

  @Post(':userId/password')
  @HttpCode(200)
  async resetPassword(@CurrentUser() actor: SessionUser, @Param('userId') id: string, @Body(new ZodValidationPipe(resetPasswordSchema)) body: { password: string }): Promise<{ user: AdminUser }> {
    return { user: await this.people.resetPassword(actor, id, body.password) };
  }

  @Post(':userId/disable')
  @HttpCode(200)
  disable(@CurrentUser() actor: SessionUser, @Param('userId') id: string): { user: AdminUser } {
    return { user: this.people.disable(actor, id) };
  }

  @Post(':userId/enable')
  @HttpCode(200)
  enable(@CurrentUser() actor: SessionUser, @Param('userId') id: string): { user: AdminUser } {
    return { user: this.people.enable(actor, id) };
  }

  @Post(':userId/second-factor/reset')
  @HttpCode(200)
  resetSecondFactor(@CurrentUser() actor: SessionUser, @Param('userId') id: string): { user: AdminUser } {
    return { user: this.people.resetSecondFactor(actor, id) };
  }
}
