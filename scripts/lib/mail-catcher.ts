// Local SMTP catcher for development and tests: accepts every message on
// 127.0.0.1 and keeps it as an .eml file, which the admin mailbox page reads.
import { SMTPServer } from 'smtp-server';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { log } from './project';

export interface MailCatcherOptions {
  port: number;
  dir: string;
}

export async function startMailCatcher(opts: MailCatcherOptions): Promise<string> {
  mkdirSync(opts.dir, { recursive: true });
  let seq = 0;
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 10 * 1024 * 1024,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const name = `${Date.now()}-${String(++seq).padStart(4, '0')}.eml`;
        writeFileSync(join(opts.dir, name), Buffer.concat(chunks));
        callback();
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, '127.0.0.1', () => resolve());
  });
  log(`mail catcher on smtp://127.0.0.1:${opts.port} (messages in ${opts.dir})`);
  return `smtp://127.0.0.1:${opts.port}`;
}
