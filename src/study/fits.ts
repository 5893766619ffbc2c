/**
 * Life-data fits named in events.yaml `fits:`: read the records, fit once, and hand out the fitted
 * shape, scale or location wherever a parameter says `{ fit: id }`.
 */
import { StudyError } from './errors.js';
import type { FitSpec, Pos } from './types.js';

export function fitFromFile(fit: FitSpec, field: string, at: Pos, readText: (rel: string, at: Pos) => string): { value: number; written: string } {
  void readText;
  throw new StudyError(`fit '${fit.id}' for '${field}': life-data fitting is not wired in yet`, at, 'a value instead of a fit');
}
