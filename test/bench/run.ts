/**
 * `npm run bench`: runs every `*.bench.ts` in this folder (or those named on the command
 * line) and prints their figures. Benchmarks print measurements; they never assert a time.
 * Each file default-exports `async function (): Promise<void>` that prints its own lines.
 * `npm run bench -- api`: API latency under load (api.bench.ts, autocannon against a server of its own).
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';

async function main(): Promise<void> {
  const only = process.argv.slice(2);
  const files = readdirSync(__dirname)
    .filter((f) => f.endsWith('.bench.ts'))
    .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
    .sort();
  console.log(`Spincycle benchmarks on Node ${process.version}, ${new Date().toISOString()}`);
  for (const file of files) {
    console.log(`\n== ${file.replace('.bench.ts', '')} ==`);
    const mod = await import(pathToFileURL(join(__dirname, file)).href);
    const run = (mod.default?.default ?? mod.default) as () => Promise<void>;
    await run();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
