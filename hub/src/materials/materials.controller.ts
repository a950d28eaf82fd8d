import { Body, Controller, Get, Inject, Param, Post, Query } from '@nestjs/common';
import {
  lotInputSchema,
  lotListQuerySchema,
  materialIdSchema,
  materialInputSchema,
  type Lot,
  type Material,
} from '@tareline/protocol';
import type { z } from 'zod';
import { actorOf } from '../audit/audit.repository.js';
import { Roles } from '../auth/access.decorator.js';
import type { AuthUser } from '../auth/auth-user.js';
import { CurrentUser } from '../auth/current-user.decorator.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { MaterialsService } from './materials.service.js';

@Controller()
export class MaterialsController {
  constructor(@Inject(MaterialsService) private readonly materials: MaterialsService) {}

  @Get('materials')
  @Roles('operator', 'lead', 'admin')
  list(): Promise<Material[]> {
    return this.materials.list();
  }

  @Get('materials/:id')
  @Roles('operator', 'lead', 'admin')
  get(
    @Param('id', new ZodValidationPipe(materialIdSchema, 'Not a material id')) id: string,
  ): Promise<Material> {
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
}
