#!/usr/bin/env node
// The `spincycle` command. Registers tsx (resolved from this project's node_modules,
// relative to this file rather than to the current directory) for both module systems —
// the CLI's TypeScript is CommonJS-format and loads its commands with dynamic import() —
// and runs shared/src/cli/main.ts, so it works from any directory.
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const require = createRequire(import.meta.url);
require('tsx/cjs/api').register();
(await import('tsx/esm/api')).register();
require(join(dirname(fileURLToPath(import.meta.url)), '..', 'src', 'cli', 'main.ts'));
