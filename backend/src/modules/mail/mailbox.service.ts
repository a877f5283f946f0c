import type { CapturedMail } from '@dialsheet/common';
import { Injectable, NotFoundException } from '@nestjs/common';
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { AppConfig } from '../../config/app-config';

const MAIL_FILE = /^(\d+)-([A-Za-z0-9-]+)\.json$/;

/** Reads what the local mail catcher stored; an absent folder is simply an empty mailbox. */
@Injectable()
export class MailboxService {
  constructor(private readonly config: AppConfig) {}

  async list(): Promise<CapturedMail[]> {
    const files = await this.files();
    const mails = await Promise.all(files.map((f) => this.read(f)));
    return mails
      .filter((m): m is CapturedMail => m !== null)
      .sort((a, b) => b.receivedAt.localeCompare(a.receivedAt));
  }

  async get(id: string): Promise<CapturedMail> {
    const file = /^[A-Za-z0-9-]+$/.test(id) ? (await this.files()).find((f) => f.endsWith(`-${id}.json`)) : undefined;
    const mail = file ? await this.read(file) : null;
    if (!mail) throw new NotFoundException('No captured message with this id');
    return mail;
  }

  private async files(): Promise<string[]> {
    try {
      const names = await readdir(this.config.mailCatcherDir);
      return names.filter((n) => MAIL_FILE.test(n)).sort().reverse();
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === 'ENOENT') return [];
      throw error;
    }
  }

  private async read(file: string): Promise<CapturedMail | null> {
    try {
      return JSON.parse(await readFile(join(this.config.mailCatcherDir, file), 'utf8')) as CapturedMail;
    } catch {
      // A file removed or hand-edited between listing and reading is skipped, not fatal.
      return null;
    }
  }
}
