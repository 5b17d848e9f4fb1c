/**
 * The one form of module state moonsieve allows (DEVELOPERS.md): a small
 * first-in-first-out memo of a pure function's results, for calls a sweep
 * repeats in every cell or realization. It can only save time: `compute` must
 * return the same value for the same key, and the value must never be written
 * to afterwards.
 */
export function remembered<V>(memo: Map<string, V>, maxSize: number, key: string, compute: () => V): V {
  const hit = memo.get(key);
  if (hit !== undefined) return hit;
  const value = compute();
  if (memo.size >= maxSize) memo.delete(memo.keys().next().value as string);
  memo.set(key, value);
  return value;
}
