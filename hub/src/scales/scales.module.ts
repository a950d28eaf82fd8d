import { Module } from '@nestjs/common';
import { ScalesService } from './scales.service.js';

/** The bench scales: links, states, readings, tare and zero. */
@Module({
  providers: [ScalesService],
  exports: [ScalesService],
})
export class ScalesModule {}
