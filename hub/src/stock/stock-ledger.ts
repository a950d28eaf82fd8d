import { Inject, Injectable, type OnModuleInit } from '@nestjs/common';
import { toMg } from '@tareline/protocol';
import type { BatchRecord } from '../batches/batch-machine.js';
import { BatchesRepository, recordOf } from '../batches/batches.repository.js';
import { MaterialsRepository, type BatchDraw } from '../materials/materials.repository.js';

/**
 * What a batch took from each registered lot: every part's weighed grams from the first lot
 * given for that part (a batch scans one lot per part). Still-weighing batches take nothing yet.
 */
export function batchDraws(rec: BatchRecord): BatchDraw[] {
  if (rec.state !== 'saved' && rec.state !== 'abandoned') return [];
  const draws: BatchDraw[] = [];
  const seenParts = new Set<number>();
  for (const lot of rec.lots) {
    if (!lot.lotId || seenParts.has(lot.part)) continue;
    seenParts.add(lot.part);
    const takenMg = toMg(rec.parts[lot.part]?.actualG ?? 0);
    if (takenMg > 0) draws.push({ lotId: lot.lotId, takenMg });
  }
  return draws;
}

/** Subtracts a finished batch's weighings from its lots, inside the batch's write. */
@Injectable()
export class StockLedger implements OnModuleInit {
  constructor(
    @Inject(BatchesRepository) private readonly batches: BatchesRepository,
    @Inject(MaterialsRepository) private readonly materials: MaterialsRepository,
  ) {}

  onModuleInit(): void {
    this.batches.onRecordWrite(async (tx, row) => {
      await this.materials.recordBatchDraws(tx, row.id, batchDraws(recordOf(row)));
    });
  }
}
