import { Body, Controller, Get, HttpCode, Inject, Post, UseGuards } from '@nestjs/common';
import { ThrottlerGuard } from '@nestjs/throttler';
import {
  badgeSignInRequestSchema,
  loginRequestSchema,
  type BadgeSignInRequest,
  type LoginRequest,
  type MeResponse,
  type SignInResponse,
} from '@tareline/protocol';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { Public, Roles } from './access.decorator.js';
import type { AuthUser } from './auth-user.js';
import { CurrentUser } from './current-user.decorator.js';
import { SignInService } from './sign-in.service.js';

@Controller()
export class AuthController {
  constructor(@Inject(SignInService) private readonly signIn: SignInService) {}

  @Post('auth/badge')
  @HttpCode(200)
  @Public()
  @UseGuards(ThrottlerGuard)
  badge(
    @Body(new ZodValidationPipe(badgeSignInRequestSchema)) body: BadgeSignInRequest,
  ): Promise<SignInResponse> {
    return this.signIn.badge(body);
  }

  @Post('auth/login')
  @HttpCode(200)
  @Public()
  @UseGuards(ThrottlerGuard)
  login(
    @Body(new ZodValidationPipe(loginRequestSchema)) body: LoginRequest,
  ): Promise<SignInResponse> {
    return this.signIn.login(body);
  }

  @Get('me')
  @Roles('operator', 'lead', 'admin')
  me(@CurrentUser() user: AuthUser): Promise<MeResponse> {
    return this.signIn.me(user);
  }

  @Post('auth/logout')
  @HttpCode(204)
  @Roles('operator', 'lead', 'admin')
  logout(@CurrentUser() user: AuthUser): Promise<void> {
    return this.signIn.logout(user);
  }
}
