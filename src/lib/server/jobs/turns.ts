/**
 * Lets every request waiting on this process run before the caller carries on. The local database driver
 * is synchronous and awaiting it only queues a microtask, so a loop of statements never lets the event loop
 * reach the network unless it asks to, here between its batches.
 */
export const nextTurn = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));

/** Runs `each` over `items` in slices of `size`, giving other requests their turn between slices. */
export async function inSlices<T>(items: readonly T[], size: number, each: (item: T, index: number) => void): Promise<void> {
  for (let lo = 0; lo < items.length; lo += size) {
    if (lo > 0) await nextTurn();
    const hi = Math.min(items.length, lo + size);
    for (let i = lo; i < hi; i++) each(items[i]!, i);
  }
}
