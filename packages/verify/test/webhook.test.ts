import { createHmac } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { DELIVERY_HEADER, SIGNATURE_HEADER, TIMESTAMP_HEADER, deliverWebhook, verifyWebhookSignature, webhookSignature, type DeliveryAttempt, type WebhookRequest } from '../src';
import { ManualClock } from './manual-clock';

/** A clock whose waits pass at once but are recorded: backoff is checked without sleeping. */
function instantClock(start: string) {
  const clock = new ManualClock(start);
  const waits: number[] = [];
  const setTimer = clock.setTimer.bind(clock);
  clock.setTimer = (f, ms) => {
    waits.push(ms);
    const h = setTimer(f, ms);
    queueMicrotask(() => clock.advance(ms));
    return h;
  };
  return { clock, waits };
}

/** A transport answering with the given statuses in turn (a thrown Error for null), recording requests. */
function scripted(statuses: (number | null)[]) {
  const requests: WebhookRequest[] = [];
  const transport = async (req: WebhookRequest) => {
    requests.push(req);
    const s = statuses.shift();
    if (s === null || s === undefined) throw new Error('connect ECONNREFUSED 127.0.0.1:9');
    return { status: s };
  };
  return { transport, requests };
}

const target = { url: 'http://127.0.0.1:9/hook', secret: 's3cret' };

describe('webhook signature', () => {
  it('is HMAC-SHA256 of "<timestamp>.<body>" with the shared secret, as hex after "sha256="', () => {
    const body = '{"event":"verification.completed"}';
    const hmac = createHmac('sha256', 's3cret').update(`1772416800.${body}`).digest('hex');
    expect(webhookSignature('s3cret', '1772416800', body)).toBe(`sha256=${hmac}`);
  });

  it('is accepted by the receiver check only with the right secret, body and a fresh timestamp', () => {
    const body = '{"a":1}';
    const now = new Date('2026-03-02T02:00:00Z');
    const timestamp = String(now.getTime() / 1000);
    const signature = webhookSignature('s3cret', timestamp, body);
    expect(verifyWebhookSignature({ secret: 's3cret', body, timestamp, signature, now })).toBe(true);
    expect(verifyWebhookSignature({ secret: 'other', body, timestamp, signature, now })).toBe(false);
    expect(verifyWebhookSignature({ secret: 's3cret', body: '{"a":2}', timestamp, signature, now })).toBe(false);
    expect(verifyWebhookSignature({ secret: 's3cret', body, timestamp, signature, now: new Date(now.getTime() + 301_000) })).toBe(false);
    expect(verifyWebhookSignature({ secret: 's3cret', body, timestamp: undefined, signature, now })).toBe(false);
  });
});

describe('deliverWebhook', () => {
  it('retries a 500 and a network fault with doubling backoff, then delivers; every attempt is logged', async () => {
    const { clock, waits } = instantClock('2026-03-02T02:00:00Z');
    const { transport, requests } = scripted([500, null, 204]);
    const log: DeliveryAttempt[] = [];
    const r = await deliverWebhook(target, 'verification.completed', { run: 'r1' }, { transport, clock, onAttempt: (a) => log.push(a), deliveryId: 'd-1' });
    expect(r.delivered).toBe(true);
    expect(waits).toEqual([2000, 4000]);
    expect(log.map((a) => [a.attempt, a.status, a.outcome, a.error])).toEqual([
      [1, 500, 'retry', 'HTTP 500'],
      [2, null, 'retry', 'connect ECONNREFUSED 127.0.0.1:9'],
      [3, 204, 'delivered', null],
    ]);
    expect(log.map((a) => a.at)).toEqual(['2026-03-02T02:00:00.000Z', '2026-03-02T02:00:02.000Z', '2026-03-02T02:00:06.000Z']);
    expect(log[0]!.nextAttemptAt).toBe('2026-03-02T02:00:02.000Z');
    // Same delivery id on every attempt; each attempt signed with its own timestamp.
    expect(requests.map((q) => q.headers[DELIVERY_HEADER])).toEqual(['d-1', 'd-1', 'd-1']);
    for (const q of requests)
      expect(verifyWebhookSignature({ secret: 's3cret', body: q.body, timestamp: q.headers[TIMESTAMP_HEADER], signature: q.headers[SIGNATURE_HEADER], now: new Date(Number(q.headers[TIMESTAMP_HEADER]) * 1000) })).toBe(true);
  });

  it('gives up after the last attempt, and at once on an answer that would not change (4xx)', async () => {
    const { clock } = instantClock('2026-03-02T02:00:00Z');
    const down = await deliverWebhook(target, 'e', {}, { transport: scripted([503, 503, 503]).transport, clock, maxAttempts: 3 });
    expect(down.delivered).toBe(false);
    expect(down.attempts.map((a) => a.outcome)).toEqual(['retry', 'retry', 'failed']);
    const refused = await deliverWebhook(target, 'e', {}, { transport: scripted([401]).transport, clock });
    expect(refused.attempts.map((a) => [a.status, a.outcome])).toEqual([[401, 'failed']]);
  });

  it('refuses a target that is not http(s)', async () => {
    const { clock } = instantClock('2026-03-02T02:00:00Z');
    await expect(deliverWebhook({ url: 'file:///etc/passwd', secret: 'x' }, 'e', {}, { transport: scripted([]).transport, clock })).rejects.toMatchObject({ code: 'BAD_WEBHOOK' });
  });
});
