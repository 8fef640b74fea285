import type { WebhookTransport } from '@keelson/verify';

/**
 * Webhook transport over Node's fetch: one POST, no redirects followed (a signed delivery goes where
 * it was configured to), a time limit per attempt; the response body is drained and ignored.
 */
export function fetchTransport(timeoutMs = 10_000): WebhookTransport {
  return async (req) => {
    const res = await fetch(req.url, { method: 'POST', headers: req.headers, body: req.body, redirect: 'manual', signal: AbortSignal.timeout(timeoutMs) });
    await res.arrayBuffer().catch(() => undefined);
    return { status: res.status };
  };
}
