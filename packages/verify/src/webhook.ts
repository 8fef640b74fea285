import { createHmac, randomUUID, timingSafeEqual } from 'node:crypto';
import { sleep, type Clock } from './clock';
import { VerifyError } from './errors';

/** What a transport sends: always a POST of a JSON body. */
export interface WebhookRequest {
  readonly url: string;
  readonly headers: Readonly<Record<string, string>>;
  readonly body: string;
}

/** Sends one request and resolves with the HTTP status, or rejects on a network fault or time-out. */
export type WebhookTransport = (req: WebhookRequest) => Promise<{ readonly status: number }>;

export interface WebhookTarget {
  readonly url: string;
  /** Shared secret of the HMAC-SHA256 signature. */
  readonly secret: string;
}

/** One attempt as the delivery log records it. */
export interface DeliveryAttempt {
  /** Same on every retry of one delivery, so a receiver can drop duplicates. */
  readonly deliveryId: string;
  readonly event: string;
  readonly url: string;
  /** 1-based. */
  readonly attempt: number;
  readonly at: string;
  readonly status: number | null;
  readonly error: string | null;
  /** delivered: 2xx; retry: another attempt follows; failed: given up. */
  readonly outcome: 'delivered' | 'retry' | 'failed';
  readonly nextAttemptAt: string | null;
}

export interface DeliveryOptions {
  readonly transport: WebhookTransport;
  readonly clock: Clock;
  /** Attempts in all, the first included (default 6). */
  readonly maxAttempts?: number;
  /** Wait before attempt n + 1 after attempt n fails (default 2 s doubling: 2, 4, 8, 16, 32 s). */
  readonly backoffMs?: (attempt: number) => number;
  /** Called with every attempt as it ends: the delivery log. */
  readonly onAttempt?: (a: DeliveryAttempt) => void;
  readonly deliveryId?: string;
}

export const SIGNATURE_HEADER = 'x-keelson-signature';
export const TIMESTAMP_HEADER = 'x-keelson-timestamp';
export const EVENT_HEADER = 'x-keelson-event';
export const DELIVERY_HEADER = 'x-keelson-delivery';

export const defaultBackoff = (attempt: number): number => Math.min(2000 * 2 ** (attempt - 1), 3_600_000);

/**
 * "sha256=<hex>" of HMAC-SHA256(secret, "<timestamp>.<body>"): the timestamp is signed too, so a
 * captured request cannot be replayed later with a fresh timestamp.
 */
export function webhookSignature(secret: string, timestamp: string, body: string): string {
  return `sha256=${createHmac('sha256', secret).update(`${timestamp}.${body}`).digest('hex')}`;
}

/**
 * What a receiver checks: the signature matches (compared in constant time) and the timestamp
 * (Unix seconds) is within `toleranceS` of `now`.
 */
export function verifyWebhookSignature(opts: {
  readonly secret: string;
  readonly body: string;
  readonly timestamp: string | undefined;
  readonly signature: string | undefined;
  readonly now?: Date;
  readonly toleranceS?: number;
}): boolean {
  if (!opts.timestamp || !opts.signature || !/^\d+$/.test(opts.timestamp)) return false;
  const age = Math.abs((opts.now ?? new Date()).getTime() / 1000 - Number(opts.timestamp));
  if (age > (opts.toleranceS ?? 300)) return false;
  const want = Buffer.from(webhookSignature(opts.secret, opts.timestamp, opts.body));
  const got = Buffer.from(opts.signature);
  return want.length === got.length && timingSafeEqual(want, got);
}

/** A URL a webhook may be sent to (http or https), or a VerifyError. */
export function checkWebhookUrl(url: string): URL {
  let u: URL;
  try {
    u = new URL(url);
  } catch {
    throw new VerifyError('BAD_WEBHOOK', `webhook URL "${url}" is not a URL`);
  }
  if (u.protocol !== 'http:' && u.protocol !== 'https:') throw new VerifyError('BAD_WEBHOOK', `webhook URL "${url}" must be http or https`);
  return u;
}

/**
 * Whether a response is worth another attempt: network faults, 408, 425, 429 and 5xx are passing
 * conditions; any other answer (a 4xx, a redirect) would be the same next time.
 */
const retryable = (status: number | null) => status === null || status === 408 || status === 425 || status === 429 || status >= 500;

/**
 * Delivers one event: POSTs the JSON body signed with HMAC-SHA256, retrying with backoff until a 2xx,
 * a final answer, or the last attempt. Never throws for the receiver's faults: the attempts say what
 * happened, and each is passed to `onAttempt` as it ends.
 */
export async function deliverWebhook(
  target: WebhookTarget,
  event: string,
  payload: unknown,
  opts: DeliveryOptions,
): Promise<{ delivered: boolean; attempts: DeliveryAttempt[] }> {
  checkWebhookUrl(target.url);
  const body = JSON.stringify(payload);
  const deliveryId = opts.deliveryId ?? randomUUID();
  const max = opts.maxAttempts ?? 6;
  const backoff = opts.backoffMs ?? defaultBackoff;
  const attempts: DeliveryAttempt[] = [];
  for (let n = 1; n <= max; n++) {
    const at = opts.clock.now();
    const timestamp = String(Math.floor(at.getTime() / 1000));
    const headers = {
      'content-type': 'application/json',
      'user-agent': 'keelson-webhook/1',
      [EVENT_HEADER]: event,
      [DELIVERY_HEADER]: deliveryId,
      [TIMESTAMP_HEADER]: timestamp,
      [SIGNATURE_HEADER]: webhookSignature(target.secret, timestamp, body),
    };
    let status: number | null = null;
    let error: string | null = null;
    try {
      status = (await opts.transport({ url: target.url, headers, body })).status;
    } catch (e) {
      error = e instanceof Error ? e.message : String(e);
    }
    const ok = status !== null && status >= 200 && status < 300;
    const again = !ok && retryable(status) && n < max;
    const wait = again ? backoff(n) : 0;
    const attempt: DeliveryAttempt = {
      deliveryId,
      event,
      url: target.url,
      attempt: n,
      at: at.toISOString(),
      status,
      error: error ?? (ok ? null : status !== null ? `HTTP ${status}` : 'no response'),
      outcome: ok ? 'delivered' : again ? 'retry' : 'failed',
      nextAttemptAt: again ? new Date(opts.clock.now().getTime() + wait).toISOString() : null,
    };
    attempts.push(attempt);
    opts.onAttempt?.(attempt);
    if (!again) return { delivered: ok, attempts };
    await sleep(opts.clock, wait);
  }
  return { delivered: false, attempts };
}
