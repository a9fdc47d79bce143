// Runs before `npm test`: the browser tests drive Debian's Chromium at /usr/bin/chromium through
// playwright-core (no browser download). On a fresh machine, as root, install it with apt-get; as
// another user, say what to run. Never downloads a browser build of its own.
import { existsSync } from 'node:fs';
import { spawnSync } from 'node:child_process';

const CHROMIUM = '/usr/bin/chromium';
if (!existsSync(CHROMIUM)) {
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  if (!isRoot) {
    console.error(`browser tests need Debian's Chromium at ${CHROMIUM}; install it with: sudo apt-get update && sudo apt-get install -y chromium`);
    process.exit(1);
  }
  console.error(`${CHROMIUM} not found: installing Debian's chromium package (apt-get)`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  for (const args of [['update'], ['install', '-y', 'chromium']]) {
    const run = spawnSync('apt-get', args, { stdio: 'inherit', env });
    if (run.status !== 0) {
      console.error(`apt-get ${args.join(' ')} failed (exit ${run.status}); install chromium by hand and run the tests again`);
      process.exit(1);
    }
  }
}
