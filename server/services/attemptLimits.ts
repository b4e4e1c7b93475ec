import { MemoryStore, type Options } from 'express-rate-limit';
import { AppError } from '../http/errors';

/**
 * Counts failed attempts per key (a person, a network address) in a fixed window, in an
 * express-rate-limit Store like the other limits, and refuses once the window's limit is reached.
 */
export interface AttemptLimit {
  refuseIfReached(key: string): Promise<void>;
  count(key: string): Promise<void>;
}

export function attemptLimit(limit: number, windowMs: number, refusal: string): AttemptLimit {
  const store = new MemoryStore();
  store.init({ windowMs } as Options);
  return {
    async refuseIfReached(key) {
      const counted = await store.get(key);
      if (counted && counted.totalHits >= limit) throw new AppError('rate_limited', refusal);
    },
    async count(key) {
      await store.increment(key);
    },
  };
}
