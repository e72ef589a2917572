import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

// `npm run bench`: every benchmark in turn, each in its own process so one's memory and JIT
// state do not colour the next one's figures. Extra arguments (e.g. --quick) are passed on.
const here = dirname(fileURLToPath(import.meta.url));
const benches = ['analysis-bench.ts', 'matching-bench.ts'];
let failed = 0;
for (const file of benches) {
  console.log(`\n=== ${file} ===`);
  const run = spawnSync(process.execPath, ['--import', 'tsx', join(here, file), ...process.argv.slice(2)], {
    stdio: 'inherit',
  });
  if (run.status !== 0) failed++;
}
process.exit(failed ? 1 : 0);
