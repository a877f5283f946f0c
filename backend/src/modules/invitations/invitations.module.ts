import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AuditModule } from '../audit/audit.module';
import { AuthModule } from '../auth/auth.module';
import { CampaignAccessModule } from '../campaigns/campaign-access.module';
import { MailModule } from '../mail/mail.module';
import { UsersModule } from '../users/users.module';
import { CampaignInvitationsController } from './campaign-invitations.controller';
import { InvitationEntity } from './invitation.entity';
import { InvitationsController } from './invitations.controller';
import { InvitationsService } from './invitations.service';

@Module({
  imports: [
    TypeOrmModule.forFeature([InvitationEntity]),
    CampaignAccessModule,
    AuditModule,
    AuthModule,
    MailModule,
    UsersModule,
  ],
  controllers: [CampaignInvitationsController, InvitationsController],
  providers: [InvitationsService],
})
export class InvitationsModule {}
