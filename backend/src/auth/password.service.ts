import { Injectable } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { compare, hash } from 'bcrypt';
import type { Environment } from '../config/environment';

export { MIN_PASSWORD_LENGTH } from '@ampwright/common';

/** bcrypt hashing; a fixed dummy hash keeps a sign-in with an unknown address as slow as a real one. */
@Injectable()
export class PasswordService {
  private readonly cost: number;
  private dummy: Promise<string> | undefined;

  constructor(config: ConfigService<Environment, true>) {
    this.cost = config.get('BCRYPT_COST', { infer: true });
  }

  hash(password: string): Promise<string> {
    return hash(password, this.cost);
  }

  async verify(password: string, passwordHash: string | undefined): Promise<boolean> {
    if (!passwordHash) {
      this.dummy ??= hash('not a password of anyone', this.cost);
      await compare(password, await this.dummy);
      return false;
    }
    return compare(password, passwordHash);
  }
}
