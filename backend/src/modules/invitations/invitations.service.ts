import {
  MIN_PASSWORD_LENGTH,
  type CampaignRole,
  type Invitation,
  type InvitationPreview,
  type LoginResponse,
} from '@dialsheet/common';
import {
  BadRequestException,
  ConflictException,
  ForbiddenException,
  Injectable,
  Logger,
  NotFoundException,
  UnauthorizedException,
} from '@nestjs/common';
import { InjectDataSource, InjectRepository } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { DataSource, EntityManager, IsNull, MoreThan, Repository } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { hashToken, newToken } from '../../core/tokens';
import { AuditService } from '../audit/audit.service';
import { MAX_PASSWORD_LENGTH } from '../auth/dto/new-password';
import { TokenService } from '../auth/token.service';
import { CampaignAccessService } from '../campaigns/campaign-access.service';
import { CampaignMemberEntity } from '../campaigns/campaign-member.entity';
import { CampaignEntity } from '../campaigns/campaign.entity';
import { sortRoles } from '../campaigns/campaign.mapper';
import { ARCHIVED_READ_ONLY } from '../campaigns/campaigns.service';
import { MailService } from '../mail/mail.service';
import { PasswordHasher } from '../users/password-hasher.service';
import { UserEntity } from '../users/user.entity';
import { AcceptInvitationDto } from './dto/accept-invitation.dto';
import { CreateInvitationDto } from './dto/create-invitation.dto';
import { InvitationEntity } from './invitation.entity';
import { invitationStatus, toInvitation } from './invitation.mapper';

export const INVITATION_INVALID = 'This invitation is invalid or has expired';
export const INVITATION_VALID_DAYS = 7;

@Injectable()
export class InvitationsService {
  private readonly logger = new Logger(InvitationsService.name);

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    @InjectRepository(InvitationEntity) private readonly invitations: Repository<InvitationEntity>,
    @InjectRepository(UserEntity) private readonly users: Repository<UserEntity>,
    private readonly access: CampaignAccessService,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly hasher: PasswordHasher,
    private readonly tokens: TokenService,
  ) {}

  async list(user: AuthUser, campaignId: string): Promise<Invitation[]> {
    await this.access.require(user, campaignId, ['lead']);
    const rows = await this.invitations.find({ where: { campaignId }, order: { createdAt: 'DESC' } });
    const now = new Date();
    return rows.map((r) => toInvitation(r, now));
  }

  async create(user: AuthUser, campaignId: string, dto: CreateInvitationDto): Promise<Invitation> {
    const token = newToken();
    const { invitation, campaignName } = await this.dataSource.transaction(async (manager) => {
      const { campaign } = await this.access.require(user, campaignId, ['lead'], { manager, lock: true });
      if (campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      const invitee = await manager.findOneBy(UserEntity, { email: dto.email });
      if (invitee && (await manager.existsBy(CampaignMemberEntity, { campaignId, userId: invitee.id }))) {
        throw new ConflictException('This person is already a member of the campaign');
      }
      const pending = await manager.existsBy(InvitationEntity, {
        campaignId,
        email: dto.email,
        acceptedAt: IsNull(),
        revokedAt: IsNull(),
        expiresAt: MoreThan(new Date()),
      });
      if (pending) {
        throw new ConflictException('A pending invitation for this e-mail exists; revoke it to send a new one');
      }
      const roles = sortRoles(dto.roles);
      const saved = await manager.save(
        manager.create(InvitationEntity, {
          campaignId,
          email: dto.email,
          roles,
          tokenHash: hashToken(token),
          invitedById: user.id,
          expiresAt: new Date(Date.now() + INVITATION_VALID_DAYS * 24 * 3600_000),
        }),
      );
      await this.audit.record(manager, {
        campaignId,
        actorId: user.id,
        entityType: 'invitation',
        entityId: saved.id,
        action: 'invite',
        after: { email: saved.email, roles, expiresAt: saved.expiresAt.toISOString() },
      });
      return { invitation: saved, campaignName: campaign.name };
    });
    try {
      await this.mail.sendInvitation(invitation.email, {
        token,
        campaignName,
        inviterName: user.name,
        roles: invitation.roles,
        expiresAt: invitation.expiresAt,
      });
    } catch (error) {
      // The invitation stands; the lead can revoke and re-invite once mail works again.
      this.logger.error(`Invitation mail to ${invitation.email} failed: ${String(error)}`);
    }
    return toInvitation(invitation);
  }

  async revoke(user: AuthUser, campaignId: string, invitationId: string): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      await this.access.require(user, campaignId, ['lead'], { manager, lock: true });
      const invitation = isUUID(invitationId)
        ? await manager.findOneBy(InvitationEntity, { id: invitationId, campaignId })
        : null;
      if (!invitation) throw new NotFoundException('Invitation not found');
      const status = invitationStatus(invitation, new Date());
      if (status !== 'pending') throw new ConflictException(`This invitation is already ${status}`);
      invitation.revokedAt = new Date();
      await manager.save(invitation);
      await this.audit.record(manager, {
        campaignId,
        actorId: user.id,
        entityType: 'invitation',
        entityId: invitation.id,
        action: 'revoke',
        before: { email: invitation.email, status: 'pending' },
        after: { email: invitation.email, status: 'revoked' },
      });
    });
  }

  /** Public: anyone holding the token may see what it invites to, nothing else. */
  async preview(token: string): Promise<InvitationPreview> {
    const invitation = await this.invitations.findOne({
      where: { tokenHash: hashToken(token) },
      relations: { campaign: true, invitedBy: true },
    });
    if (!invitation || !this.usable(invitation)) throw new NotFoundException(INVITATION_INVALID);
    return {
      campaignId: invitation.campaignId,
      campaignName: invitation.campaign?.name ?? '',
      email: invitation.email,
      roles: sortRoles(invitation.roles),
      invitedByName: invitation.invitedBy?.name ?? '',
      expiresAt: invitation.expiresAt.toISOString(),
      accountExists: await this.users.existsBy({ email: invitation.email }),
    };
  }

  async accept(dto: AcceptInvitationDto): Promise<LoginResponse> {
    const user = await this.dataSource.transaction(async (manager) => {
      // Row lock: two tabs accepting the same link at once cannot both get through.
      const invitation = await manager.findOne(InvitationEntity, {
        where: { tokenHash: hashToken(dto.token) },
        lock: { mode: 'pessimistic_write' },
      });
      if (invitation) invitation.campaign = (await manager.findOneBy(CampaignEntity, { id: invitation.campaignId })) ?? undefined;
      if (!invitation || !this.usable(invitation)) throw new NotFoundException(INVITATION_INVALID);
      const account = await this.accountFor(manager, invitation.email, dto);
      const campaignId = invitation.campaignId;
      const existing = await manager.findOneBy(CampaignMemberEntity, { campaignId, userId: account.id });
      if (existing) {
        // Joined meanwhile through another invitation: keep the union of both sets of roles.
        const roles = sortRoles([...new Set<CampaignRole>([...existing.roles, ...invitation.roles])]);
        if (roles.join() !== sortRoles(existing.roles).join()) {
          await this.audit.record(manager, {
            campaignId,
            actorId: account.id,
            entityType: 'member',
            entityId: account.id,
            action: 'update',
            before: { roles: sortRoles(existing.roles) },
            after: { roles },
            reason: 'Accepted an invitation',
          });
          existing.roles = roles;
          await manager.save(existing);
        }
      } else {
        const roles = sortRoles(invitation.roles);
        await manager.save(manager.create(CampaignMemberEntity, { campaignId, userId: account.id, roles }));
        await this.audit.record(manager, {
          campaignId,
          actorId: account.id,
          entityType: 'member',
          entityId: account.id,
          action: 'join',
          after: { email: account.email, name: account.name, roles },
        });
      }
      invitation.acceptedAt = new Date();
      invitation.acceptedById = account.id;
      await manager.save(invitation);
      await this.audit.record(manager, {
        campaignId,
        actorId: account.id,
        entityType: 'invitation',
        entityId: invitation.id,
        action: 'update',
        before: { email: invitation.email, status: 'pending' },
        after: { email: invitation.email, status: 'accepted' },
      });
      return account;
    });
    return this.tokens.issue(user);
  }

  private usable(invitation: InvitationEntity): boolean {
    return invitationStatus(invitation, new Date()) === 'pending' && invitation.campaign?.status === 'active';
  }

  /** The existing account (proven by its password) or a new one (name and password required). */
  private async accountFor(manager: EntityManager, email: string, dto: AcceptInvitationDto): Promise<UserEntity> {
    const existing = await manager.findOneBy(UserEntity, { email });
    if (existing) {
      if (!dto.password || !(await this.hasher.verify(dto.password, existing.passwordHash))) {
        throw new UnauthorizedException(`The password does not match the account of ${email}`);
      }
      if (existing.disabledAt) throw new ForbiddenException('This account is disabled; ask a platform administrator');
      return existing;
    }
    const problems: string[] = [];
    if (!dto.name) problems.push('name is required to create your account');
    if (!dto.password || dto.password.length < MIN_PASSWORD_LENGTH) {
      problems.push(`password must be at least ${MIN_PASSWORD_LENGTH} characters long`);
    } else if (dto.password.length > MAX_PASSWORD_LENGTH) {
      problems.push(`password must be at most ${MAX_PASSWORD_LENGTH} characters long`);
    }
    if (problems.length > 0) throw new BadRequestException(problems);
    return manager.save(
      manager.create(UserEntity, {
        email,
        name: dto.name as string,
        passwordHash: await this.hasher.hash(dto.password as string),
        isAdmin: false,
      }),
    );
  }
}
