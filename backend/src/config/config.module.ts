import { Global, Module } from '@nestjs/common';
import { ConfigModule as NestConfigModule } from '@nestjs/config';
import { validateEnvironment } from './environment';

@Global()
@Module({
  imports: [NestConfigModule.forRoot({ isGlobal: true, ignoreEnvFile: true, validate: validateEnvironment, cache: true })],
})
export class ConfigModule {}
