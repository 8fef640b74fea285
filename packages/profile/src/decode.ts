/** A drawing's text: UTF-8, or Latin-1 for older drawings in an ANSI code page (as the CLI reads files). */
export function decodeDrawing(bytes: Uint8Array): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return new TextDecoder('latin1').decode(bytes);
  }
}
