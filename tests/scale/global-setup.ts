// Runs once in vitest's main process before the rehearsal's test file: installs nginx when missing
// and builds the app when its sources changed. Both block for minutes (apt, astro build); inside the
// test worker they would starve its messages to vitest, which then reports a timeout.
import { ensureNginx } from '../../scripts/lib/system-packages';
import { buildIfChanged } from '../../scripts/lib/build';

export default function setup(): void {
  ensureNginx();
  buildIfChanged();
}
