import { Injectable } from '@nestjs/common';
import { compare, hash } from 'bcryptjs';

/** bcrypt cost 10: about 50–100 ms per hash here, slow for guessing, fine for one sign-in. */
const COST = 10;

@Injectable()
export class PasswordHasher {
  hash(password: string): Promise<string> {
    return hash(password, COST);
  }

  verify(password: string, passwordHash: string): Promise<boolean> {
    return compare(password, passwordHash);
  }
}
