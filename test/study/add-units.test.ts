// scripts/add-units.ts: an older study's bare durations and rates get the unit they used to mean
// (years, per year), so the migrated study reads exactly as before. Invented study text.
import { describe, expect, it } from 'vitest';
import { addUnitsToCsv, addUnitsToYaml } from '../../scripts/add-units.js';
import { readStudy } from '../../src/study/read.js';
import { writeStudy } from '../analysis/helpers.js';

describe('add-units migration', () => {
  const old = [
    '# invented',
    'classes:',
    '  motor: { model: weibull, shape: 2.5, scale: 60, exercise: 0.0833 }',
    'events:',
    '  m: { title: Motor, class: motor, installed: 2000, source: test-data }',
    '  p:',
    '    title: Power',
    '    model: repairable',
    '    source: test-data',
    '    rate: { value: 2e-3, range: [1e-3, "4e-3"], uncertainty: { lognormal: { median: 2e-3, ef: 3 } } }',
    '    repair: 1',
    '',
  ].join('\n');

  it('writes years and /year after bare numbers only, keeping comments and layout', () => {
    expect(addUnitsToYaml(old)).toBe(
      [
        '# invented',
        'classes:',
        '  motor: { model: weibull, shape: 2.5, scale: 60 years, exercise: 0.0833 years }',
        'events:',
        '  m: { title: Motor, class: motor, installed: 2000, source: test-data }',
        '  p:',
        '    title: Power',
        '    model: repairable',
        '    source: test-data',
        '    rate: { value: 2e-3 /year, range: [1e-3 /year, "4e-3 /year"], uncertainty: { lognormal: { median: 2e-3 /year, ef: 3 } } }',
        '    repair: 1 year',
        '',
      ].join('\n'),
    );
    // Already migrated: nothing more to do.
    expect(addUnitsToYaml(addUnitsToYaml(old))).toBe(addUnitsToYaml(old));
  });

  it('the migrated study reads with the values the bare numbers used to mean', () => {
    const study = readStudy(writeStudy({ events: addUnitsToYaml(old), logic: 'tops:\n  t: { title: T, gate: g }\ngates:\n  g: { any: [m, p] }\n' }));
    const value = (key: string) => study.parameters.find((x) => x.key === key)!.value;
    expect([value('motor.scale'), value('motor.exercise'), value('p.rate'), value('p.repair')]).toEqual([60, 0.0833, 2e-3, 1]);
  });

  it('a CSV with bare lives gets the header life_years; lives with units are left alone', () => {
    expect(addUnitsToCsv('# c\nunit,life,status\nA,12,failed\n')).toBe('# c\nunit,life_years,status\nA,12,failed\n');
    expect(addUnitsToCsv('life,status\n12 years,failed\n')).toBe('life,status\n12 years,failed\n');
  });
});
