import type { ChildProcess } from 'node:child_process';

export function hasExited(child: ChildProcess): boolean;
export function assertPortFree(port: number, options?: { host?: string; what?: string; envName?: string }): Promise<void>;
export function waitForOwnServer(
  healthUrl: string,
  instanceId: string,
  options?: { timeoutMs?: number; child?: ChildProcess; name?: string },
): Promise<{ instanceId: string; status: string; [key: string]: unknown }>;
export function waitForReadyMessage(
  child: ChildProcess,
  instanceId: string,
  options?: { timeoutMs?: number; name?: string },
): Promise<{ type: 'ready'; instanceId: string }>;
export function stopChild(child: ChildProcess, options?: { graceMs?: number; signal?: NodeJS.Signals; group?: boolean }): Promise<boolean>;
