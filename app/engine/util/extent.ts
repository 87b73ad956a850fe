// Smallest and largest of a list without spreading it into Math.min / Math.max: a spread
// passes every element as an argument, and a list of tens of thousands of nodes overflows the
// call stack ("Maximum call stack size exceeded"). These loop instead, at any length.

/** The smallest value; `empty` for an empty list. NaN entries are skipped. */
export function minOf(values: ArrayLike<number>, empty = Number.POSITIVE_INFINITY): number {
  let lo = Number.POSITIVE_INFINITY;
  for (let i = 0; i < values.length; i++) if (values[i]! < lo) lo = values[i]!;
  return lo === Number.POSITIVE_INFINITY && values.length === 0 ? empty : lo;
}

/** The largest value; `empty` for an empty list. NaN entries are skipped. */
export function maxOf(values: ArrayLike<number>, empty = Number.NEGATIVE_INFINITY): number {
  let hi = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < values.length; i++) if (values[i]! > hi) hi = values[i]!;
  return hi === Number.NEGATIVE_INFINITY && values.length === 0 ? empty : hi;
}

/** Appends every item of `items` to `target` (Array.prototype.push(...items) without the spread). */
export function appendAll<T>(target: T[], items: Iterable<T>): T[] {
  for (const item of items) target.push(item);
  return target;
}
