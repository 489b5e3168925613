import type { ChildProcess } from 'node:child_process';

export default async function globalTeardown(): Promise<void> {
  const children = ((globalThis as Record<string, unknown>).__spincycleE2eChildren ?? []) as ChildProcess[];
  await Promise.all(
    children.map(
      (c) =>
        new Promise<void>((resolve) => {
          if (c.exitCode !== null) return resolve();
          c.once('exit', () => resolve());
          c.kill('SIGTERM');
          setTimeout(() => (c.kill('SIGKILL'), resolve()), 5000).unref();
        }),
    ),
  );
}
