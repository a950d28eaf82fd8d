import { Module } from '@nestjs/common';
import { ScalesModule } from '../scales/scales.module.js';
import { HubDirectory } from './hub-directory.js';
import { HubsRepository } from './hubs.repository.js';
import { IntentForwarder } from './intent-forwarder.js';

/**
 * Several hubs on one server PostgreSQL: each one's heartbeat and scales (`hubs` table), which
 * hub reads which bench, and intents handed to the hub that owns the bench.
 */
@Module({
  imports: [ScalesModule],
  providers: [HubsRepository, HubDirectory, IntentForwarder],
  exports: [HubDirectory, IntentForwarder],
})
export class HubsModule {}
