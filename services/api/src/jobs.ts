import { randomUUID } from 'node:crypto';
import type { Context } from './context';
import { sha256 } from './keys';
import type { Settings } from './settings';
import type { NewItem, Upload } from './store';
import type { Drawing } from './uploads';

/**
 * Makes a job durable, then announces it: the upload and every drawing go into the store
 * (content-addressed) and the job with its items in one transaction, before anyone is told its id.
 */
export async function createJob(
  ctx: Context,
  tenant: string,
  upload: { readonly name: string; readonly bytes: Buffer | null; readonly kind: Upload['kind'] },
  drawings: readonly Drawing[],
  settings: Settings,
): Promise<string> {
  const uploadSha = upload.bytes ? sha256(upload.bytes) : sha256(JSON.stringify(drawings.map((d) => d.source)));
  if (upload.bytes && upload.kind !== 'dxf') await ctx.store.putBlob(uploadSha, upload.bytes);
  const items: NewItem[] = [];
  for (const d of drawings) {
    if ('error' in d) {
      items.push({ name: d.name, source: d.source, error: d.error });
      continue;
    }
    const sha = sha256(d.bytes);
    await ctx.store.putBlob(sha, d.bytes);
    items.push({ name: d.name, source: d.source, blobSha256: sha });
  }
  const id = randomUUID();
  await ctx.store.createJob(
    {
      id,
      tenant,
      createdAt: Date.now(),
      settings: settings as unknown as Record<string, unknown>,
      upload: { name: upload.name, sha256: uploadSha, bytes: upload.bytes?.length ?? drawings.reduce((n, d) => n + ('bytes' in d ? d.bytes.length : 0), 0), kind: upload.kind },
    },
    items,
  );
  ctx.metrics.jobsCreated.inc();
  ctx.queue.notify();
  return id;
}
