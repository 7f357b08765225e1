// @ts-check
import { defineConfig, envField } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwind from '@astrojs/tailwind';

const host = process.env.HOST || '127.0.0.1';
const port = Number(process.env.PORT || 4321);

export default defineConfig({
  output: 'server',
  adapter: node({ mode: 'standalone' }),
  integrations: [react(), tailwind({ applyBaseStyles: true })],
  server: { host, port },
  devToolbar: { enabled: false },
  security: {
    checkOrigin: true,
    allowedDomains: [{ hostname: '127.0.0.1' }, { hostname: 'localhost' }, { hostname: host }],
  },
  env: {
    schema: {
      DATABASE_URL: envField.string({ context: 'server', access: 'secret', optional: true }),
      DATABASE_READ_URL: envField.string({ context: 'server', access: 'secret', optional: true }),
      SMTP_URL: envField.string({ context: 'server', access: 'secret', optional: true }),
      MAIL_FROM: envField.string({ context: 'server', access: 'secret', optional: true, default: 'Bearline <noreply@bearline.invalid>' }),
      DATA_DIR: envField.string({ context: 'server', access: 'secret', optional: true }),
      MAIL_DIR: envField.string({ context: 'server', access: 'secret', optional: true }),
      PUBLIC_ORIGIN: envField.string({ context: 'server', access: 'secret', optional: true }),
      S3_ENDPOINT: envField.string({ context: 'server', access: 'secret', optional: true }),
      S3_BUCKET: envField.string({ context: 'server', access: 'secret', optional: true }),
      S3_REGION: envField.string({ context: 'server', access: 'secret', optional: true }),
      S3_ACCESS_KEY_ID: envField.string({ context: 'server', access: 'secret', optional: true }),
      S3_SECRET_ACCESS_KEY: envField.string({ context: 'server', access: 'secret', optional: true }),
      DB_CONNECT_TIMEOUT_MS: envField.number({ context: 'server', access: 'secret', optional: true, int: true, gt: 0 }),
      DB_STATEMENT_TIMEOUT_MS: envField.number({ context: 'server', access: 'secret', optional: true, int: true, gt: 0 }),
      IMPORT_MAX_BYTES: envField.number({ context: 'server', access: 'secret', optional: true }),
      EXPORT_MAX_ROWS: envField.number({ context: 'server', access: 'secret', optional: true, int: true, gt: 0 }),
    },
  },
  vite: {
    ssr: { external: ['@node-rs/argon2', 'pg', 'knex', 'sharp', 'busboy', '@aws-sdk/client-s3', 'pg-boss', 'pg-copy-streams'] },
  },
});
