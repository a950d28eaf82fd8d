import { Global, Inject, Injectable, Module } from '@nestjs/common';
import {
  SOCKET_AUTHENTICATOR,
  SocketRefusedError,
  type SocketAuthenticator,
  type SocketPrincipal,
} from '../auth/socket-authenticator.js';
import { BenchesModule } from '../benches/benches.module.js';
import { BenchesService } from '../benches/benches.service.js';

/**
 * DEVELOPMENT ONLY, until sign-in lands: accepts any live-socket handshake for a bench that
 * exists (no token needed) and refuses an unknown bench. The sign-in work provides the real
 * {@link SOCKET_AUTHENTICATOR} from its global AuthModule; `app.module.ts` then drops
 * {@link DevSocketAuthModule} from its imports and nothing else changes.
 */
@Injectable()
export class DevSocketAuthenticator implements SocketAuthenticator {
  constructor(@Inject(BenchesService) private readonly benches: BenchesService) {}

  async authenticate(handshake: {
    token: string | undefined;
    benchId: string;
  }): Promise<SocketPrincipal> {
    if (!(await this.benches.exists(handshake.benchId))) {
      throw new SocketRefusedError(`There is no bench "${handshake.benchId}"`);
    }
    return {
      userId: 'development',
      name: 'Development (no sign-in yet)',
      role: 'operator',
      expiresAt: Number.MAX_SAFE_INTEGER,
    };
  }

  async stillValid(): Promise<boolean> {
    return true;
  }
}

@Global()
@Module({
  imports: [BenchesModule],
  providers: [{ provide: SOCKET_AUTHENTICATOR, useClass: DevSocketAuthenticator }],
  exports: [SOCKET_AUTHENTICATOR],
})
export class DevSocketAuthModule {}
