import { Module } from '@nestjs/common';
import { PeopleModule } from '../people/people.module.js';
import { DemoService } from './demo.service.js';

@Module({
  imports: [PeopleModule],
  providers: [DemoService],
  exports: [DemoService],
})
export class DemoModule {}
