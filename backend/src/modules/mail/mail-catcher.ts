import type { CapturedMail } from '@dialsheet/common';
import { Logger } from '@nestjs/common';
import { simpleParser } from 'mailparser';
import { randomUUID } from 'node:crypto';
import { mkdir, rename, writeFile } from 'node:fs/promises';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server';

/** `Name <address>` without the quotes mailparser's `text` adds around display names. */
function formatFrom(addresses: Array<{ name?: string; address?: string }> | undefined): string | undefined {
  if (!addresses || addresses.length === 0) return undefined;
  return addresses.map((a) => (a.name ? `${a.name} <${a.address ?? ''}>` : (a.address ?? ''))).join(', ');
}

/**
 * A local SMTP server for demos and tests: accepts every message on loopback and stores it as
 * `<dir>/<epoch-ms>-<id>.json` (CapturedMail), where the admin mail routes read it.
 */
export class MailCatcher {
  private server?: SMTPServer;
  private readonly logger = new Logger('MailCatcher');

  constructor(private readonly dir: string) {}

  /** Listens on 127.0.0.1; port 0 picks a free one. Resolves with the bound port. */
  async start(port: number): Promise<number> {
    await mkdir(this.dir, { recursive: true });
    const server = new SMTPServer({
      secure: false,
      authOptional: true,
      disabledCommands: ['AUTH', 'STARTTLS'],
      logger: false,
      size: 10 * 1024 * 1024,
      onData: (stream, session, callback) => {
        // The SMTP reply waits for the file, so a sender that got "250 OK" will find the message.
        this.store(stream, session).then(
          () => callback(),
          (error: Error) => {
            this.logger.error(`Could not store a message: ${error.message}`);
            callback(error);
          },
        );
      },
    });
    server.on('error', (error) => this.logger.error(`SMTP error: ${error.message}`));
    await new Promise<void>((resolve, reject) => {
      server.server.once('error', reject);
      server.listen(port, '127.0.0.1', () => {
        server.server.off('error', reject);
        resolve();
      });
    });
    this.server = server;
    return (server.server.address() as AddressInfo).port;
  }

  async stop(): Promise<void> {
    const server = this.server;
    this.server = undefined;
    if (server) await new Promise<void>((resolve) => server.close(() => resolve()));
  }

  private async store(stream: SMTPServerDataStream, session: SMTPServerSession): Promise<void> {
    const parsed = await simpleParser(stream);
    const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
    const mail: CapturedMail = {
      id: randomUUID(),
      from: formatFrom(parsed.from?.value) ?? (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
      to: envelopeTo,
      subject: parsed.subject ?? '',
      text: parsed.text ?? '',
      html: typeof parsed.html === 'string' ? parsed.html : null,
      receivedAt: new Date().toISOString(),
    };
    const name = `${Date.now()}-${mail.id}.json`;
    // Write then rename so a reader never sees half a file.
    const tmp = join(this.dir, `.${name}.tmp`);
    await writeFile(tmp, JSON.stringify(mail, null, 2));
    await rename(tmp, join(this.dir, name));
  }
}
