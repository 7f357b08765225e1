// npm run scale:demo: the scaling rehearsal (scripts/lib/scale-demo.ts) started and left running
// until Ctrl+C, which stops nginx, both app instances, the standby and the primary.
import { startScaleDemo } from './lib/scale-demo';
import { log } from './lib/project';

async function main() {
  const demo = await startScaleDemo();
  log(`nginx on ${demo.publicUrl} → app instances on :${demo.ports.apps.join(' and :')}`);
  log(`writes go to the primary (:${demo.ports.primary}); tiles, the map list, shortlists and address search read the standby (:${demo.ports.standby})`);
  log('Ctrl+C stops everything');
  const stop = () => demo.stop().then(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  console.error(`[bearline] ${err instanceof Error ? err.stack : err}`);
  process.exit(1);
});
