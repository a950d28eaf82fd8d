import { Module } from '@nestjs/common';
import { BenchesModule } from '../benches/benches.module.js';
import { MaterialsModule } from '../materials/materials.module.js';
import { PeopleModule } from '../people/people.module.js';
import { DemoService } from './demo.service.js';

@Module({
  imports: [PeopleModule, BenchesModule, MaterialsModule],
  providers: [DemoService],
  exports: [DemoService],
})
export class DemoModule {}
