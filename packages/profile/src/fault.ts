import { DxfError, type DxfErrorCode } from '@keelson/dxf';
import { GeometryError, type GeometryErrorCode } from '@keelson/geometry';

/** A drawing the user can fix: its stable code and the one-line cause the CLI prints after "keelson: ". */
export interface DrawingFault {
  readonly code: DxfErrorCode | GeometryErrorCode;
  readonly message: string;
}

const oneLine = (s: string) => s.replace(/\s*[\r\n]+\s*/g, ' ').trim();

/**
 * Classifies an error of `computeDrawing`: a fault in the drawing (DxfError, GeometryError) becomes
 * its code and one-line message, "<file>: <cause>"; anything else is a bug and returns null.
 */
export function drawingFault(e: unknown, file: string): DrawingFault | null {
  if (e instanceof DxfError) return { code: e.code, message: oneLine(e.message) };
  if (e instanceof GeometryError) return { code: e.code, message: `${file}: ${oneLine(e.message)}` };
  return null;
}
