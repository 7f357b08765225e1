// Reads the messages the local SMTP catcher (started by scripts/test.ts) kept in MAIL_DIR.
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { simpleParser } from 'mailparser';

export interface CaughtMail {
  file: string;
  to: string;
  subject: string;
  text: string;
  html: string;
}

function mailDir(): string {
  const dir = process.env.MAIL_DIR;
  if (!dir) throw new Error('Mail tests need MAIL_DIR (run them through `npm test`)');
  return dir;
}

export async function caughtMail(): Promise<CaughtMail[]> {
  let files: string[];
  try {
    files = (await readdir(mailDir())).filter((f) => f.endsWith('.eml')).sort();
  } catch {
    return [];
  }
  return Promise.all(
    files.map(async (file) => {
      const parsed = await simpleParser(await readFile(join(mailDir(), file)));
      const to = Array.isArray(parsed.to) ? parsed.to.map((a) => a.text).join(', ') : (parsed.to?.text ?? '');
      return { file, to, subject: parsed.subject ?? '', text: parsed.text ?? '', html: typeof parsed.html === 'string' ? parsed.html : '' };
    }),
  );
}

/** Messages to this address, oldest first. */
export async function mailTo(address: string): Promise<CaughtMail[]> {
  return (await caughtMail()).filter((m) => m.to.toLowerCase().includes(address.toLowerCase()));
}

/** Waits until `count` messages to the address have arrived (mail may be sent after the answer). */
export async function waitForMailTo(address: string, count = 1, timeoutMs = 8000): Promise<CaughtMail[]> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const found = await mailTo(address);
    if (found.length >= count) return found;
    if (Date.now() > until) throw new Error(`expected ${count} message(s) to ${address}, found ${found.length}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** The token of the first link to `path` in a message's text. */
export function linkToken(text: string, path: string): string {
  const m = new RegExp(`${path.replace(/\//g, '\\/')}\\?token=([A-Za-z0-9_-]+)`).exec(text);
  if (!m) throw new Error(`no ${path} link in:\n${text}`);
  return m[1]!;
}
