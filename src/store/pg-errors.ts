import { StoreError } from './errors.ts';

/** Node socket errors that mean "the server is not there right now". */
const NETWORK_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENETUNREACH', 'ENOTFOUND', 'EAI_AGAIN', 'EPIPE']);

/**
 * PostgreSQL and driver failures -> StoreError, by SQLSTATE (PostgreSQL manual,
 * Appendix A "PostgreSQL Error Codes"):
 *   class 08 (connection exception), 57P01..57P03 (shutdown, cannot connect now),
 *   53300 (too many connections), 57014 (statement timeout/cancel), network
 *   errors and the pool's connect timeout -> 'unavailable' (503, retry later);
 *   40001 / 40P01 (serialization failure, deadlock), 55P03 (lock not available) -> 'conflict'.
 * Anything else (a bug) passes through unchanged.
 */
export function toStoreError(error: unknown): unknown {
  if (error instanceof StoreError) return error;
  const code = (error as { code?: unknown }).code;
  const message = error instanceof Error ? error.message : String(error);
  if (typeof code === 'string') {
    if (NETWORK_CODES.has(code) || code.startsWith('08') || ['57P01', '57P02', '57P03', '53300', '57014'].includes(code)) {
      return new StoreError('unavailable', `the database cannot be reached right now (${code}); retry later`, { pgCode: code }, { cause: error });
    }
    if (['40001', '40P01', '55P03'].includes(code)) {
      return new StoreError('conflict', `the database could not take the write right now (${code}); retry`, { pgCode: code }, { cause: error });
    }
    return error;
  }
  // pg / pg-pool failures without a code: connect timeout, a connection that ended mid-query.
  if (/timeout exceeded when trying to connect|Connection terminated|connection timeout|Client has encountered a connection error|Query read timeout/i.test(message)) {
    return new StoreError('unavailable', `the database cannot be reached right now (${message}); retry later`, undefined, { cause: error });
  }
  return error;
}

export async function withPgErrors<R>(work: () => Promise<R>): Promise<R> {
  try {
    return await work();
  } catch (error) {
    throw toStoreError(error);
  }
}
