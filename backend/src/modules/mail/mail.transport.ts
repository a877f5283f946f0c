import { Injectable, OnModuleDestroy } from '@nestjs/common';
import { createTransport, type Transporter } from 'nodemailer';
import { AppConfig } from '../../config/app-config';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
}

/** The SMTP boundary: everything that leaves the process as e-mail goes through here. */
@Injectable()
export class MailTransport implements OnModuleDestroy {
  private readonly transporter: Transporter;

  constructor(private readonly config: AppConfig) {
    // Bounded waits: a mail server that does not answer must not hold a request for minutes.
    this.transporter = createTransport({
      url: config.smtpUrl,
      connectionTimeout: 10_000,
      greetingTimeout: 10_000,
      socketTimeout: 30_000,
    });
  }

  async send(mail: OutgoingMail): Promise<void> {
    await this.transporter.sendMail({ from: this.config.mailFrom, ...mail });
  }

  onModuleDestroy(): void {
    this.transporter.close();
  }
}
