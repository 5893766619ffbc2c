/**
 * The first key that appears twice in one object of a JSON text. JSON.parse keeps the last of
 * duplicate keys silently, so a results.json with `"exact": 0.5` written before the true value
 * parses to the true numbers while showing 0.5 to anyone who reads the file: verify must refuse it.
 *
 * Call only on text that JSON.parse accepted: this scanner follows strings, objects and arrays and
 * does not validate anything else.
 */
export function firstDuplicateKey(text: string): { key: string; offset: number } | undefined {
  /** One frame per open object (its keys so far, and whether a key comes next) or array (null). */
  const stack: ({ keys: Set<string>; expectKey: boolean } | null)[] = [];
  let i = 0;
  while (i < text.length) {
    const c = text[i];
    if (c === '"') {
      let j = i + 1;
      while (j < text.length && text[j] !== '"') j += text[j] === '\\' ? 2 : 1;
      const top = stack[stack.length - 1];
      if (top && top.expectKey) {
        const key = JSON.parse(text.slice(i, j + 1)) as string;
        if (top.keys.has(key)) return { key, offset: i };
        top.keys.add(key);
        top.expectKey = false;
      }
      i = j + 1;
      continue;
    }
    if (c === '{') stack.push({ keys: new Set(), expectKey: true });
    else if (c === '[') stack.push(null);
    else if (c === '}' || c === ']') stack.pop();
    else if (c === ',') {
      const top = stack[stack.length - 1];
      if (top) top.expectKey = true;
    }
    i++;
  }
  return undefined;
}
