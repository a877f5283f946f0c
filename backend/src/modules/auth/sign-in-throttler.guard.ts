import { Injectable } from '@nestjs/common';
import { ThrottlerGuard } from '@nestjs/throttler';
import { normalizeEmail } from '../users/user.mapper';

/**
 * Counts attempts per client address and e-mail, so one person mistyping cannot lock out a
 * colleague behind the same address, while guessing at one account is still slowed down.
 */
@Injectable()
export class SignInThrottlerGuard extends ThrottlerGuard {
  protected override async getTracker(req: { ip?: string; body?: { email?: unknown } }): Promise<string> {
    const email = req.body?.email;
    return `${String(req.ip)}|${typeof email === 'string' ? normalizeEmail(email) : ''}`;
  }
}
