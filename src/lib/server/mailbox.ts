// The admin mailbox: messages kept by the local SMTP catcher, newest first.
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { simpleParser } from 'mailparser';
import { config } from './config';

export interface MailboxMessage {
  file: string;
  from: string;
  to: string;
  subject: string;
  date: Date | null;
  text: string;
}

export async function listMailbox(limit = 100): Promise<MailboxMessage[]> {
  let files: string[];
  try {
    files = (await readdir(config.mailDir)).filter((f) => f.endsWith('.eml'));
  } catch {
    return []; // no catcher folder: nothing caught yet, or mail goes to a real relay
  }
  const newest = files.sort().reverse().slice(0, limit);
  return Promise.all(
    newest.map(async (file) => {
      const parsed = await simpleParser(await readFile(join(config.mailDir, file)));
      const addr = (a: typeof parsed.to) => (Array.isArray(a) ? a.map((x) => x.text).join(', ') : (a?.text ?? ''));
      return {
        file,
        from: parsed.from?.text ?? '',
        to: addr(parsed.to),
        subject: parsed.subject ?? '(no subject)',
        date: parsed.date ?? null,
        text: parsed.text ?? '',
      };
    }),
  );
}
