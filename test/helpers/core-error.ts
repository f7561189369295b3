/** The CoreError a core call throws (tests that check a refusal's code, pointer and details). */
import { CoreError } from '../../src/core/errors.ts';

export function refusal(fn: () => unknown): CoreError {
  try {
    fn();
  } catch (err) {
    if (err instanceof CoreError) return err;
    throw err;
  }
  throw new Error('expected a CoreError');
}
