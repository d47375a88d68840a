import { readCurveText } from '@/lib/engine/reader';
import { CurveReadError } from '@/lib/engine/errors';

/** The reader's refusal of a file (its sentence, status and line-numbered details); fails the test if the file is read. */
export function refusal(input: string | Uint8Array, options = {}): CurveReadError {
  try {
    readCurveText(input, options);
  } catch (e) {
    if (e instanceof CurveReadError) return e;
    throw e;
  }
  throw new Error('expected the file to be refused');
}
