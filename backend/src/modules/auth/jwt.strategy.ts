import { Injectable, UnauthorizedException } from '@nestjs/common';
import { PassportStrategy } from '@nestjs/passport';
import { InjectRepository } from '@nestjs/typeorm';
import { ExtractJwt, Strategy } from 'passport-jwt';
import { Repository } from 'typeorm';
import { AppConfig } from '../../config/app-config';
import type { AuthUser } from '../../core/auth-user';
import { UserEntity } from '../users/user.entity';
import type { JwtPayload } from './jwt-payload';
import { RevokedTokenEntity } from './revoked-token.entity';

export const SESSION_ENDED = 'Your session has ended. Sign in again.';

/**
 * Signature and expiry are checked by passport-jwt; here we check what only the database knows:
 * the account still exists and is enabled, the password has not changed since (token version)
 * and this token was not signed out.
 */
@Injectable()
export class JwtStrategy extends PassportStrategy(Strategy, 'jwt') {
  constructor(
    config: AppConfig,
    @InjectRepository(UserEntity) private readonly users: Repository<UserEntity>,
    @InjectRepository(RevokedTokenEntity) private readonly revoked: Repository<RevokedTokenEntity>,
  ) {
    super({
      jwtFromRequest: ExtractJwt.fromAuthHeaderAsBearerToken(),
      secretOrKey: config.jwtSecret,
      algorithms: ['HS256'],
      ignoreExpiration: false,
    });
  }

  async validate(payload: Partial<JwtPayload>): Promise<AuthUser> {
    const { sub, ver, jti, exp } = payload;
    if (typeof sub !== 'string' || typeof ver !== 'number' || typeof jti !== 'string' || typeof exp !== 'number') {
      throw new UnauthorizedException(SESSION_ENDED);
    }
    const user = await this.users.findOneBy({ id: sub });
    if (!user || user.disabledAt || user.tokenVersion !== ver) throw new UnauthorizedException(SESSION_ENDED);
    if (await this.revoked.existsBy({ jti })) throw new UnauthorizedException(SESSION_ENDED);
    return { id: user.id, email: user.email, name: user.name, isAdmin: user.isAdmin, jti, exp };
  }
}
