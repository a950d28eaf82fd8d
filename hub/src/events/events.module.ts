import { Global, Module } from '@nestjs/common';
import { EventEmitterModule } from '@nestjs/event-emitter';
import { HubEvents } from './hub-events.js';

/** The hub's in-process event bus, available to every feature. */
@Global()
@Module({
  imports: [EventEmitterModule.forRoot({ wildcard: false, verboseMemoryLeak: true })],
  providers: [HubEvents],
  exports: [HubEvents],
})
export class EventsModule {}
