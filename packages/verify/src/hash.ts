import { createHash } from 'node:crypto';

/** SHA-256 of bytes or text, lowercase hex: how runs recognise an unchanged drawing or manifest. */
export const sha256 = (data: Uint8Array | string): string => createHash('sha256').update(data).digest('hex');
