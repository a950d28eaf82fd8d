import {
  Body,
  Controller,
  Get,
  Inject,
  Param,
  Patch,
  Post,
  Query,
  StreamableFile,
} from '@nestjs/common';
import {
  lotAdjustmentInputSchema,
  lotIdSchema,
  lotInputSchema,
  lotListQuerySchema,
  materialIdSchema,
  materialImportSchema,
  materialInputSchema,
  materialListQuerySchema,
  materialPatchSchema,
  type Lot,
  type Material,
  type MaterialImportResult,
  type StockMovement,
} from '@tareline/protocol';
import type { z } from 'zod';
import { actorOf } from '../audit/audit.repository.js';
import { Roles } from '../auth/access.decorator.js';
import type { AuthUser } from '../auth/auth-user.js';
import { CurrentUser } from '../auth/current-user.decorator.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { MaterialsService } from './materials.service.js';

const materialId = new ZodValidationPipe(materialIdSchema, 'Not a material id');
const lotId = new ZodValidationPipe(lotIdSchema, 'Not a lot id');

@Controller()
export class MaterialsController {
  constructor(@Inject(MaterialsService) private readonly materials: MaterialsService) {}

  /** Materials in use; retired ones too with `?includeRetired=true`. */
  @Get('materials')
  @Roles('operator', 'lead', 'admin')
  list(
    @Query(new ZodValidationPipe(materialListQuerySchema))
    query: z.output<typeof materialListQuerySchema>,
  ): Promise<Material[]> {
    return this.materials.list(query.includeRetired);
  }

  /** The library as CSV, retired materials included. Declared before `:id`, which it is not. */
  @Get('materials/export.csv')
  @Roles('lead', 'admin')
  async exportCsv(): Promise<StreamableFile> {
    return new StreamableFile(Buffer.from(await this.materials.exportCsv(), 'utf8'), {
      type: 'text/csv; charset=utf-8',
      disposition: 'attachment; filename="materials.csv"',
    });
  }

  /** Adds or updates the materials of a library file: all of them or, on any bad row, none. */
  @Post('materials/import')
  @Roles('lead', 'admin')
  importCsv(
    @Body(new ZodValidationPipe(materialImportSchema, 'Send the file as { csv }'))
    body: z.output<typeof materialImportSchema>,
  ): Promise<MaterialImportResult> {
    return this.materials.importCsv(body.csv);
  }

  @Get('materials/:id')
  @Roles('operator', 'lead', 'admin')
  get(@Param('id', materialId) id: string): Promise<Material> {
    return this.materials.get(id);
  }

  @Post('materials')
  @Roles('lead', 'admin')
  create(
    @Body(new ZodValidationPipe(materialInputSchema, 'The material is not valid'))
    body: z.output<typeof materialInputSchema>,
    @CurrentUser() user: AuthUser,
  ): Promise<Material> {
    return this.materials.create(body, actorOf(user));
  }

  /** Changes a material, or retires it (`active: false`); batches keep what they used. */
  @Patch('materials/:id')
  @Roles('lead', 'admin')
  update(
    @Param('id', materialId) id: string,
    @Body(new ZodValidationPipe(materialPatchSchema, 'The change is not valid'))
    body: z.output<typeof materialPatchSchema>,
    @CurrentUser() user: AuthUser,
  ): Promise<Material> {
    return this.materials.update(id, body, actorOf(user));
  }

  @Get('lots')
  @Roles('operator', 'lead', 'admin')
  lots(
    @Query(new ZodValidationPipe(lotListQuerySchema)) query: z.output<typeof lotListQuerySchema>,
  ): Promise<Lot[]> {
    return this.materials.listLots(query.materialId);
  }

  @Post('lots')
  @Roles('lead', 'admin')
  createLot(
    @Body(new ZodValidationPipe(lotInputSchema, 'The lot is not valid'))
    body: z.output<typeof lotInputSchema>,
    @CurrentUser() user: AuthUser,
  ): Promise<Lot> {
    return this.materials.createLot(body, actorOf(user));
  }

  @Get('lots/:id')
  @Roles('operator', 'lead', 'admin')
  lot(@Param('id', lotId) id: string): Promise<Lot> {
    return this.materials.getLot(id);
  }

  /** Every change of the lot's stock after it was received, newest first. */
  @Get('lots/:id/movements')
  @Roles('lead', 'admin')
  movements(@Param('id', lotId) id: string): Promise<StockMovement[]> {
    return this.materials.movements(id);
  }

  /** A spill or a count, with who and why. */
  @Post('lots/:id/adjustments')
  @Roles('lead', 'admin')
  adjust(
    @Param('id', lotId) id: string,
    @Body(new ZodValidationPipe(lotAdjustmentInputSchema, 'The adjustment is not valid'))
    body: z.output<typeof lotAdjustmentInputSchema>,
    @CurrentUser() user: AuthUser,
  ): Promise<Lot> {
    return this.materials.adjustLot(id, body, { id: user.id, name: user.name });
  }
}
