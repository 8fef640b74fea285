import type { FastifyRequest } from 'fastify';
import { ArchiveError, readZipCatalogue } from '@keelson/archive';
import type { Config } from './config';
import { ApiError } from './errors';
import { UploadFields } from './settings';
import type { ItemError } from './store';

export interface Upload {
  /** The client's file name, reduced to a base name (a label, never a path). */
  readonly filename: string;
  readonly bytes: Buffer;
  readonly fields: UploadFields;
}

/** A drawing to compute, or the reason an archive entry cannot be one. */
export type Drawing =
  | { readonly name: string; readonly source: string; readonly bytes: Buffer }
  | { readonly name: string; readonly source: string; readonly error: ItemError };

// Control characters out of labels (they would reach logs and CSV cells).
const baseName = (s: string) => [...s.split(/[\\/]/).pop()!].filter((c) => c.charCodeAt(0) >= 0x20).join('').slice(-255);
const stem = (s: string) => baseName(s).replace(/\.[^.]*$/, '') || baseName(s);

/**
 * Reads the multipart body: one file in the field `file`, text fields validated after the stream
 * (route schemas cannot see inside multipart). Every part's stream is consumed, whatever happens,
 * or the request would hang; the file is buffered up to the upload limit and refused past it.
 */
export async function readUpload(req: FastifyRequest, cfg: Config): Promise<Upload> {
  if (!req.isMultipart()) throw new ApiError('MALFORMED_UPLOAD', 'send the drawing as multipart/form-data, in the field "file"');
  const fields: Record<string, string> = {};
  let file: { filename: string; bytes: Buffer } | undefined;
  let refusal: ApiError | undefined;
  try {
    for await (const part of req.parts({
      limits: { fileSize: cfg.maxUploadBytes, files: 1, fields: 16, fieldSize: 1024, parts: 17, headerPairs: 100 },
    })) {
      if (part.type === 'file') {
        if (part.fieldname !== 'file') {
          part.file.resume();
          refusal ??= new ApiError('BAD_REQUEST', `unexpected file field "${part.fieldname}": send the drawing in "file"`);
          continue;
        }
        const bytes = await part.toBuffer();
        file = { filename: baseName(part.filename || 'upload'), bytes };
      } else if (typeof part.value === 'string') fields[part.fieldname] = part.value;
    }
  } catch (e) {
    throw uploadError(e, cfg);
  }
  if (refusal) throw refusal;
  if (!file || file.bytes.length === 0) throw new ApiError('EMPTY_UPLOAD', file ? `${file.filename} is empty` : 'no file in the field "file"');
  const parsed = UploadFields.safeParse(fields);
  if (!parsed.success)
    throw new ApiError('BAD_REQUEST', 'invalid form fields', {
      errors: parsed.error.issues.map((i) => ({ field: i.path.join('.') || (i as { keys?: string[] }).keys?.join(', ') || '', message: i.message })),
    });
  return { ...file, fields: parsed.data };
}

function uploadError(e: unknown, cfg: Config): ApiError {
  if (e instanceof ApiError) return e;
  const code = (e as { code?: string }).code;
  if (code === 'FST_REQ_FILE_TOO_LARGE')
    return new ApiError('UPLOAD_TOO_LARGE', `the file is over the ${cfg.maxUploadBytes / 2 ** 20} MiB upload limit`, { limitBytes: cfg.maxUploadBytes });
  if (code === 'FST_FILES_LIMIT') return new ApiError('BAD_REQUEST', 'one file per request, in the field "file"');
  if (code === 'FST_PARTS_LIMIT' || code === 'FST_FIELDS_LIMIT') return new ApiError('BAD_REQUEST', 'too many form fields');
  if (code === 'FST_PROTO_VIOLATION') return new ApiError('BAD_REQUEST', 'forbidden field name');
  if (code === 'FST_INVALID_MULTIPART_CONTENT_TYPE') return new ApiError('MALFORMED_UPLOAD', 'send the drawing as multipart/form-data');
  // busboy: "Unexpected end of form", "Malformed part header", a missing boundary…
  return new ApiError('MALFORMED_UPLOAD', `the multipart body cannot be read: ${(e as Error).message ?? String(e)}`);
}

const ZIP_MAGIC = [Buffer.from('PK\x03\x04', 'latin1'), Buffer.from('PK\x05\x06', 'latin1')];

/** 'zip' by its signature, 'dxf' when the first line is a DXF group code (or the binary sentinel), else null. */
export function sniff(bytes: Buffer): 'zip' | 'dxf' | null {
  if (ZIP_MAGIC.some((m) => bytes.subarray(0, 4).equals(m))) return 'zip';
  const head = bytes.subarray(0, 4096).toString('latin1').replace(/^\uFEFF|^\xEF\xBB\xBF/, '');
  if (head.startsWith('AutoCAD Binary DXF')) return 'dxf';
  const first = head.split(/\r?\n/).find((l) => l.trim() !== '');
  return first !== undefined && /^\s*-?\d{1,4}\s*$/.test(first) ? 'dxf' : null;
}

/**
 * The drawings of an upload: itself if a DXF, its `.dxf` entries if a ZIP (yauzl with lazy
 * entries, caps on entries and on bytes actually inflated; entry names are labels, never paths).
 */
export async function drawingsOf(up: Upload, cfg: Config, maxDrawings = Infinity): Promise<{ kind: 'dxf' | 'zip'; drawings: Drawing[] }> {
  const kind = sniff(up.bytes);
  if (kind === null) throw new ApiError('UNSUPPORTED_MEDIA_TYPE', `${up.filename}: neither an ASCII DXF drawing nor a ZIP archive`);
  if (kind === 'dxf') return { kind, drawings: [{ name: stem(up.filename), source: up.filename, bytes: up.bytes }] };
  let cat;
  try {
    cat = await readZipCatalogue(up.bytes, cfg.zip);
  } catch (e) {
    if (e instanceof ArchiveError)
      throw e.code === 'TOO_MANY_ENTRIES' || e.code === 'TOO_LARGE'
        ? new ApiError('ARCHIVE_TOO_LARGE', `${up.filename}: ${e.message}`)
        : new ApiError('BAD_ARCHIVE', `${up.filename}: ${e.message}`);
    throw e;
  }
  if (!cat.drawings.length) throw new ApiError('BAD_ARCHIVE', `${up.filename}: no .dxf drawing in the archive`, { ignored: cat.ignored.slice(0, 20) });
  if (cat.drawings.length > maxDrawings)
    throw new ApiError('TOO_MANY_DRAWINGS', `${up.filename} holds ${cat.drawings.length} drawings; /v1/compute answers at most ${maxDrawings}: POST it to /v1/jobs`);
  const drawings = cat.drawings.map((d): Drawing => {
    const source = `${up.filename}:${d.name}`;
    if ('data' in d) return { name: stem(d.name), source, bytes: d.data };
    const code = /inflates to more than/.test(d.error) ? 'ENTRY_TOO_LARGE' : 'BAD_ENTRY';
    return { name: stem(d.name), source, error: { code, message: `${source}: ${d.error}` } };
  });
  return { kind, drawings };
}
