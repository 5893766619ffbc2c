import { readFileSync, writeFileSync, cpSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import weibullCdf from '@stdlib/stats-base-dists-weibull-cdf';
import { faultbook, tempDir } from './helpers.js';

const HOURS_PER_YEAR = 365.25 * 24;

describe('faultbook run (json, csv)', () => {
  it('writes results.json to the contract and reruns byte-identically', async () => {
    const a = tempDir();
    const b = tempDir();
    const r1 = await faultbook('run', 'example-study', '--format', 'json,csv', '--out', a, '--quiet');
    expect(r1.stderr).not.toContain('error');
    expect(r1.code).toBe(0);
    expect((await faultbook('run', 'example-study', '--format', 'json,csv', '--out', b, '--quiet')).code).toBe(0);
    const text = readFileSync(join(a, 'results.json'), 'utf8');
    expect(readFileSync(join(b, 'results.json'), 'utf8')).toBe(text);
    expect(readFileSync(join(b, 'cutsets.csv'), 'utf8')).toBe(readFileSync(join(a, 'cutsets.csv'), 'utf8'));
    // The contract of DESIGN.md ("Results contract").
    const r = JSON.parse(text);
    expect(r.format).toBe('faultbook-results/1');
    expect(r.tool.name).toBe('faultbook');
    expect(typeof r.tool.version).toBe('string');
    expect(Object.keys(r.study)).toEqual(expect.arrayContaining(['title', 'revision', 'as_of']));
    expect(r.inputs.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(r.inputs.files.map((f: { path: string }) => f.path)).toEqual(expect.arrayContaining(['study.yaml', 'logic.yaml', 'events.yaml', 'sources.yaml', 'assumptions.md']));
    expect(r.events.length).toBeGreaterThanOrEqual(40);
    for (const e of r.events) expect(e.probability).toBeGreaterThanOrEqual(0);
    for (const t of r.tops) {
      expect(Object.keys(t.probability)).toEqual(expect.arrayContaining(['exact', 'rare_event', 'mcub']));
      // Esary–Proschan for a coherent tree of independent events: exact ≤ MCUB ≤ rare-event sum
      // (NUREG-0492; see shared/reference/README.md).
      expect(t.probability.exact).toBeLessThanOrEqual(t.probability.mcub * (1 + 1e-12));
      expect(t.probability.mcub).toBeLessThanOrEqual(t.probability.rare_event * (1 + 1e-12));
      expect(t.cut_sets.length).toBeGreaterThan(0);
      for (const c of t.cut_sets) expect(Object.keys(c)).toEqual(expect.arrayContaining(['events', 'probability']));
      for (const i of t.importance) expect(Object.keys(i)).toEqual(expect.arrayContaining(['event', 'fussell_vesely', 'birnbaum', 'raw', 'rrw']));
    }
    const csv = readFileSync(join(a, 'cutsets.csv'), 'utf8').split('\n');
    expect(csv[0]).toBe('top,rank,order,probability,share,events');
  });

  it('quantifies the starter study as a hand calculation checked with @stdlib', async () => {
    const dir = tempDir();
    const study = join(dir, 'starter');
    expect((await faultbook('new', study)).code).toBe(0);
    expect((await faultbook('check', study)).code).toBe(0);
    const out = join(dir, 'out');
    expect((await faultbook('run', study, '--format', 'json', '--out', out, '--quiet')).code).toBe(0);
    const r = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8'));
    // Starter: top = motor OR (utility AND generator).
    // Motor: Weibull β = 2.5, η = 60 y, installed 1990-01-01, as_of 2026-06-30, exercised monthly:
    // conditional failure over the month after its age a: (F(a+τ) − F(a)) / (1 − F(a)) (DESIGN.md table).
    const age = (Date.UTC(2026, 5, 30) - Date.UTC(1990, 0, 1)) / 86400000 / 365.25;
    const F = (t: number) => weibullCdf(t, 2.5, 60) as number; // @stdlib: cdf(x, k = shape, lambda = scale)
    const qMotor = (F(age + 1 / 12) - F(age)) / (1 - F(age));
    // Utility: repairable, λ = 1/y, MTTR = 8 h: λτ/(1 + λτ) (DESIGN.md table, common practice).
    const lt = 8 / HOURS_PER_YEAR;
    const qUtility = lt / (1 + lt);
    const qGenerator = 3e-3;
    const expected = 1 - (1 - qMotor) * (1 - qUtility * qGenerator);
    expect(r.tops[0].probability.exact).toBeCloseTo(expected, 14);
    expect(r.tops[0].probability.exact / expected - 1).toBeLessThan(1e-9);
    const byId = Object.fromEntries(r.events.map((e: { id: string; probability: number }) => [e.id, e.probability]));
    expect(byId['hoist-motor'] / qMotor - 1).toBeLessThan(1e-9);
    expect(byId['utility-lost']).toBeCloseTo(qUtility, 15);
  });

  it('prints help for every command and exits 0', async () => {
    for (const c of ['run', 'check', 'new']) {
      const r = await faultbook(c, '--help');
      expect(r.code).toBe(0);
      expect(r.stdout).toContain(`usage: faultbook ${c}`);
    }
    expect((await faultbook('--help')).code).toBe(0);
    expect((await faultbook()).code).toBe(2);
    expect((await faultbook('frobnicate')).code).toBe(2);
  });

  it('points at the line of a broken study, exits 2, prints no stack, and keeps old outputs', async () => {
    const dir = tempDir();
    const study = join(dir, 'broken');
    cpSync('example-study', study, { recursive: true });
    const logic = readFileSync(join(study, 'logic.yaml'), 'utf8');
    const lines = logic.split('\n');
    const at = lines.findIndex((l) => l.includes('of: [gate-1-fails, gate-2-fails, gate-3-fails, gate-4-fails]'));
    lines[at] = lines[at]!.replace('gate-3-fails', 'gate-3-fials');
    writeFileSync(join(study, 'logic.yaml'), lines.join('\n'));
    const out = join(dir, 'out');
    expect((await faultbook('run', 'example-study', '--format', 'json', '--out', out, '--quiet')).code).toBe(0);
    const before = readFileSync(join(out, 'results.json'));
    const r = await faultbook('run', study, '--format', 'json', '--out', out);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`logic.yaml:`);
    expect(r.stderr).toContain("unknown input 'gate-3-fials'");
    expect(r.stderr).toContain("did you mean 'gate-3-fails'");
    expect(r.stderr).not.toMatch(/\n\s+at /);
    expect(readFileSync(join(out, 'results.json')).equals(before)).toBe(true);
    const c = await faultbook('check', study);
    expect(c.code).toBe(2);
  });
});
