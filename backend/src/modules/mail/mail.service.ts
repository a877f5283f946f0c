import type { CampaignRole } from '@dialsheet/common';
import { Injectable } from '@nestjs/common';
import { AppConfig } from '../../config/app-config';
import {
  invitationMail,
  mismatchesWaitingMail,
  passFinishedMail,
  passwordResetMail,
  releasePublishedMail,
  sheetAssignmentMail,
  type MismatchesWaitingMailParams,
  type PassFinishedMailParams,
  type ReleasePublishedMailParams,
  type SheetAssignmentMailParams,
} from './mail-templates';
import { MailTransport } from './mail.transport';

@Injectable()
export class MailService {
  constructor(
    private readonly transport: MailTransport,
    private readonly config: AppConfig,
  ) {}

  async sendInvitation(
    to: string,
    p: { token: string; campaignName: string; inviterName: string; roles: CampaignRole[]; expiresAt: Date },
  ): Promise<void> {
    await this.transport.send({ to, ...invitationMail({ appUrl: this.config.appUrl, ...p }) });
  }

  async sendPasswordReset(to: string, p: { token: string; name: string; validMinutes: number }): Promise<void> {
    await this.transport.send({ to, ...passwordResetMail({ appUrl: this.config.appUrl, ...p }) });
  }

  async sendSheetAssignment(to: string, p: Omit<SheetAssignmentMailParams, 'appUrl'>): Promise<void> {
    await this.transport.send({ to, ...sheetAssignmentMail({ appUrl: this.config.appUrl, ...p }) });
  }

  async sendPassFinished(to: string, p: Omit<PassFinishedMailParams, 'appUrl'>): Promise<void> {
    await this.transport.send({ to, ...passFinishedMail({ appUrl: this.config.appUrl, ...p }) });
  }

  async sendMismatchesWaiting(to: string, p: Omit<MismatchesWaitingMailParams, 'appUrl'>): Promise<void> {
    await this.transport.send({ to, ...mismatchesWaitingMail({ appUrl: this.config.appUrl, ...p }) });
  }

  async sendReleasePublished(to: string, p: Omit<ReleasePublishedMailParams, 'appUrl'>): Promise<void> {
    await this.transport.send({ to, ...releasePublishedMail({ appUrl: this.config.appUrl, ...p }) });
  }
}
