/**
 * A hand-written `Results` for the report tests: an INVENTED dam ("Harrow Creek Dam", invented for
 * this fixture; no real facility, owner or data). Three radial spillway gates, each raised by its
 * own hoist; 2-out-of-3 stuck gates (voting gate) or debris blocking the bays loses the spillway.
 * Station power is an AND (utility feed and standby set) under each gate's OR, and is a shared
 * subtree (all three gates, and a second top event). Remote operation needs the crew to be absent
 * (a NOT of a switch / house event).
 *
 * The probabilities were worked out once for this fixture by brute-force enumeration of all 2^15
 * states of the 15 basic events (a throwaway script, not part of the project), so the numbers are
 * mutually consistent; the report tests never recompute them, they only check that the report prints
 * what is here.
 */
import { createHash } from 'node:crypto';
import type { CutSet, EventResult, Importance, ParameterResult, Results } from '../../src/analysis/results.js';
import type { InputFile } from '../../src/study/types.js';


const MONTH = 1 / 12;
const DAY = 1 / 365.25;

/** Parameters: class-wide and per-event numbers, with their provenance (sources all invented). */
function param(
  key: string,
  quantity: string,
  value: number,
  written: string,
  used_by: string[],
  line: number,
  extra: Partial<ParameterResult> = {},
): ParameterResult {
  const [owner, field] = key.split('.') as [string, string];
  const owner_kind = ['hoist-motor', 'hoist-brake'].includes(owner) ? 'class' : 'event';
  return { key, owner, owner_kind, field, quantity, value, written, used_by, at: { file: 'events.yaml', line }, ...extra };
}

const PARAMETERS: ParameterResult[] = [
  param('hoist-motor.shape', 'number', 3.1, '3.1', ['hoist-1-motor', 'hoist-2-motor', 'hoist-3-motor'], 3, {
    source: 'field-survey-2019',
    note: 'table 4, hoist motors',
    range: [2.2, 4.0],
    uncertainty: { kind: 'lognormal', median: 3.1, ef: 1.5 },
  }),
  param('hoist-motor.scale', 'duration', 75, '75 years', ['hoist-1-motor', 'hoist-2-motor', 'hoist-3-motor'], 3, {
    source: 'field-survey-2019',
    note: 'table 4, hoist motors',
    range: [55, 95],
  }),
  param('hoist-brake.probability', 'probability', 2e-3, '2e-3', ['hoist-1-brake', 'hoist-2-brake', 'hoist-3-brake'], 6, {
    source: 'brake-vendor-note',
    note: 'p. 2, "release on demand"',
  }),
  param('hoist-brake.rate', 'rate', 0.01, '1e-2 /year', ['hoist-1-brake', 'hoist-2-brake', 'hoist-3-brake'], 6, {
    source: 'brake-vendor-note',
    note: 'p. 3',
  }),
  // Deliberately unsourced: the report must flag it.
  param('hoist-brake.interval', 'duration', 1, '1 year', ['hoist-1-brake', 'hoist-2-brake', 'hoist-3-brake'], 6),
  param('hoist-1-motor.exercise', 'duration', MONTH, '1 month', ['hoist-1-motor'], 11, { source: 'om-manual-2021', note: 'section 5.2' }),
  param('hoist-2-motor.exercise', 'duration', MONTH, '1 month', ['hoist-2-motor'], 18, { source: 'om-manual-2021', note: 'section 5.2' }),
  param('hoist-3-motor.exercise', 'duration', MONTH, '1 month', ['hoist-3-motor'], 25, { source: 'om-manual-2021', note: 'section 5.2' }),
  param('hoist-motors-ccf.probability', 'probability', 2.9174241573415306e-5, '2.92e-5', ['hoist-motors-ccf'], 44, {
    source: 'ccf-screening',
    note: 'beta = 0.05 on one motor',
  }),
  param('utility-feed-lost.rate', 'rate', 0.8, '0.8 /year', ['utility-feed-lost'], 50, { source: 'utility-outage-log', note: '2005–2024 summary' }),
  param('utility-feed-lost.exposure', 'duration', 3 * DAY, '3 days', ['utility-feed-lost'], 51, { source: 'om-manual-2021', note: 'flood duration, section 2' }),
  param('generator-fails-start.rate', 'rate', 0.06, '0.06 /year', ['generator-fails-start'], 55, { source: 'generator-test-records' }),
  param('generator-fails-start.interval', 'duration', MONTH, '1 month', ['generator-fails-start'], 56, { source: 'om-manual-2021', note: 'section 6.1' }),
  // Deliberately unsourced.
  param('generator-fuel-contaminated.probability', 'probability', 1.5e-3, '1.5e-3', ['generator-fuel-contaminated'], 60),
  param('transfer-switch-fails.rate', 'rate', 0.02, '0.02 /year', ['transfer-switch-fails'], 64, { source: 'generator-test-records' }),
  param('transfer-switch-fails.repair', 'duration', 3 * DAY, '3 days', ['transfer-switch-fails'], 65, { source: 'om-manual-2021' }),
  param('plc-fails.rate', 'rate', 0.03, '0.03 /year', ['plc-fails'], 69, { source: 'field-survey-2019', note: 'table 9' }),
  param('plc-fails.interval', 'duration', 0.5, '6 months', ['plc-fails'], 70, { source: 'om-manual-2021', note: 'section 7' }),
  param('telemetry-link-lost.rate', 'rate', 0.5, '0.5 /year', ['telemetry-link-lost'], 74, { source: 'utility-outage-log' }),
  param('telemetry-link-lost.repair', 'duration', 2 * DAY, '2 days', ['telemetry-link-lost'], 75, { source: 'utility-outage-log' }),
  param('debris-blocks-spillway.probability', 'probability', 4e-4, '4e-4', ['debris-blocks-spillway'], 79, { source: 'debris-study-2020', note: 'figure 3' }),
];

function keysOf(event: string, fields: Record<string, string>): Record<string, string> {
  return Object.fromEntries(Object.entries(fields).map(([f, owner]) => [f, `${owner === '' ? event : owner}.${f}`]));
}

function hoistMotor(i: number, probability: number, renewed: string, age: number): EventResult {
  const id = `hoist-${i}-motor`;
  return {
    id,
    title: `Gate ${i} hoist motor fails to start or run`,
    model: 'weibull',
    class: 'hoist-motor',
    probability,
    parameters: { shape: 3.1, scale: 75, exercise: MONTH },
    parameter_keys: keysOf(id, { shape: 'hoist-motor', scale: 'hoist-motor', exercise: '' }),
    age_years: age,
    installed: '1971',
    renewed,
    assumptions: ['A2', 'A3'],
  };
}

function hoistBrake(i: number): EventResult {
  const id = `hoist-${i}-brake`;
  return {
    id,
    title: `Gate ${i} hoist brake fails to release`,
    model: 'demand',
    class: 'hoist-brake',
    probability: 0.006983374916810668,
    parameters: { probability: 2e-3, rate: 0.01, interval: 1 },
    parameter_keys: keysOf(id, { probability: 'hoist-brake', rate: 'hoist-brake', interval: 'hoist-brake' }),
    assumptions: ['A1'],
  };
}

const EVENTS: EventResult[] = [
  hoistMotor(1, 0.0005834848314683061, '1994-05', 32.16),
  hoistMotor(2, 0.0005834848314683061, '1994-05', 32.16),
  hoistMotor(3, 0.00011516265890021415, '2011-09', 14.83),
  hoistBrake(1),
  hoistBrake(2),
  hoistBrake(3),
  {
    id: 'hoist-motors-ccf',
    title: 'Common cause: all hoist motors fail together',
    model: 'fixed',
    probability: 2.9174241573415306e-5,
    parameters: { probability: 2.9174241573415306e-5 },
    parameter_keys: keysOf('hoist-motors-ccf', { probability: '' }),
    assumptions: ['A1'],
    common_cause_group: 'hoist-motors',
  },
  {
    id: 'utility-feed-lost',
    title: 'Utility supply to the dam lost during the flood',
    model: 'rate',
    probability: 0.006549301113717432,
    parameters: { rate: 0.8, exposure: 3 * DAY },
    parameter_keys: keysOf('utility-feed-lost', { rate: '', exposure: '' }),
    assumptions: ['A5'],
  },
  {
    id: 'generator-fails-start',
    title: 'Standby generator fails to start',
    model: 'tested',
    probability: 0.002495838536463846,
    parameters: { rate: 0.06, interval: MONTH },
    parameter_keys: keysOf('generator-fails-start', { rate: '', interval: '' }),
    assumptions: ['A3'],
  },
  {
    id: 'generator-fuel-contaminated',
    title: 'Generator fuel contaminated',
    model: 'fixed',
    probability: 1.5e-3,
    parameters: { probability: 1.5e-3 },
    parameter_keys: keysOf('generator-fuel-contaminated', { probability: '' }),
    assumptions: [],
  },
  {
    id: 'transfer-switch-fails',
    title: 'Automatic transfer switch fails to change over',
    model: 'repairable',
    probability: 0.0001642440666830911,
    parameters: { rate: 0.02, repair: 3 * DAY },
    parameter_keys: keysOf('transfer-switch-fails', { rate: '', repair: '' }),
    assumptions: [],
  },
  {
    id: 'plc-fails',
    title: 'Gate control PLC fails (undetected until demand)',
    model: 'tested',
    probability: 0.007462640204176418,
    parameters: { rate: 0.03, interval: 0.5 },
    parameter_keys: keysOf('plc-fails', { rate: '', interval: '' }),
    assumptions: ['A3'],
  },
  {
    id: 'telemetry-link-lost',
    title: 'Telemetry link from the control room lost',
    model: 'repairable',
    probability: 0.0027303754266211604,
    parameters: { rate: 0.5, repair: 2 * DAY },
    parameter_keys: keysOf('telemetry-link-lost', { rate: '', repair: '' }),
    assumptions: [],
  },
  {
    id: 'crew-on-site',
    title: 'Operating crew on site at flood onset',
    model: 'switch',
    probability: 0,
    parameters: {},
    parameter_keys: {},
    on: false,
    assumptions: ['A4'],
  },
  {
    id: 'debris-blocks-spillway',
    title: 'Floating debris blocks the spillway bays',
    model: 'fixed',
    probability: 4e-4,
    parameters: { probability: 4e-4 },
    parameter_keys: keysOf('debris-blocks-spillway', { probability: '' }),
    assumptions: [],
  },
];

const GATES: Results['logic']['gates'] = [
  { id: 'spillway-short-any', title: 'Spillway cannot pass the design flood', op: 'any', inputs: ['two-or-more-gates-stuck', 'debris-blocks-spillway'] },
  { id: 'two-or-more-gates-stuck', title: 'Two or more of the three gates stay closed', op: 'atleast', k: 2, inputs: ['gate-1-stuck', 'gate-2-stuck', 'gate-3-stuck'] },
  { id: 'gate-1-stuck', title: 'Gate 1 fails to open', op: 'any', inputs: ['station-power-lost', 'control-fails', 'hoist-1-fails'] },
  { id: 'gate-2-stuck', title: 'Gate 2 fails to open', op: 'any', inputs: ['station-power-lost', 'control-fails', 'hoist-2-fails'] },
  { id: 'gate-3-stuck', title: 'Gate 3 fails to open', op: 'any', inputs: ['station-power-lost', 'control-fails', 'hoist-3-fails'] },
  { id: 'station-power-lost', title: 'No power at the gate hoists', op: 'all', inputs: ['utility-feed-lost', 'standby-power-fails'] },
  { id: 'standby-power-fails', title: 'Standby supply fails', op: 'any', inputs: ['generator-fails-start', 'generator-fuel-contaminated', 'transfer-switch-fails'] },
  { id: 'control-fails', title: 'No working gate control', op: 'any', inputs: ['plc-fails', 'remote-operation-lost'] },
  { id: 'remote-operation-lost', title: 'Remote operation lost with nobody on site', op: 'all', inputs: ['telemetry-link-lost', 'crew-absent'] },
  { id: 'crew-absent', op: 'not', inputs: ['crew-on-site'] },
  { id: 'hoist-1-fails', title: 'Gate 1 hoist fails', op: 'any', inputs: ['hoist-1-motor', 'hoist-1-brake', 'hoist-motors-ccf'] },
  { id: 'hoist-2-fails', title: 'Gate 2 hoist fails', op: 'any', inputs: ['hoist-2-motor', 'hoist-2-brake', 'hoist-motors-ccf'] },
  { id: 'hoist-3-fails', title: 'Gate 3 hoist fails', op: 'any', inputs: ['hoist-3-motor', 'hoist-3-brake', 'hoist-motors-ccf'] },
];

const GATE_PROBABILITIES: Record<string, number> = {
  'spillway-short-any': 0.01078636648534054,
  'two-or-more-gates-stuck': 0.010390522694418305,
  'gate-1-stuck': 0.01771388588877776,
  'gate-2-stuck': 0.01771388588877776,
  'gate-3-stuck': 0.017253590946616982,
  'station-power-lost': 0.00002721682039691025,
  'standby-power-fails': 0.004155683167461053,
  'control-fails': 0.010172639821366224,
  'remote-operation-lost': 0.002730375426621154,
  'crew-absent': 0.9999999999999888,
  'hoist-1-fails': 0.007591738657997656,
  'hoist-2-fails': 0.007591738657997656,
  'hoist-3-fails': 0.007126700522273205,
};

const MAIN_CUT_SETS: CutSet[] = [
  { events: ["plc-fails"], probability: 0.007462640204176418, share: 0.6918585803957886 },
  { events: ["telemetry-link-lost"], probability: 0.0027303754266211604, share: 0.25313208394429576 },
  { events: ["debris-blocks-spillway"], probability: 0.0004, share: 0.03708385029783933 },
  { events: ["hoist-1-brake","hoist-2-brake"], probability: 0.0000487675252287404, share: 0.00452121901244678 },
  { events: ["hoist-1-brake","hoist-3-brake"], probability: 0.0000487675252287404, share: 0.00452121901244678 },
  { events: ["hoist-2-brake","hoist-3-brake"], probability: 0.0000487675252287404, share: 0.00452121901244678 },
  { events: ["hoist-motors-ccf"], probability: 0.000029174241573415306, share: 0.0027047330176538345 },
  { events: ["utility-feed-lost","generator-fails-start"], probability: 0.00001634599810652155, share: 0.0015154313668775258 },
  { events: ["utility-feed-lost","generator-fuel-contaminated"], probability: 0.000009823951670576147, share: 0.0009107748827121362 },
  { events: ["hoist-1-brake","hoist-2-motor"], probability: 0.000004074693336415269, share: 0.00037776329424306826 },
  { events: ["hoist-1-motor","hoist-2-brake"], probability: 0.000004074693336415269, share: 0.00037776329424306826 },
  { events: ["hoist-1-motor","hoist-3-brake"], probability: 0.000004074693336415269, share: 0.00037776329424306826 },
  { events: ["hoist-2-motor","hoist-3-brake"], probability: 0.000004074693336415269, share: 0.00037776329424306826 },
  { events: ["utility-feed-lost","transfer-switch-fails"], probability: 0.0000010756838488490487, share: 0.00009972624704630438 },
  { events: ["hoist-1-brake","hoist-3-motor"], probability: 8.042240235169784e-7, share: 0.00007455930823507412 },
  { events: ["hoist-2-brake","hoist-3-motor"], probability: 8.042240235169784e-7, share: 0.00007455930823507412 },
  { events: ["hoist-1-motor","hoist-2-motor"], probability: 3.404545485535976e-7, share: 0.000031563413779450213 },
  { events: ["hoist-1-motor","hoist-3-motor"], probability: 6.719566461983347e-8, share: 0.000006229684918564308 },
  { events: ["hoist-2-motor","hoist-3-motor"], probability: 6.719566461983347e-8, share: 0.000006229684918564308 },
];

const MAIN_IMPORTANCE: Importance[] = [
  { event: "plc-fails", fussell_vesely: 0.6895417421187853, birnbaum: 0.9966512834520919, criticality: 0.689541742118805, raw: 92.70962574459824, rrw: 3.221044937972347 },
  { event: "telemetry-link-lost", fussell_vesely: 0.25108727103243084, birnbaum: 0.9919219528398107, criticality: 0.2510872710324368, raw: 92.70962574459753, rrw: 1.3352690658343769 },
  { event: "debris-blocks-spillway", fussell_vesely: 0.03669852970970467, birnbaum: 0.9896094773055722, criticality: 0.03669852970972287, raw: 92.70962574459747, rrw: 1.0380966196373036 },
  { event: "hoist-3-brake", fussell_vesely: 0.009614266900684943, birnbaum: 0.014849984071340862, criticality: 0.009614266900700962, raw: 2.367122198666573, rrw: 1.0097075983421107 },
  { event: "hoist-1-brake", fussell_vesely: 0.009316552968712219, birnbaum: 0.01439014171484365, criticality: 0.00931655296872822, raw: 2.324788099826175, rrw: 1.0094041673923497 },
  { event: "hoist-2-brake", fussell_vesely: 0.009316552968712219, birnbaum: 0.01439014171484365, criticality: 0.00931655296872822, raw: 2.324788099826175, rrw: 1.0094041673923497 },
  { event: "hoist-motors-ccf", fussell_vesely: 0.0026756368357397538, birnbaum: 0.9892424939141469, criticality: 0.0026756368357558156, raw: 92.70962574459791, rrw: 1.0026828150745768 },
  { event: "utility-feed-lost", fussell_vesely: 0.0024961123487879165, birnbaum: 0.004110970333361243, criticality: 0.002496112348800105, raw: 1.3786304087042796, rrw: 1.0025023585167827 },
  { event: "generator-fails-start", fussell_vesely: 0.0014966316277103663, birnbaum: 0.00646805351959848, criticality: 0.0014966316277185935, raw: 1.5981541894702966, rrw: 1.0014988748912785 },
  { event: "generator-fuel-contaminated", fussell_vesely: 0.000898579152925671, birnbaum: 0.0064616027064278835, criticality: 0.0008985791529348191, raw: 1.598154189470287, rrw: 1.0008993873236252 },
  { event: "hoist-1-motor", fussell_vesely: 0.0007734450546046043, birnbaum: 0.014297992621958407, criticality: 0.0007734450546156364, raw: 2.3247880998261876, rrw: 1.0007740437349033 },
  { event: "hoist-2-motor", fussell_vesely: 0.0007734450546046043, birnbaum: 0.014297992621958407, criticality: 0.0007734450546156364, raw: 2.3247880998261876, rrw: 1.0007740437349033 },
  { event: "hoist-3-motor", fussell_vesely: 0.00015745956089359964, birnbaum: 0.014747979481592646, criticality: 0.00015745956090165147, raw: 2.367122198666576, rrw: 1.0001574843583114 },
  { event: "transfer-switch-fails", fussell_vesely: 0.0000982594151041936, birnbaum: 0.006452970164430543, criticality: 0.00009825941510805861, raw: 1.5981541894703106, rrw: 1.0000982690709657 },
];

const POWER_CUT_SETS: CutSet[] = [
  { events: ['utility-feed-lost', 'generator-fails-start'], probability: 1.634599810652155e-5, share: 0.6005844131733039 },
  { events: ['utility-feed-lost', 'generator-fuel-contaminated'], probability: 9.823951670576147e-6, share: 0.36095148247704195 },
  { events: ['utility-feed-lost', 'transfer-switch-fails'], probability: 1.0756838488490487e-6, share: 0.03952275957154658 },
];

/** Verbatim input files for the annex and the manifest (short, invented). */
const INPUT_TEXTS: [string, string][] = [
  [
    'study.yaml',
    [
      'format: faultbook/1',
      'title: Spillway gate reliability on demand (invented example)',
      'facility: Harrow Creek Dam (invented)',
      'revision: B',
      'status: draft',
      'issued: 2026-11-20',
      'as_of: 2026-06-30',
      'prepared_by: [A. Example]',
      'reviewed_by: [B. Example]',
      'settings: { cutoff: 1e-12, max_order: 8, samples: 20000, seed: 20260630, horizon: 30 }',
      '',
    ].join('\n'),
  ],
  [
    'logic.yaml',
    [
      'tops:',
      '  spillway-short: { title: Fewer spillway gates open than the flood needs, gate: spillway-short-any }',
      '  station-blackout: { title: No power at the gate hoists during the flood, gate: station-power-lost }',
      'gates:',
      '  spillway-short-any: { any: [two-or-more-gates-stuck, debris-blocks-spillway] }',
      '  two-or-more-gates-stuck: { atleast: 2, of: [gate-1-stuck, gate-2-stuck, gate-3-stuck] }',
      '  crew-absent: { not: crew-on-site }',
      '  # … (abridged in this fixture)',
      '',
    ].join('\n'),
  ],
  [
    'events.yaml',
    [
      'classes:',
      '  hoist-motor: { model: weibull, shape: { value: 3.1, source: field-survey-2019, note: "table 4, hoist motors" }, scale: 75 years }',
      'events:',
      '  hoist-1-motor: { title: Gate 1 hoist motor fails to start or run, class: hoist-motor, installed: 1971, renewed: 1994-05, exercise: 1 month }',
      '  # … (abridged in this fixture)',
      '',
    ].join('\n'),
  ],
  ['sources.yaml', 'field-survey-2019: { title: Hoist survey (invented), invented: true }\n'],
  ['assumptions.md', '## A1 Independence\n\nBasic events are independent except where a common-cause event is modelled.\n'],
];

export function fixtureInputs(): InputFile[] {
  return INPUT_TEXTS.map(([path, text]) => ({ path, text, sha256: createHash('sha256').update(text).digest('hex') }));
}

/** The invented Harrow Creek Dam study results. A fresh deep copy on every call, so tests may mutate it. */
export function fixtureResults(): Results {
  const inputs = fixtureInputs();
  const combined = createHash('sha256')
    .update(inputs.map((f) => `${f.sha256}  ${f.path}\n`).join(''))
    .digest('hex');
  const results: Results = {
    format: 'faultbook-results/1',
    tool: { name: 'faultbook', version: '0.1.0' },
    study: {
      title: 'Spillway gate reliability on demand (invented example)',
      facility: 'Harrow Creek Dam (invented)',
      revision: 'B',
      status: 'draft',
      issued: '2026-11-20',
      as_of: '2026-06-30',
      prepared_by: ['A. Example, mechanical engineer (invented)'],
      reviewed_by: ['B. Example, electrical engineer (invented)'],
      scope:
        'This appendix estimates the probability that the spillway of the **invented** Harrow Creek Dam cannot pass ' +
        'the design flood because its radial gates fail to open on demand.\n\n' +
        'It covers:\n\n- the three gate hoists (motors and brakes),\n- station power (utility feed and standby generator),\n' +
        '- gate control (PLC and telemetry).\n\nStructural and hydraulic capacity are outside its scope.',
      description:
        'The spillway has three radial gates, each raised by its own wire-rope hoist driven by an electric motor with a ' +
        'spring-applied brake. Power comes from the utility feed; a standby diesel generator takes over through an ' +
        'automatic transfer switch. The gates are normally opened from the control room over a telemetry link, or locally ' +
        'by the crew.\n\nTwo open gates pass the design flood; one is not enough.',
    },
    inputs: { sha256: combined, files: inputs.map((f) => ({ path: f.path, sha256: f.sha256 })) },
    settings: { cutoff: 1e-12, max_order: 8, samples: 20000, seed: 20260630, horizon: 30, max_nodes: 1000000, exercise_basis: 'end', sensitivity_factor: 3 },
    logic: {
      tops: [
        { id: 'spillway-short', title: 'Fewer spillway gates open than the flood needs', gate: 'spillway-short-any' },
        { id: 'station-blackout', title: 'No power at the gate hoists during the flood', gate: 'station-power-lost' },
      ],
      gates: GATES,
    },
    sources: [
      { id: 'field-survey-2019', title: 'Hoist and control equipment survey, 2019', reference: 'Invented survey report HC-2019-04', invented: true, used_by: ['hoist-motor.shape', 'hoist-motor.scale', 'plc-fails.rate'] },
      { id: 'om-manual-2021', title: 'Operation and maintenance manual, rev. 3', reference: 'Invented O&M manual HC-OM-3', invented: true, used_by: ['hoist-1-motor.exercise', 'hoist-2-motor.exercise', 'hoist-3-motor.exercise', 'utility-feed-lost.exposure', 'generator-fails-start.interval', 'transfer-switch-fails.repair', 'plc-fails.interval'] },
      { id: 'brake-vendor-note', title: 'Brake supplier application note', invented: true, used_by: ['hoist-brake.probability', 'hoist-brake.rate'] },
      { id: 'utility-outage-log', title: 'Utility outage log 2005–2024', invented: true, used_by: ['utility-feed-lost.rate', 'telemetry-link-lost.rate', 'telemetry-link-lost.repair'] },
      { id: 'generator-test-records', title: 'Monthly generator test records', invented: true, used_by: ['generator-fails-start.rate', 'transfer-switch-fails.rate'] },
      { id: 'ccf-screening', title: 'Common-cause screening note', invented: true, note: 'beta-factor screening value', used_by: ['hoist-motors-ccf.probability'] },
      { id: 'debris-study-2020', title: 'Reservoir debris study', invented: true, used_by: ['debris-blocks-spillway.probability'] },
      { id: 'seismic-review-2018', title: 'Seismic review (not cited by any number)', invented: true, used_by: [] },
    ],
    assumptions: [
      { id: 'A1', title: 'Independence', body: 'Basic events are independent, except where a common-cause event is modelled (`hoist-motors-ccf`).', events: ['hoist-1-brake', 'hoist-2-brake', 'hoist-3-brake', 'hoist-motors-ccf'], parameters: [] },
      { id: 'A2', title: 'Ages at the snapshot date', body: 'Motor ages count from the last *renewal*, taken at the `as_of` date.', events: ['hoist-1-motor', 'hoist-2-motor', 'hoist-3-motor'], parameters: ['hoist-motor.scale'] },
      { id: 'A3', title: 'Exercise and test intervals', body: 'Intervals are those of the O&M manual and are assumed to be kept:\n\n1. motors monthly;\n2. the generator monthly;\n3. the PLC twice a year.', events: ['hoist-1-motor', 'hoist-2-motor', 'hoist-3-motor', 'generator-fails-start', 'plc-fails'], parameters: ['hoist-1-motor.exercise', 'generator-fails-start.interval', 'plc-fails.interval'] },
      { id: 'A4', title: 'Crew not on site', body: 'In the base case the crew is not on site when the flood begins, so remote operation is needed.', events: ['crew-on-site'], parameters: [] },
      { id: 'A5', title: 'Flood duration', body: 'The gates must stay operable for three days.', events: ['utility-feed-lost'], parameters: ['utility-feed-lost.exposure'] },
    ],
    events: EVENTS,
    parameters: PARAMETERS,
    tops: [
      {
        id: 'spillway-short',
        title: 'Fewer spillway gates open than the flood needs',
        gate: 'spillway-short-any',
        probability: { exact: 0.01078636648534054, rare_event: 0.010814120148953651, mcub: 0.010787318505397492, basis: 'exact' },
        cut_sets: MAIN_CUT_SETS,
        cut_set_summary: { listed: 19, truncated: 0, truncated_probability: 0, cutoff: 1e-12, max_order: 8, coherent: false },
        importance: MAIN_IMPORTANCE,
        gate_probabilities: GATE_PROBABILITIES,
        bdd_nodes: 41,
      },
      {
        id: 'station-blackout',
        title: 'No power at the gate hoists during the flood',
        gate: 'station-power-lost',
        probability: { exact: 0.00002721682039691025, rare_event: 0.000027245633625946742, mcub: 0.000027245444893297943, basis: 'exact' },
        cut_sets: POWER_CUT_SETS,
        cut_set_summary: { listed: 3, truncated: 0, cutoff: 1e-12, max_order: 8, coherent: true },
        gate_probabilities: { 'station-power-lost': 0.00002721682039691025, 'standby-power-fails': 0.004155683167461053 },
        bdd_nodes: 6,
      },
    ],
    warnings: [
      { code: 'unsourced-parameter', message: 'hoist-brake.interval has no source', at: { file: 'events.yaml', line: 6 } },
      { code: 'unsourced-parameter', message: 'generator-fuel-contaminated.probability has no source', at: { file: 'events.yaml', line: 60 } },
    ],
  };
  return structuredClone(results);
}
