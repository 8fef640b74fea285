import { createServer, type IncomingMessage, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SIGNATURE_HEADER, TIMESTAMP_HEADER, deliverWebhook, systemClock, verifyWebhookSignature, type Clock, type DeliveryAttempt } from '@keelson/verify';
import { fetchTransport } from '../src';

/** What the local PLM inbox saw of each request, and what it answered. */
interface Received {
  readonly valid: boolean;
  readonly event: string | undefined;
  readonly delivery: string | undefined;
  readonly body: string;
  readonly answered: number;
}

let server: Server;
let url = '';
const received: Received[] = [];
const SECRET = 'plm-shared-secret';

const bodyOf = (req: IncomingMessage) =>
  new Promise<string>((resolve) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
  });

// A PLM inbox on 127.0.0.1: checks each signature; answers 500 to the first delivery, 204 after, 401 to a bad signature.
beforeAll(async () => {
  server = createServer(async (req, res) => {
    const body = await bodyOf(req);
    const valid = verifyWebhookSignature({
      secret: SECRET,
      body,
      timestamp: req.headers[TIMESTAMP_HEADER] as string | undefined,
      signature: req.headers[SIGNATURE_HEADER] as string | undefined,
    });
    const answered = !valid ? 401 : received.length === 0 ? 500 : 204;
    received.push({ valid, event: req.headers['x-keelson-event'] as string, delivery: req.headers['x-keelson-delivery'] as string, body, answered });
    res.writeHead(answered).end();
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  url = `http://127.0.0.1:${(server.address() as AddressInfo).port}/plm/inbox`;
});
afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));

/** The real clock for time stamps; a backoff wait passes at once (and is recorded): the test never sleeps. */
const waits: number[] = [];
const clock: Clock = {
  ...systemClock,
  setTimer: (f, ms) => {
    waits.push(ms);
    return setImmediate(f);
  },
  clearTimer: () => undefined,
};

describe('webhook delivery to a local receiver over HTTP', () => {
  it('is signed (the receiver verifies it), a 500 is answered by a retry, and the log shows both attempts', async () => {
    const log: DeliveryAttempt[] = [];
    const payload = { event: 'verification.completed', run: { id: '20260302T020000Z-abcdef' }, passed: false };
    const r = await deliverWebhook({ url, secret: SECRET }, 'verification.completed', payload, { transport: fetchTransport(5000), clock, onAttempt: (a) => log.push(a) });
    expect(r.delivered).toBe(true);
    expect(received.map((x) => [x.valid, x.answered])).toEqual([
      [true, 500],
      [true, 204],
    ]);
    expect(JSON.parse(received[1]!.body)).toEqual(payload);
    expect(received.map((x) => x.event)).toEqual(['verification.completed', 'verification.completed']);
    expect(received[0]!.delivery).toBe(received[1]!.delivery);
    expect(waits).toEqual([2000]);
    expect(log.map((a) => [a.attempt, a.status, a.outcome])).toEqual([
      [1, 500, 'retry'],
      [2, 204, 'delivered'],
    ]);
    expect(log.every((a) => a.url === url && a.deliveryId === received[0]!.delivery)).toBe(true);
  });

  it('a receiver holding another secret refuses the signature (401), which is not retried', async () => {
    const before = received.length;
    const r = await deliverWebhook({ url, secret: 'wrong' }, 'verification.completed', {}, { transport: fetchTransport(5000), clock });
    expect(r.delivered).toBe(false);
    expect(received.slice(before).map((x) => [x.valid, x.answered])).toEqual([[false, 401]]);
    expect(r.attempts.map((a) => a.outcome)).toEqual(['failed']);
  });

  it('a port nobody listens on is a network fault: retried, then given up', async () => {
    const dead = createServer();
    await new Promise<void>((resolve) => dead.listen(0, '127.0.0.1', resolve));
    const port = (dead.address() as AddressInfo).port;
    await new Promise<void>((resolve) => dead.close(() => resolve()));
    const r = await deliverWebhook({ url: `http://127.0.0.1:${port}/`, secret: SECRET }, 'e', {}, { transport: fetchTransport(2000), clock, maxAttempts: 2 });
    expect(r.attempts.map((a) => [a.status, a.outcome])).toEqual([
      [null, 'retry'],
      [null, 'failed'],
    ]);
    expect(r.attempts[0]!.error).toMatch(/fetch failed|ECONNREFUSED/);
  });
});
