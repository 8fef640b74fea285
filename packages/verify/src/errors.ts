/** Stable codes of verification faults; services turn them into one CLI line or a problem document. */
export const VERIFY_ERROR_CODES = [
  'MANIFEST_SYNTAX',
  'MANIFEST_INVALID',
  'UNKNOWN_MATERIAL',
  'DUPLICATE_ID',
  'BAD_DRAWING_PATH',
  'RUN_MISMATCH',
  'BAD_SCHEDULE',
  'BAD_WEBHOOK',
] as const;

export type VerifyErrorCode = (typeof VERIFY_ERROR_CODES)[number];

/** Bad input to a verification (a manifest, a schedule, a webhook target): the user can fix it. */
export class VerifyError extends Error {
  override readonly name = 'VerifyError';
  constructor(
    readonly code: VerifyErrorCode,
    message: string,
  ) {
    super(message);
  }
}
