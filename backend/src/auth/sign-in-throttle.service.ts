import { createHash } from 'node:crypto';
import { MikroORM } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { Environment } from '../config/environment';
import { ErrorCode, RequestException } from '../core/errors/app-exception';
import { SharedThrottlerStorage } from '../core/throttle/shared-throttler-storage';

const WINDOW_MS = 60_000;
/** Failed sign-ins for one account from one client address before that pair waits a minute. */
export const FAILURES_PER_ACCOUNT_AND_ADDRESS = 5;

const key = (...parts: string[]) => createHash('sha256').update(parts.join('\n')).digest('hex');

/**
 * Sign-in throttling that suits an office behind one address and still stops guessing: only failed
 * attempts count. Per client address, THROTTLE_FAILED_SIGN_INS_PER_ADDRESS failures a minute (generous:
 * good sign-ins never count, so a whole office signs in at nine); per account and address, 5 failures a
 * minute, so guessing one account is slowed where it happens while its owner, signing in from elsewhere,
 * is never locked out. Counted in MariaDB (shared by every instance). Addresses are normalised by the DTO.
 */
@Injectable()
export class SignInThrottle {
  private readonly storage: SharedThrottlerStorage;
  private readonly perAddress: number;

  constructor(orm: MikroORM, config: ConfigService<Environment, true>) {
    this.storage = new SharedThrottlerStorage(orm);
    this.perAddress = config.get('THROTTLE_FAILED_SIGN_INS_PER_ADDRESS', { infer: true });
  }

  private keys(email: string, ip = '') {
    return { address: key('sign-in-failures-address', ip), pair: key('sign-in-failures-account', email, ip) };
  }

  /** Refuses with 429 while the address or the account-and-address pair is waiting out its failures. */
  async check(email: string, ip?: string): Promise<void> {
    const { address, pair } = this.keys(email, ip);
    const waits = await this.storage.blockedFor([`failures:${address}`, `failures:${pair}`]);
    if (waits > 0) {
      throw new RequestException(ErrorCode.TooManyRequests, `Too many failed sign-ins: wait ${waits} s and try again.`, {
        headers: { 'Retry-After': String(waits) },
      });
    }
  }

  /** Counts a failed sign-in against the address and the account-and-address pair. */
  async failed(email: string, ip?: string): Promise<void> {
    const { address, pair } = this.keys(email, ip);
    // The storage blocks once the hits pass its limit: one less, so the attempt after the last allowed failure waits.
    await this.storage.increment(address, WINDOW_MS, this.perAddress - 1, WINDOW_MS, 'failures');
    await this.storage.increment(pair, WINDOW_MS, FAILURES_PER_ACCOUNT_AND_ADDRESS - 1, WINDOW_MS, 'failures');
  }

  /** A good sign-in clears the failures of its account from its address. */
  async succeeded(email: string, ip?: string): Promise<void> {
    await this.storage.forget(`failures:${this.keys(email, ip).pair}`);
  }
}
