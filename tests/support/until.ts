/**
 * Polls `probe` every 100 ms until it gives a truthy value, and returns that value; fails after
 * `timeoutMs` with an error naming `what` was awaited.
 */
export async function until<T>(
  what: string,
  probe: () => Promise<T | null | undefined | false>,
  timeoutMs: number,
): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`${what}: not within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}
