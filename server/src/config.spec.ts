import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { loadConfig, loadSettings } from './config';

describe('loadConfig: settings of the database, password hashing and instance id', () => {
  it('with none of them set, uses the documented defaults', () => {
    const c = loadConfig({});
    expect(c.PG_POOL_MAX).toBe(10);
    expect(c.SCRYPT_LOG_N).toBe(17);
    expect(c.SPINCYCLE_INSTANCE_ID).toBeUndefined();
  });

  it('with valid values, parses them', () => {
    const c = loadConfig({ PG_POOL_MAX: '4', SCRYPT_LOG_N: '11', SPINCYCLE_INSTANCE_ID: '0b6f3c9e-5a47-4b7e-9c3f-2f1d8e6a7b10' });
    expect(c).toMatchObject({ PG_POOL_MAX: 4, SCRYPT_LOG_N: 11, SPINCYCLE_INSTANCE_ID: '0b6f3c9e-5a47-4b7e-9c3f-2f1d8e6a7b10' });
  });

  it('with an empty SPINCYCLE_INSTANCE_ID, treats it as unset', () => {
    expect(loadConfig({ SPINCYCLE_INSTANCE_ID: '' }).SPINCYCLE_INSTANCE_ID).toBeUndefined();
  });

  it.each([
    ['PG_POOL_MAX', '0'],
    ['PG_POOL_MAX', 'many'],
    ['PG_POOL_MAX', '2.5'],
    ['SCRYPT_LOG_N', '9'],
    ['SCRYPT_LOG_N', '21'],
    ['SCRYPT_LOG_N', 'fast'],
    ['SPINCYCLE_INSTANCE_ID', 'two words'],
    ['PGPORT', '70000'],
  ])('with %s=%j, refuses to start, naming the setting', (name, value) => {
    expect(() => loadConfig({ [name]: value })).toThrow(new RegExp(`^invalid environment:\\n  ${name}: `, 'm'));
  });

  it('loadSettings parses the same schema without requiring the web server’s SESSION_SECRET', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(/SESSION_SECRET/);
    expect(loadSettings({ NODE_ENV: 'production', PG_POOL_MAX: '2' }, { PGDATABASE: 'x' })).toMatchObject({
      PG_POOL_MAX: 2,
      PGDATABASE: 'x',
    });
    expect(() => loadSettings({ SCRYPT_LOG_N: '30' })).toThrow(/SCRYPT_LOG_N/);
  });
});

/** Files (not specs) under a folder of the repository, relative to the repository root. */
function sourceFiles(root: string, dir: string): string[] {
  return readdirSync(path.join(root, dir), { withFileTypes: true }).flatMap((e) => {
    const rel = path.posix.join(dir, e.name);
    if (e.isDirectory()) return e.name === 'node_modules' ? [] : sourceFiles(root, rel);
    return /\.(ts|mts|cts|js|mjs|cjs)$/.test(e.name) && !e.name.endsWith('.spec.ts') ? [rel] : [];
  });
}

describe('environment settings are read in config.ts only', () => {
  const root = path.resolve(__dirname, '../..');
  const files = [...sourceFiles(root, 'server/src'), ...sourceFiles(root, 'database')];
  const mentioning = (pattern: RegExp) => files.filter((f) => pattern.test(readFileSync(path.join(root, f), 'utf8'))).sort();

  /** Files that may touch process.env without reading a setting of the application, and why. */
  const EXCEPTIONS: Record<string, string> = {
    'server/src/config.ts': 'parses process.env with the zod schema: the one reader',
    'server/src/features/sky-windows/sky-windows-pool.ts': 'passes the environment through to its worker threads',
    'database/cluster.mjs': 'plain-Node launcher (runs before npm ci): sets up the PostgreSQL cluster and the env of child processes',
  };

  it('no file under server/src or database/ other than config.ts (and the listed exceptions) mentions process.env', () => {
    expect(files).toContain('server/src/config.ts');
    expect(mentioning(/process\.env/).filter((f) => !(f in EXCEPTIONS))).toEqual([]);
  });

  it('only server/src/db/knex.ts makes a Knex, so every Knex has the pg type parsers', () => {
    // A value import of knex (`import knex from 'knex'`, `require('knex')`); `import type { Knex }` is fine.
    expect(mentioning(/import\s+(?!type\b)[^;]*from\s+['"]knex['"]|require\(['"]knex['"]\)/)).toEqual(['server/src/db/knex.ts']);
  });
});
