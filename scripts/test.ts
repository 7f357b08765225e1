// npm test: lint and format check, then a throwaway PostgreSQL cluster on loopback, unit + integration
// tests (vitest, real PostgreSQL) and browser tests (Debian's Chromium) against
// the built app. Ends with one plain line: "N passed, N failed".
import { chmodSync, mkdtempSync, readFileSync, existsSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawn, type ChildProcess } from 'node:child_process';
import { startCluster, destroyCluster, databaseUrl } from './lib/pg-cluster';
import { ensureChromium } from './lib/system-packages';
import { migrateLatest } from './lib/migrate-runner';
import { runSeeds } from './lib/seed-runner';
import { buildIfChanged } from './lib/build';
import { startServer, waitForHttp } from './lib/server-process';
import { startMailCatcher } from './lib/mail-catcher';
import { startFakeS3, type FakeS3 } from './lib/fake-s3';
import { ROOT, log } from './lib/project';

const PG_PORT = Number(process.env.TEST_PG_PORT || 54339);
const APP_PORT = Number(process.env.TEST_APP_PORT || 4329);
const SMTP_PORT = Number(process.env.TEST_SMTP_PORT || 2535);
const S3_PORT = Number(process.env.TEST_S3_PORT || 4569);

interface Tally {
  passed: number;
  failed: number;
}

// Async, not spawnSync: the mail catcher lives in this process and must keep answering SMTP
// while the tests run.
async function runVitest(label: string, args: string[], env: Record<string, string>, reportFile: string): Promise<Tally> {
  log(`${label} tests…`);
  const child = spawn('npx', ['vitest', 'run', ...args, '--reporter=default', '--reporter=json', `--outputFile.json=${reportFile}`], {
    cwd: ROOT,
    stdio: 'inherit',
    env: { ...process.env, ...env },
  });
  const res = { status: await new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code))) };
  if (!existsSync(reportFile)) return { passed: 0, failed: 1 }; // the runner itself failed
  const report = JSON.parse(readFileSync(reportFile, 'utf8')) as {
    numPassedTests: number;
    numFailedTests: number;
    numTotalTestSuites: number;
    testResults: { status: string }[];
  };
  const brokenFiles = report.testResults.filter((f) => f.status === 'failed').length;
  const failed = report.numFailedTests + (report.numFailedTests === 0 && res.status !== 0 ? Math.max(1, brokenFiles) : 0);
  return { passed: report.numPassedTests, failed };
}

/** An npm script counts as one check: passed when it exits 0. */
async function runCheck(script: string, failure: string): Promise<Tally> {
  log(`${script}…`);
  const child = spawn('npm', ['run', '--silent', script], { cwd: ROOT, stdio: 'inherit' });
  const status = await new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
  if (status !== 0) log(`${failure} (npm run ${script})`);
  return status === 0 ? { passed: 1, failed: 0 } : { passed: 0, failed: 1 };
}

/** ESLint (layers, errors) and Prettier (formatting), each one check. */
async function runStaticChecks(): Promise<Tally> {
  const lint = await runCheck('lint', 'lint found errors');
  const format = await runCheck('format:check', 'files are not formatted; run npm run format');
  return { passed: lint.passed + format.passed, failed: lint.failed + format.failed };
}

async function main() {
  const work = mkdtempSync(join(tmpdir(), 'bearline-test-'));
  chmodSync(work, 0o755); // the postgres system user must reach the cluster folder inside
  const clusterDir = join(work, 'pg');
  let server: ChildProcess | null = null;
  let fakeS3: FakeS3 | null = null;
  const tally: Tally = await runStaticChecks();
  try {
    ensureChromium();
    log(`throwaway PostgreSQL on 127.0.0.1:${PG_PORT}`);
    const testUrl = await startCluster({ dir: clusterDir, port: PG_PORT, fast: true, dbName: 'bearline_test' });
    // A second database holds the demo scenario for the running app and browser tests.
    const e2eUrl = databaseUrl({ dir: clusterDir, port: PG_PORT, dbName: 'bearline_e2e' });
    await startCluster({ dir: clusterDir, port: PG_PORT, fast: true, dbName: 'bearline_e2e' });
    await migrateLatest(e2eUrl);
    // Seeds that write files (elevation samples) put them where the app will read them.
    process.env.DATA_DIR = join(work, 'data');
    await runSeeds(e2eUrl);
    buildIfChanged();
    const mailDir = join(work, 'mail');
    const smtpUrl = await startMailCatcher({ port: SMTP_PORT, dir: mailDir });
    log(`fake S3 on 127.0.0.1:${S3_PORT}`);
    fakeS3 = await startFakeS3({ port: S3_PORT, dir: join(work, 's3') });
    const appUrl = `http://127.0.0.1:${APP_PORT}`;
    server = startServer({
      host: '127.0.0.1',
      port: APP_PORT,
      stdio: 'ignore',
      env: { DATABASE_URL: e2eUrl, SMTP_URL: smtpUrl, DATA_DIR: join(work, 'data'), MAIL_DIR: mailDir },
    });
    await waitForHttp(`${appUrl}/api/health`);

    const env = {
      DATABASE_URL: testUrl,
      APP_URL: appUrl,
      E2E_DATABASE_URL: e2eUrl,
      MAIL_DIR: mailDir,
      SMTP_URL: smtpUrl,
      DATA_DIR: join(work, 'data-int'),
      S3_TEST_ENDPOINT: fakeS3.endpoint,
    };
    const unit = await runVitest('unit + integration', [], env, join(work, 'vitest.json'));
    const browser = await runVitest('browser', ['--config', 'vitest.e2e.config.ts'], env, join(work, 'vitest-e2e.json'));
    tally.passed += unit.passed + browser.passed;
    tally.failed += unit.failed + browser.failed;
  } catch (err) {
    console.error(`[bearline] test run aborted: ${err instanceof Error ? err.stack : err}`);
    tally.failed += 1;
  } finally {
    server?.kill('SIGTERM');
    await fakeS3?.close().catch(() => undefined);
    try {
      destroyCluster(clusterDir);
    } catch (err) {
      console.error(`[bearline] could not remove the test cluster: ${err instanceof Error ? err.message : err}`);
    }
    rmSync(work, { recursive: true, force: true });
  }
  console.log(`\n${tally.passed} passed, ${tally.failed} failed`);
  process.exit(tally.failed > 0 ? 1 : 0);
}

main();
