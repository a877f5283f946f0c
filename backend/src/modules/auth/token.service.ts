import type { LoginResponse } from '@dialsheet/common';
import { Injectable } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import { randomUUID } from 'node:crypto';
import { AppConfig } from '../../config/app-config';
import type { UserEntity } from '../users/user.entity';
import { toUser } from '../users/user.mapper';

@Injectable()
export class TokenService {
  constructor(
    private readonly jwt: JwtService,
    private readonly config: AppConfig,
  ) {}

  /** A fresh access token with its own id, so signing out can revoke exactly this one. */
  async issue(user: UserEntity): Promise<LoginResponse> {
    const accessToken = await this.jwt.signAsync(
      { sub: user.id, ver: user.tokenVersion },
      { jwtid: randomUUID(), expiresIn: this.config.jwtExpiresIn },
    );
    return { accessToken, expiresIn: this.config.jwtExpiresIn, user: toUser(user) };
  }
}
