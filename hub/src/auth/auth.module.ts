import { Global, Module } from '@nestjs/common';
import { APP_GUARD } from '@nestjs/core';
import { JwtModule } from '@nestjs/jwt';
import { PassportModule } from '@nestjs/passport';
import { ThrottlerModule } from '@nestjs/throttler';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { AccessGuard } from './access.guard.js';
import { AuthController } from './auth.controller.js';
import { BadgeLockout } from './badge-lockout.js';
import { CLOCK, systemClock, type Clock } from '../common/clock.js';
import { CredentialHasher } from './credential-hasher.js';
import { JwtSocketAuthenticator } from './jwt-socket-authenticator.js';
import { JwtStrategy } from './jwt.strategy.js';
import { PeopleModule } from '../people/people.module.js';
import { AUTH_KEYS, loadOrCreateSecret, type AuthKeys } from './secrets.js';
import { SignInRepository } from './sign-in.repository.js';
import { SignInService } from './sign-in.service.js';
import { SOCKET_AUTHENTICATOR } from './socket-authenticator.js';
import { TokenService } from './token.service.js';

/**
 * Sign-in, sessions and the access guard on every route and socket event. Global, so any module
 * can use `@CurrentUser()`, the clock, and the live socket's authenticator.
 */
@Global()
@Module({
  imports: [
    // The people store, for sign-in and for resolving a token to its person.
    PeopleModule,
    PassportModule,
    // Secrets are passed per call: they come from the data folder, loaded by AUTH_KEYS.
    JwtModule.register({}),
    ThrottlerModule.forRootAsync({
      inject: [APP_CONFIG],
      useFactory: (config: AppConfig) => ({
        throttlers: [{ name: 'sign-in', ttl: 60_000, limit: config.auth.signInPerMinute }],
        // One budget per address across both sign-in routes, not one per route.
        generateKey: (_context, tracker, name) => `${name}:${tracker}`,
        errorMessage: 'Too many sign-in attempts from this device: wait a minute and try again',
      }),
    }),
  ],
  controllers: [AuthController],
  providers: [
    {
      provide: AUTH_KEYS,
      inject: [APP_CONFIG],
      useFactory: async (config: AppConfig): Promise<AuthKeys> => ({
        jwtSecret: await loadOrCreateSecret(config.data.dir, 'jwt-secret', config.auth.jwtSecret),
        badgeKey: await loadOrCreateSecret(config.data.dir, 'badge-key', config.auth.badgeKey),
      }),
    },
    { provide: CLOCK, useFactory: (): Clock => ({ ...systemClock }) },
    CredentialHasher,
    SignInRepository,
    BadgeLockout,
    TokenService,
    SignInService,
    JwtStrategy,
    JwtSocketAuthenticator,
    { provide: SOCKET_AUTHENTICATOR, useExisting: JwtSocketAuthenticator },
    { provide: APP_GUARD, useClass: AccessGuard },
  ],
  exports: [SOCKET_AUTHENTICATOR, CredentialHasher, TokenService, SignInService, CLOCK],
})
export class AuthModule {}
