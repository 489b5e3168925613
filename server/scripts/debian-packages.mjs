// Installs Debian packages through apt when a needed binary or module is missing.
// Used by the start and test set-up; nothing here downloads anything but Debian packages.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

const isRoot = process.getuid?.() === 0;

/** Runs apt-get (through sudo when not root) and fails loudly with apt's own output. */
function apt(args) {
  const cmd = isRoot ? 'apt-get' : 'sudo';
  const full = isRoot ? args : ['-n', 'apt-get', ...args];
  const result = spawnSync(cmd, full, {
    stdio: ['ignore', 'pipe', 'pipe'],
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
    encoding: 'utf8',
  });
  if (result.status !== 0) {
    throw new Error(`apt-get ${args.join(' ')} failed (exit ${result.status}):\n${result.stderr || result.stdout}`);
  }
}

let updated = false;

/**
 * Makes sure each package is installed. `present` tells whether a package's payload is
 * already usable (a binary path, a Python module), so a machine that has it some other way
 * is left alone.
 * @param {{ name: string, present: () => boolean }[]} packages
 * @param {(msg: string) => void} log
 */
export function ensureDebianPackages(packages, log = console.log) {
  const missing = packages.filter((p) => !p.present());
  if (missing.length === 0) return;
  const names = missing.map((p) => p.name);
  log(`installing Debian packages: ${names.join(', ')} (apt-get; this happens once per machine)`);
  try {
    apt(['install', '-y', '--no-install-recommends', ...names]);
  } catch {
    if (!updated) {
      apt(['update']);
      updated = true;
    }
    apt(['install', '-y', '--no-install-recommends', ...names]);
  }
  const still = missing.filter((p) => !p.present()).map((p) => p.name);
  if (still.length) throw new Error(`apt-get installed ${still.join(', ')} but they are still not usable`);
}

export const fileExists = (path) => () => existsSync(path);

/** True when `/usr/bin/python3` can import the module. */
export const pythonModule = (module) => () => {
  if (!existsSync('/usr/bin/python3')) return false;
  try {
    execFileSync('/usr/bin/python3', ['-c', `import ${module}`], { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
};
