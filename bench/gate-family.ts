/**
 * The "many gates" model family of the engine benchmark (invented structure and numbers, no real
 * facility): M gate subsystems. Gate i fails when its hoist fails (two trains of four parts, both
 * trains failed, or its motor starter), when its control is lost (its local panel AND the
 * controller its group shares), or when its power is lost: at least 2 of 3 feeds AND both
 * generators of its power group (each power group serves 5 neighbouring gates; each controller 10).
 * The top is "at least K of the M gates fail".
 *
 * Hoist parts take their probability from four classes (one shared parameter each), so the
 * sensitivity has shared parameters as well as the per-event ones. Same M and K, same text.
 */
export interface GateFamilyOptions {
  gates: number;
  atLeast: number;
  /** settings.max_nodes to write; absent = the study's default. */
  maxNodes?: number;
  /**
   * How gates share controllers: `blocks` (default) gives each controller ten neighbouring gates,
   * as the power groups do; `striped` deals the gates out to the controllers in turn (gate i to
   * controller i mod C), so a controller's gates sit in different power groups. Striping is the
   * harder case for a decision diagram: no variable order keeps both kinds of sharing local.
   */
  layout?: 'blocks' | 'striped';
}

const GATES_PER_POWER_GROUP = 5;
const GATES_PER_CONTROLLER = 10;
const PART_CLASSES = ['motor', 'brake', 'gearbox', 'ropes'] as const;

/** Deterministic spread of per-event values in [lo, hi] (log scale), from the event's number. */
function spread(i: number, lo: number, hi: number): number {
  const u = ((i * 0.6180339887498949) % 1 + 1) % 1;
  return Number((lo * Math.pow(hi / lo, u)).toPrecision(3));
}

export function gateFamilyStudy(o: GateFamilyOptions): Record<string, string> {
  const M = o.gates;
  const groups = Math.ceil(M / GATES_PER_POWER_GROUP);
  const controllers = Math.ceil(M / GATES_PER_CONTROLLER);
  const ev: string[] = [];
  const gates: string[] = [];
  let n = 0;
  const fixed = (id: string, lo: number, hi: number): void => {
    ev.push(`  ${id}: { model: fixed, probability: { value: ${spread(n++, lo, hi)}, source: bench } }`);
  };
  for (let g = 1; g <= groups; g++) {
    for (const f of [1, 2, 3]) fixed(`p${g}-feed-${f}`, 1e-3, 1e-2);
    for (const f of [1, 2]) fixed(`p${g}-generator-${f}`, 2e-2, 8e-2);
    gates.push(`  p${g}-feeds: { atleast: 2, of: [p${g}-feed-1, p${g}-feed-2, p${g}-feed-3] }`);
    gates.push(`  p${g}-generators: { all: [p${g}-generator-1, p${g}-generator-2] }`);
    gates.push(`  p${g}-power-lost: { all: [p${g}-feeds, p${g}-generators] }`);
  }
  for (let c = 1; c <= controllers; c++) fixed(`controller-${c}`, 1e-3, 5e-3);
  const gateIds: string[] = [];
  for (let i = 1; i <= M; i++) {
    const g = Math.ceil(i / GATES_PER_POWER_GROUP);
    const c = o.layout === 'striped' ? ((i - 1) % controllers) + 1 : Math.ceil(i / GATES_PER_CONTROLLER);
    const trains: string[] = [];
    for (const t of ['a', 'b']) {
      const parts = PART_CLASSES.map((k) => `g${i}${t}-${k}`);
      for (const [j, id] of parts.entries()) ev.push(`  ${id}: { class: ${PART_CLASSES[j]} }`);
      gates.push(`  g${i}-train-${t}: { any: [${parts.join(', ')}] }`);
      trains.push(`g${i}-train-${t}`);
    }
    fixed(`g${i}-starter`, 5e-4, 3e-3);
    fixed(`g${i}-panel`, 1e-2, 5e-2);
    gates.push(`  g${i}-hoist: { any: [g${i}-trains, g${i}-starter] }`);
    gates.push(`  g${i}-trains: { all: [${trains.join(', ')}] }`);
    gates.push(`  g${i}-control-lost: { all: [g${i}-panel, controller-${c}] }`);
    gates.push(`  g${i}-fails: { any: [g${i}-hoist, g${i}-control-lost, p${g}-power-lost] }`);
    gateIds.push(`g${i}-fails`);
  }
  const classes = PART_CLASSES.map((k, j) => `  ${k}: { model: fixed, probability: { value: ${[4e-3, 2e-3, 1e-3, 3e-3][j]}, source: bench } }`);
  const settings = `{ samples: 0, horizon: 0${o.maxNodes ? `, max_nodes: ${o.maxNodes}` : ''} }`;
  return {
    'study.yaml': `format: faultbook/1\ntitle: Gate family ${M}/${o.atLeast}${o.layout === 'striped' ? ' striped' : ''} (invented benchmark)\nfacility: none (invented)\nas_of: 2026-06-30\nsettings: ${settings}\n`,
    'sources.yaml': 'sources:\n  bench: { title: Benchmark values (invented), invented: true }\n',
    'events.yaml': `classes:\n${classes.join('\n')}\nevents:\n${ev.join('\n')}\n`,
    'logic.yaml': `tops:\n  short: { title: At least ${o.atLeast} of ${M} gates fail (invented), gate: short-gate }\ngates:\n  short-gate: { atleast: ${o.atLeast}, of: [${gateIds.join(', ')}] }\n${gates.join('\n')}\n`,
  };
}
