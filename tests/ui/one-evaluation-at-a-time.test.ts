// The editor and scratch pad send one evaluation at a time and skip input overtaken while waiting,
// so one person typing never runs past their share of the evaluation workers (common practice for
// "latest wins" requests; the share itself is tested in tests/processes/sandbox.test.ts).
import { expect, it } from 'vitest';
import { oneAtATime, SupersededEvaluation } from '../../components/calc/one-evaluation-at-a-time';

it('runs one call at a time and skips calls overtaken while they waited', async () => {
  let inFlight = 0;
  let most = 0;
  const ran: number[] = [];
  const release: Array<() => void> = [];
  const fetcher = oneAtATime(async (n: number) => {
    inFlight++;
    most = Math.max(most, inFlight);
    ran.push(n);
    await new Promise<void>((resolve) => release.push(resolve));
    inFlight--;
    return n * 10;
  });
  const first = fetcher(1);
  await new Promise((r) => setTimeout(r, 0));
  const second = fetcher(2);
  const third = fetcher(3);
  await new Promise((r) => setTimeout(r, 0));
  expect(ran).toEqual([1]);
  release.shift()!();
  await expect(first).resolves.toBe(10);
  await expect(second).rejects.toBeInstanceOf(SupersededEvaluation);
  await new Promise((r) => setTimeout(r, 0));
  expect(ran).toEqual([1, 3]);
  release.shift()!();
  await expect(third).resolves.toBe(30);
  expect(most).toBe(1);
});

it('sends only the newest of calls made before any could start', async () => {
  const ran: number[] = [];
  const fetcher = oneAtATime(async (n: number) => {
    ran.push(n);
    return n;
  });
  const calls = [fetcher(1), fetcher(2), fetcher(3)];
  await expect(calls[2]).resolves.toBe(3);
  await expect(calls[0]).rejects.toBeInstanceOf(SupersededEvaluation);
  await expect(calls[1]).rejects.toBeInstanceOf(SupersededEvaluation);
  expect(ran).toEqual([3]);
});

it('goes on after a call that failed', async () => {
  const fetcher = oneAtATime(async (n: number) => {
    if (n === 1) throw new Error('refused');
    return n;
  });
  await expect(fetcher(1)).rejects.toThrow('refused');
  await expect(fetcher(2)).resolves.toBe(2);
});
