/**
 * Reads page data that a loader sends as one JSON string (made once and kept on the server), keeping
 * the last string read and its value: the page's render and its `meta` read the same string again.
 */
export function jsonReader<T>(): (json: string) => T {
  let last: { json: string; value: T } | undefined;
  return (json) => {
    if (last?.json !== json) last = { json, value: JSON.parse(json) as T };
    return last.value;
  };
}
