import { timingSafeEqual } from 'node:crypto';
import { ApiError } from './errors';
import { sha256 } from './keys';

/** Tenant of requests when the service runs without keys (localhost only). */
export const LOCAL_TENANT = 'local';

/**
 * API keys, kept only as SHA-256 hashes, each belonging to a tenant. A presented key is hashed and
 * compared in constant time with every stored hash, so neither the keys nor their prefixes leak.
 */
export class KeyRing {
  private readonly hashes: { readonly hash: Buffer; readonly tenant: string }[];

  constructor(pairs: readonly { readonly tenant: string; readonly key: string }[]) {
    this.hashes = pairs.map((p) => ({ hash: Buffer.from(sha256(p.key), 'hex'), tenant: p.tenant }));
  }

  get enabled(): boolean {
    return this.hashes.length > 0;
  }

  get tenants(): string[] {
    return [...new Set(this.hashes.map((h) => h.tenant))];
  }

  /** The tenant of an `Authorization` header, or the problem to answer. */
  tenantOf(authorization: string | undefined): string | ApiError {
    if (!this.enabled) return LOCAL_TENANT;
    if (!authorization) return new ApiError('UNAUTHENTICATED', 'send "Authorization: Bearer <key>"', {}, { 'www-authenticate': 'Bearer' });
    const m = /^Bearer\s+(\S+)\s*$/i.exec(authorization);
    if (!m) return new ApiError('UNAUTHENTICATED', 'the Authorization header must be "Bearer <key>"', {}, { 'www-authenticate': 'Bearer' });
    const h = Buffer.from(sha256(m[1]!), 'hex');
    let tenant: string | null = null;
    for (const k of this.hashes) if (timingSafeEqual(k.hash, h)) tenant ??= k.tenant;
    return tenant ?? new ApiError('INVALID_API_KEY', 'the API key is not valid', {}, { 'www-authenticate': 'Bearer error="invalid_token"' });
  }
}
