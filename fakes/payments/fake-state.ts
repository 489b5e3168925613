import { randomBytes } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { dirname } from 'node:path';
import type { CardBehaviour } from './test-cards';

/** An API object as the fake stores and returns it (the provider's field names). */
export type ApiObject = { id: string; object: string } & Record<string, unknown>;

/** A stored PaymentMethod: the public object (brand and last four digits only) and its test behaviour. */
export interface StoredPaymentMethod {
  object: ApiObject;
  behaviour: CardBehaviour;
}

/** An event as the webhooks carry it. */
export interface FakeEvent {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  data: { object: ApiObject; previous_attributes?: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null } | null;
  type: string;
}

/** One try to deliver an event to the webhook URL. */
export interface DeliveryAttempt {
  /** When the try started (ISO 8601). */
  at: string;
  /** HTTP status the receiver answered, or null (network error, timeout, simulated failure). */
  status: number | null;
  error: string | null;
  /** True for a failure made by "fail next N sends" (the receiver was not called). */
  simulated: boolean;
  durationMs: number;
}

/** The delivery of one event to the webhook URL, retried until the receiver answers 2xx. */
export interface Delivery {
  id: string;
  eventId: string;
  eventType: string;
  /** The exact body sent (and signed) on every try. */
  payload: string;
  status: 'pending' | 'succeeded' | 'failed';
  attemptCount: number;
  /** The latest tries (at most 20 are kept). */
  attempts: DeliveryAttempt[];
  /** When the next try is due (ms since the epoch). */
  nextAttemptAt: number;
  createdAt: string;
  deliveredAt: string | null;
}

/** The first answer to a POST with an `Idempotency-Key`, replayed byte for byte. */
export interface IdempotencyRecord {
  /** Hash of the API key: keys are scoped per API key, and the key itself is never stored. */
  scope: string;
  key: string;
  method: string;
  path: string;
  /** Hash of the parameters (card fields masked before hashing). */
  fingerprint: string;
  status: number;
  body: string;
  requestId: string;
  createdAt: number;
}

/** Everything the fake persists between starts. */
export interface FakeStateData {
  version: 1;
  customers: Record<string, ApiObject>;
  paymentMethods: Record<string, StoredPaymentMethod>;
  paymentIntents: Record<string, ApiObject>;
  charges: Record<string, ApiObject>;
  refunds: Record<string, ApiObject>;
  /** Oldest first. */
  events: FakeEvent[];
  deliveries: Delivery[];
  idempotency: Record<string, IdempotencyRecord>;
}

export function emptyState(): FakeStateData {
  return {
    version: 1,
    customers: {},
    paymentMethods: {},
    paymentIntents: {},
    charges: {},
    refunds: {},
    events: [],
    deliveries: [],
    idempotency: {},
  };
}

const KEEP_EVENTS = 2000;
const KEEP_FINISHED_DELIVERIES = 2000;
const IDEMPOTENCY_TTL_MS = 24 * 3600 * 1000;

/** Reads the state file, or an empty state when there is none; a damaged file stops the start. */
export function loadState(file: string | null): FakeStateData {
  if (!file || !existsSync(file)) return emptyState();
  let parsed: unknown;
  try {
    parsed = JSON.parse(readFileSync(file, 'utf8'));
  } catch (err) {
    throw new Error(`payment fake: cannot read its state file ${file}: ${(err as Error).message} (delete it to start empty)`);
  }
  const data = parsed as Partial<FakeStateData> | null;
  if (!data || data.version !== 1) throw new Error(`payment fake: ${file} is not a version-1 state file (delete it to start empty)`);
  return { ...emptyState(), ...data };
}

/**
 * Writes the state atomically (a temporary file beside it, then a rename) and in order: a save
 * asked for while another is being written is coalesced into the next write, which snapshots
 * the state when it starts, so it includes every change made before it was asked for.
 */
export class StateWriter {
  private current: Promise<void> = Promise.resolve();
  private queued: Promise<void> | null = null;

  constructor(
    private readonly file: string | null,
    private readonly snapshot: () => FakeStateData,
  ) {}

  save(): Promise<void> {
    if (!this.file) return Promise.resolve();
    if (this.queued) return this.queued;
    const run = this.current.then(async () => {
      this.queued = null;
      await this.writeNow(this.file!);
    });
    this.queued = run;
    this.current = run.catch(() => undefined);
    return run;
  }

  /** Resolves once every save asked for so far is written (or has failed). */
  async flush(): Promise<void> {
    await this.current;
  }

  private async writeNow(file: string): Promise<void> {
    const state = this.snapshot();
    prune(state);
    const text = JSON.stringify(state);
    await mkdir(dirname(file), { recursive: true });
    const tmp = `${file}.${process.pid}.${randomBytes(6).toString('hex')}.tmp`;
    try {
      await writeFile(tmp, text, { mode: 0o600 });
      await rename(tmp, file);
    } catch (err) {
      await rm(tmp, { force: true });
      throw err;
    }
  }
}

/** Drops what the fake no longer needs: old events, old finished deliveries, expired idempotency keys. */
export function prune(state: FakeStateData, now = Date.now()): void {
  if (state.events.length > KEEP_EVENTS) state.events.splice(0, state.events.length - KEEP_EVENTS);
  const finished = state.deliveries.filter((d) => d.status !== 'pending');
  if (finished.length > KEEP_FINISHED_DELIVERIES) {
    const drop = new Set(finished.slice(0, finished.length - KEEP_FINISHED_DELIVERIES));
    state.deliveries = state.deliveries.filter((d) => !drop.has(d));
  }
  for (const [k, r] of Object.entries(state.idempotency)) {
    if (now - r.createdAt > IDEMPOTENCY_TTL_MS) delete state.idempotency[k];
  }
}
