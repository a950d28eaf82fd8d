import { Module } from '@nestjs/common';
import { BatchesModule } from '../batches/batches.module.js';
import { MaterialsModule } from '../materials/materials.module.js';
import { StockLedger } from './stock-ledger.js';

/**
 * Lot stock follows the batches: what a saved or abandoned batch weighed comes off its lots in
 * the batch's own write transaction. Its own module because batches already depend on materials.
 */
@Module({
  imports: [BatchesModule, MaterialsModule],
  providers: [StockLedger],
})
export class StockModule {}
