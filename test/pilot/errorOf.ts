import { expect } from 'vitest';
import { PilotDataError } from '../../src/pilot/types';

/** The PilotDataError that `f` throws; fails the test when it throws something else or nothing. */
export function errorOf(f: () => unknown): PilotDataError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(PilotDataError);
    return e as PilotDataError;
  }
  throw new Error('expected a PilotDataError, but nothing was thrown');
}
