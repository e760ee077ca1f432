import { IsBoolean } from 'class-validator';
import type { PackageSettingsDto } from '@ampwright/common';

export class PackageSettingsBodyDto implements PackageSettingsDto {
  @IsBoolean({ message: 'queryRegister must be true or false' })
  queryRegister: boolean;
}
