// Where the project keeps its local state, and the ports it uses by default.
import { resolve } from 'node:path';

export const ROOT = resolve(import.meta.dirname, '../..');
export const DATA_DIR = process.env.DATA_DIR ? resolve(process.env.DATA_DIR) : resolve(ROOT, '.data');
// Seeds and the app read DATA_DIR too: make the resolved folder theirs.
process.env.DATA_DIR = DATA_DIR;
export const PG_DIR = resolve(DATA_DIR, 'pg');
/** Where `npm run backup` writes (outside DATA_DIR by default, so deleting .data keeps them). */
export const BACKUP_DIR = process.env.BACKUP_DIR ? resolve(process.env.BACKUP_DIR) : resolve(ROOT, 'backups');
export const PG_PORT = Number(process.env.PG_PORT || 54329);
export const HOST = process.env.HOST || '127.0.0.1';
export const PORT = Number(process.env.PORT || 4321);
export const SMTP_PORT = Number(process.env.SMTP_PORT || 2525);

export function log(msg: string): void {
  console.log(`[bearline] ${msg}`);
}
