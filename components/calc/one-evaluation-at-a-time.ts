// The server gives each person a small share of the evaluation workers (two evaluations in flight;
// more are refused with 429, lib/calc/sandbox/evaluator.ts). An editor that sent one request per
// pause in typing would run past that share on a busy server. So a page sends one evaluation at a
// time: a request waits for the one before it, and when its turn comes it is skipped if newer input
// has arrived meanwhile (only the latest input's result is ever shown). A 429 that still happens
// (another tab of the same person) is retried after the Retry-After the server gives, a few times.

import { api, ApiError } from '@/components/data/api-client';
import type { SheetResult } from '@/lib/calc/types';

export class SupersededEvaluation extends Error {
  constructor() {
    super('superseded by newer input');
  }
}

/** Wraps a fetcher so that one call runs at a time and calls overtaken by newer ones are skipped. */
export function oneAtATime<A extends unknown[], R>(fetcher: (...args: A) => Promise<R>): (...args: A) => Promise<R> {
  let chain: Promise<unknown> = Promise.resolve();
  let latest = 0;
  return (...args: A) => {
    const ticket = ++latest;
    const run = chain.then(() => (ticket === latest ? fetcher(...args) : Promise.reject(new SupersededEvaluation())));
    chain = run.catch(() => undefined);
    return run;
  };
}

/** POST /api/evaluate with the body given, retrying a 429 after its Retry-After (at most 3 tries, 10 s each). */
export async function postEvaluation(body: Parameters<typeof api.evaluate>[0]): Promise<SheetResult> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await api.evaluate(body);
    } catch (error) {
      if (!(error instanceof ApiError && error.status === 429 && attempt < 3)) throw error;
      const seconds = Math.min(10, Math.max(1, error.retryAfterSeconds ?? 1));
      await new Promise((resolve) => setTimeout(resolve, seconds * 1000));
    }
  }
}
