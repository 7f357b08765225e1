// App configuration, read through astro:env (declared in astro.config.mjs).
import {
  DATABASE_URL,
  DATABASE_READ_URL,
  SMTP_URL,
  MAIL_FROM,
  DATA_DIR,
  MAIL_DIR,
  PUBLIC_ORIGIN,
  S3_ENDPOINT,
  S3_BUCKET,
  S3_REGION,
  S3_ACCESS_KEY_ID,
  S3_SECRET_ACCESS_KEY,
  DB_CONNECT_TIMEOUT_MS,
  DB_STATEMENT_TIMEOUT_MS,
  IMPORT_MAX_BYTES,
  EXPORT_MAX_ROWS,
} from 'astro:env/server';

export const config = {
  databaseUrl: DATABASE_URL,
  /** A hot standby for lagging reads (see getReadDb); unset means the one database. */
  databaseReadUrl: DATABASE_READ_URL,
  smtpUrl: SMTP_URL ?? 'smtp://127.0.0.1:2525',
  mailFrom: MAIL_FROM ?? 'Bearline <noreply@bearline.invalid>',
  dataDir: DATA_DIR ?? '.data',
  /** Where the local SMTP catcher keeps messages (the admin mailbox reads them). */
  mailDir: MAIL_DIR ?? `${DATA_DIR ?? '.data'}/mail`,
  publicOrigin: PUBLIC_ORIGIN,
  /** Largest CSV a gazetteer or readings import accepts, counted while it streams in (default 512 MB). */
  importMaxBytes: IMPORT_MAX_BYTES ?? 512 * 1024 * 1024,
  /** Most rows one export file holds (default 1,000,000); more is refused or fetched in pages. */
  exportMaxRows: EXPORT_MAX_ROWS ?? 1_000_000,
  /** S3-compatible storage for uploaded files; used when endpoint, bucket and keys are all set. */
  s3: {
    endpoint: S3_ENDPOINT,
    bucket: S3_BUCKET,
    region: S3_REGION,
    accessKeyId: S3_ACCESS_KEY_ID,
    secretAccessKey: S3_SECRET_ACCESS_KEY,
  },
  /** Milliseconds to connect to PostgreSQL, and for one statement to finish. */
  dbTimeouts: { connectMs: DB_CONNECT_TIMEOUT_MS ?? 5_000, statementMs: DB_STATEMENT_TIMEOUT_MS ?? 30_000 },
};
