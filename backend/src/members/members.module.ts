import { Module } from '@nestjs/common';
import { MembersController } from './members.controller';
import { MembersService } from './members.service';

@Module({ controllers: [MembersController], providers: [MembersService] })
export class MembersModule {}
