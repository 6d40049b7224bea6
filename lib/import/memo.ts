/**
 * Remembers the results of a pure function of one text, up to `limit` distinct texts (then it
 * starts again). Exports repeat the same few complaint and component texts on thousands of
 * rows, so a million-row import works each one out once instead of once a row; a file of all
 * different texts pays one map lookup a row more.
 */
export function memoText<T>(work: (text: string) => T, limit = 10_000): (text: string) => T {
  let seen = new Map<string, T>();
  return (text) => {
    const known = seen.get(text);
    if (known !== undefined) return known;
    const result = work(text);
    if (seen.size >= limit) seen = new Map();
    seen.set(text, result);
    return result;
  };
}
