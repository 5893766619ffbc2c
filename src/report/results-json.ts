/** results.json text: two-space indented, keys in the order the analysis built them, a final newline. */
import type { Results } from '../analysis/results.js';

export function resultsJson(results: Results): string {
  return JSON.stringify(results, (_key, value: unknown) => (typeof value === 'number' && !Number.isFinite(value) ? String(value) : value), 2) + '\n';
}
