import type { LoginResponse } from '@dialsheet/common';
import { Injectable } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import { createSecretKey, randomUUID, type KeyObject } from 'node:crypto';
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

const keys = new WeakMap<AppConfig, KeyObject>();

/**
 * The HS256 key as a KeyObject, made once per configuration. jsonwebtoken turns a string secret
 * into a key on every sign and verify, after first failing to read it as a PEM key (an exception
 * each time); the bytes are the same (UTF-8 of the secret), so tokens stay valid either way.
 */
export function jwtKey(config: AppConfig): KeyObject {
  let key = keys.get(config);
  if (!key) {
    key = createSecretKey(Buffer.from(config.jwtSecret, 'utf8'));
    keys.set(config, key);
  }
  return key;
}
