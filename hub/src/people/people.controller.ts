import { Body, Controller, Get, HttpCode, Inject, Param, Patch, Post, Put } from '@nestjs/common';
import {
  assignBadgeRequestSchema,
  createPersonRequestSchema,
  personIdSchema,
  setPasswordRequestSchema,
  setPinRequestSchema,
  updatePersonRequestSchema,
  type AssignBadgeRequest,
  type Person,
  type SetPasswordRequest,
  type SetPinRequest,
} from '@tareline/protocol';
import type { z } from 'zod';
import { Roles } from '../auth/access.decorator.js';
import type { AuthUser } from '../auth/auth-user.js';
import { CurrentUser } from '../auth/current-user.decorator.js';
import { actorOf } from '../audit/audit.repository.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { PeopleService } from './people.service.js';

const personId = new ZodValidationPipe(personIdSchema, 'Not a person id');

@Controller('people')
@Roles('admin')
export class PeopleController {
  constructor(@Inject(PeopleService) private readonly people: PeopleService) {}

  @Get()
  list(): Promise<Person[]> {
    return this.people.list();
  }

  @Post()
  create(
    @Body(new ZodValidationPipe(createPersonRequestSchema))
    body: z.output<typeof createPersonRequestSchema>,
    @CurrentUser() user: AuthUser,
  ): Promise<Person> {
    return this.people.create(body, actorOf(user));
  }

  @Patch(':id')
  update(
    @Param('id', personId) id: string,
    @Body(new ZodValidationPipe(updatePersonRequestSchema))
    body: z.output<typeof updatePersonRequestSchema>,
    @CurrentUser() actor: AuthUser,
  ): Promise<Person> {
    return this.people.update(id, body, actor);
  }

  @Put(':id/badge')
  @HttpCode(200)
  assignBadge(
    @Param('id', personId) id: string,
    @Body(new ZodValidationPipe(assignBadgeRequestSchema)) body: AssignBadgeRequest,
    @CurrentUser() user: AuthUser,
  ): Promise<Person> {
    return this.people.assignBadge(id, body.badge, actorOf(user));
  }

  @Put(':id/pin')
  @HttpCode(200)
  setPin(
    @Param('id', personId) id: string,
    @Body(new ZodValidationPipe(setPinRequestSchema)) body: SetPinRequest,
    @CurrentUser() user: AuthUser,
  ): Promise<Person> {
    return this.people.setPin(id, body.pin, actorOf(user));
  }

  @Put(':id/password')
  @HttpCode(200)
  setPassword(
    @Param('id', personId) id: string,
    @Body(new ZodValidationPipe(setPasswordRequestSchema)) body: SetPasswordRequest,
    @CurrentUser() user: AuthUser,
  ): Promise<Person> {
    return this.people.setPassword(id, body.password, actorOf(user));
  }
}
