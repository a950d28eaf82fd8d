import { Module } from '@nestjs/common';
import { HubsModule } from '../hubs/hubs.module.js';
import { ScalesModule } from '../scales/scales.module.js';
import { LiveGateway } from './live.gateway.js';
import { LiveService } from './live.service.js';

/** The live socket `/live`. Needs a SOCKET_AUTHENTICATOR from a global module. */
@Module({
  imports: [ScalesModule, HubsModule],
  providers: [LiveGateway, LiveService],
  exports: [LiveGateway],
})
export class LiveModule {}
