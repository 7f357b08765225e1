// App configuration, read through astro:env (declared in astro.config.mjs).
import { DATABASE_URL, SMTP_URL, MAIL_FROM, DATA_DIR, MAIL_DIR, PUBLIC_ORIGIN } from 'astro:env/server';

export const config = {
  databaseUrl: DATABASE_URL,
  smtpUrl: SMTP_URL ?? 'smtp://127.0.0.1:2525',
  mailFrom: MAIL_FROM ?? 'Bearline <noreply@bearline.invalid>',
  dataDir: DATA_DIR ?? '.data',
  /** Where the local SMTP catcher keeps messages (the admin mailbox reads them). */
  mailDir: MAIL_DIR ?? `${DATA_DIR ?? '.data'}/mail`,
  publicOrigin: PUBLIC_ORIGIN,
};
