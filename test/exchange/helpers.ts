/** Shared pieces of the exchange tests: the commands in-process, the grammar check, result comparison. */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { expect } from 'vitest';
import type { Results } from '../../src/analysis/results.js';

export const XMLLINT = '/usr/bin/xmllint';

/**
 * The standard's RELAX NG grammar in XML syntax: open-psa/mef mef/schema/*.rnc converted by trang
 * (see test/exchange/grammar/README.md).
 */
export const MEF_GRAMMAR = join('test', 'exchange', 'grammar', 'mef.rng');

/** True when xmllint is there; under CI (which installs libxml2-utils) its absence is a failure. */
export function haveXmllint(): boolean {
  if (existsSync(XMLLINT)) return true;
  if (process.env.CI) throw new Error(`${XMLLINT} not found (Debian: apt-get install -y libxml2-utils); CI must have it`);
  console.warn(`${XMLLINT} not found (Debian: apt-get install -y libxml2-utils); grammar checks skipped`);
  return false;
}

/** xmllint's verdict on a file against the standard's grammar: status 0 and "validates" when valid. */
export function validateAgainstGrammar(file: string): { ok: boolean; output: string } {
  const r = spawnSync(XMLLINT, ['--noout', '--relaxng', MEF_GRAMMAR, file], { encoding: 'utf8' });
  return { ok: r.status === 0, output: `${r.stdout}${r.stderr}` };
}

const relative = (a: number, b: number) => (a === b ? 0 : Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b)));

/** Same tops with the same exact probabilities (1e-12 relative) and the same cut sets (events and probabilities). */
export function expectSameTops(before: Results, after: Results): void {
  expect(after.tops.map((t) => t.id).sort()).toEqual(before.tops.map((t) => t.id).sort());
  for (const top of before.tops) {
    const other = after.tops.find((t) => t.id === top.id)!;
    expect(relative(top.probability.exact, other.probability.exact), `top ${top.id}`).toBeLessThanOrEqual(1e-12);
    const key = (events: string[]) => [...events].sort().join(' ');
    const theirs = new Map(other.cut_sets.map((c) => [key(c.events), c.probability]));
    expect(other.cut_sets.length, `cut sets of ${top.id}`).toBe(top.cut_sets.length);
    for (const c of top.cut_sets) {
      const p = theirs.get(key(c.events));
      expect(p, `cut set ${key(c.events)} of ${top.id}`).toBeDefined();
      expect(relative(c.probability, p!), `cut set ${key(c.events)} of ${top.id}`).toBeLessThanOrEqual(1e-12);
    }
  }
}
