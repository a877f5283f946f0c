import type { LoginResponse, User } from '@dialsheet/common';
import {
  BadRequestException,
  ForbiddenException,
  Injectable,
  Logger,
  UnauthorizedException,
} from '@nestjs/common';
import { InjectDataSource, InjectRepository } from '@nestjs/typeorm';
import { randomUUID } from 'node:crypto';
import { DataSource, IsNull, LessThan, Repository } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { hashToken, newToken } from '../../core/tokens';
import { MailService } from '../mail/mail.service';
import { PasswordHasher } from '../users/password-hasher.service';
import { UserEntity } from '../users/user.entity';
import { normalizeEmail, toUser } from '../users/user.mapper';
import { ChangePasswordDto } from './dto/change-password.dto';
import { LoginDto } from './dto/login.dto';
import { PasswordResetConfirmDto } from './dto/password-reset-confirm.dto';
import { PasswordResetDto } from './dto/password-reset.dto';
import { UpdateProfileDto } from './dto/update-profile.dto';
import { PasswordResetEntity } from './password-reset.entity';
import { RevokedTokenEntity } from './revoked-token.entity';
import { TokenService } from './token.service';

export const WRONG_CREDENTIALS = 'E-mail or password is wrong';
export const ACCOUNT_DISABLED = 'This account is disabled; ask a platform administrator';
export const RESET_INVALID = 'This reset link is invalid or has expired';
export const RESET_VALID_MINUTES = 60;

@Injectable()
export class AuthService {
  private readonly logger = new Logger(AuthService.name);
  private dummyHash?: Promise<string>;

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    @InjectRepository(UserEntity) private readonly users: Repository<UserEntity>,
    @InjectRepository(RevokedTokenEntity) private readonly revoked: Repository<RevokedTokenEntity>,
    @InjectRepository(PasswordResetEntity) private readonly resets: Repository<PasswordResetEntity>,
    private readonly hasher: PasswordHasher,
    private readonly tokens: TokenService,
    private readonly mail: MailService,
  ) {}

  async login(dto: LoginDto): Promise<LoginResponse> {
    const user = await this.users.findOneBy({ email: normalizeEmail(dto.email) });
    // Compare against a throw-away hash for unknown e-mails too, so the response time does not
    // tell which addresses have accounts.
    this.dummyHash ??= this.hasher.hash(randomUUID());
    const matches = await this.hasher.verify(dto.password, user?.passwordHash ?? (await this.dummyHash));
    if (!user || !matches) throw new UnauthorizedException(WRONG_CREDENTIALS);
    if (user.disabledAt) throw new ForbiddenException(ACCOUNT_DISABLED);
    return this.tokens.issue(user);
  }

  async logout(user: AuthUser): Promise<void> {
    await this.revoked
      .createQueryBuilder()
      .insert()
      .values({ jti: user.jti, userId: user.id, expiresAt: new Date(user.exp * 1000) })
      .orIgnore()
      .execute();
    // A revoked token past its expiry is rejected by its signature check anyway.
    await this.revoked.delete({ expiresAt: LessThan(new Date()) });
  }

  async me(user: AuthUser): Promise<User> {
    return toUser(await this.users.findOneByOrFail({ id: user.id }));
  }

  async updateProfile(user: AuthUser, dto: UpdateProfileDto): Promise<User> {
    const entity = await this.users.findOneByOrFail({ id: user.id });
    entity.name = dto.name;
    return toUser(await this.users.save(entity));
  }

  /** Ends every session of the account, this one included: the client signs in again. */
  async changePassword(user: AuthUser, dto: ChangePasswordDto): Promise<void> {
    const entity = await this.users.findOneByOrFail({ id: user.id });
    if (!(await this.hasher.verify(dto.currentPassword, entity.passwordHash))) {
      throw new ForbiddenException('The current password is wrong');
    }
    entity.passwordHash = await this.hasher.hash(dto.newPassword);
    entity.tokenVersion += 1;
    await this.users.save(entity);
  }

  /** Always succeeds from the caller's point of view, so it never reveals whether an account exists. */
  async requestPasswordReset(dto: PasswordResetDto): Promise<void> {
    const user = await this.users.findOneBy({ email: normalizeEmail(dto.email) });
    if (!user || user.disabledAt) return;
    const token = newToken();
    await this.resets.insert({
      userId: user.id,
      tokenHash: hashToken(token),
      expiresAt: new Date(Date.now() + RESET_VALID_MINUTES * 60_000),
    });
    // Not awaited: waiting for SMTP only for existing accounts would make the response time
    // reveal which addresses have one.
    this.mail
      .sendPasswordReset(user.email, { token, name: user.name, validMinutes: RESET_VALID_MINUTES })
      .catch((error: unknown) => this.logger.error(`Password reset mail to ${user.email} failed: ${String(error)}`));
  }

  async confirmPasswordReset(dto: PasswordResetConfirmDto): Promise<void> {
    const newHash = await this.hasher.hash(dto.newPassword);
    await this.dataSource.transaction(async (manager) => {
      // One conditional UPDATE claims the link, so two concurrent uses cannot both succeed.
      const claimed = await manager
        .createQueryBuilder()
        .update(PasswordResetEntity)
        .set({ usedAt: () => 'now()' })
        .where('token_hash = :hash AND used_at IS NULL AND expires_at > now()', { hash: hashToken(dto.token) })
        .returning(['userId'])
        .execute();
      const row = (claimed.raw as Array<{ user_id?: string; userId?: string }>)[0];
      const userId = row?.user_id ?? row?.userId;
      if (!userId) throw new BadRequestException(RESET_INVALID);
      const user = await manager.findOneBy(UserEntity, { id: userId });
      if (!user || user.disabledAt) throw new BadRequestException(RESET_INVALID);
      user.passwordHash = newHash;
      user.tokenVersion += 1;
      await manager.save(user);
      // Other links sent earlier must not reset the new password again.
      await manager.update(PasswordResetEntity, { userId, usedAt: IsNull() }, { usedAt: new Date() });
    });
  }
}
