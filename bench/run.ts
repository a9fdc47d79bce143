/**
 * npm run bench: runs every bench/*.bench.ts in turn. Each exports `default async function (): Promise<void>`
 * that prints its own figures (medians, ratios, per-curve costs). Nothing is asserted here: targets are
 * compared by eye and quoted in closing notes. `npm run bench -- import` runs only files whose name
 * contains "import".
 */
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const filter = process.argv[2] ?? '';
const files = readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts') && f.includes(filter))
  .sort();
for (const file of files) {
  console.log(`\n=== ${file} ===`);
  const mod = await import(pathToFileURL(join(here, file)).href);
  await mod.default();
}
