import { execFile } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import type { CapturedMail, LoginResponse } from '@dialsheet/common';
import { frameAtVideoTime, updateShownOnFrame, type DisplayKey, type RunTruth } from '../../scripts/demo/scenario';
import type { FrameRegion } from '../../scripts/demo/panel';
import { api } from './api';
import { demoPassword } from './browser';

// What the whole-job browser test needs besides the browser: the generated video and its truth,
// the captured e-mail, and read-only API calls to check what the browser did.

const run = promisify(execFile);
const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

/** The truth file as the generator writes it: each display also carries its digit window. */
export type GeneratedTruth = Omit<RunTruth, 'displays'> & { displays: Array<RunTruth['displays'][number] & { region: FrameRegion }> };

export interface GeneratedVideo {
  video: string;
  truth: GeneratedTruth;
}

/** Makes run 1 of the demo scenario (meter on the warm stream) with the project's own generator. */
export async function generateVideo(dir: string, durationSec: number): Promise<GeneratedVideo> {
  await run(process.execPath, ['--import', 'tsx', 'scripts/demo/generate-videos.ts', '--out', dir, '--runs', '1', '--duration', String(durationSec)], {
    cwd: repoRoot,
    timeout: 180_000,
  });
  const truth = JSON.parse(fs.readFileSync(path.join(dir, 'run-1.truth.json'), 'utf8')) as GeneratedTruth;
  return { video: path.join(dir, 'run-1.mp4'), truth };
}

/** The refresh a display shows on the frame at this presentation time: its exact text and its true value. */
export function truthAt(truth: RunTruth, key: DisplayKey, videoTime: number): { text: string; value: number; frame: number } {
  const frame = frameAtVideoTime(videoTime, truth.fps);
  const shown = updateShownOnFrame(truth.updates, key, frame);
  return { text: shown.text, value: shown.value, frame };
}

/** Step of a display's last digit, from the truth file. */
export function resolutionOf(truth: RunTruth, key: DisplayKey): number {
  const display = truth.displays.find((d) => d.key === key);
  if (!display) throw new Error(`the truth file has no display ${key}`);
  return display.resolution;
}

// ---------------------------------------------------------------------------------------------
// API, only to read back what the browser did (and the frame grid the entry screen steps on)

export { api, ApiError } from './api';

export async function login(email: string, password = demoPassword): Promise<string> {
  return (await api<LoginResponse>(null, 'POST', '/auth/login', { email, password })).accessToken;
}

// ---------------------------------------------------------------------------------------------
// Captured e-mail: the mail catcher writes each message as <dir>/<epoch-ms>-<id>.json

function mailDir(): string {
  const dir = process.env.MAIL_CATCHER_DIR;
  if (!dir) throw new Error('MAIL_CATCHER_DIR is not set: run this test through `npm test -- browser-tests`, which starts the mail catcher');
  return dir;
}

/** Waits for the newest message to `to` whose subject contains `subject`. */
export async function waitForMail(to: string, subject: string, timeoutMs = 30_000): Promise<CapturedMail> {
  const dir = mailDir();
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const names = fs.existsSync(dir) ? fs.readdirSync(dir).filter((n) => n.endsWith('.json')).sort() : [];
    for (const name of names.reverse()) {
      const mail = JSON.parse(fs.readFileSync(path.join(dir, name), 'utf8')) as CapturedMail;
      if (mail.to.some((t) => t.toLowerCase() === to.toLowerCase()) && mail.subject.includes(subject)) return mail;
    }
    if (Date.now() > deadline) throw new Error(`no e-mail to ${to} about "${subject}" within ${timeoutMs / 1000} s`);
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
}

/** The path and query of the first link in a message's text that contains `part` (opened on the app under test). */
export function linkIn(mail: CapturedMail, part: string): string {
  const link = (mail.text.match(/https?:\/\/\S+/g) ?? []).find((l) => l.includes(part));
  if (!link) throw new Error(`the e-mail "${mail.subject}" has no link with ${part}`);
  const url = new URL(link);
  return `${url.pathname}${url.search}`;
}
