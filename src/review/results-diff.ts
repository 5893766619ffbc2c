/**
 * How the answer changed between two `Results`: each top's exact probability old → new with the
 * ratio; the minimal cut sets that appeared, vanished or moved rank; and the basic events whose
 * Fussell–Vesely rank changed. Ranked lists can be long, so only the leading `depth` entries of
 * either revision are compared in detail; the totals are always given.
 *
 * Pure: two Results in, plain data out.
 */
import type { Results, TopResult } from '../analysis/results.js';

export interface TopProbabilityChange {
  id: string;
  title: string;
  /** Absent when the top exists in one revision only. */
  old?: number;
  new?: number;
  /** new / old; absent when either side is absent or old is 0. */
  ratio?: number;
  old_basis?: 'exact' | 'bound';
  new_basis?: 'exact' | 'bound';
}

export interface RankedCutSet {
  events: string[];
  old_rank?: number;
  new_rank?: number;
  old_probability?: number;
  new_probability?: number;
}

export interface CutSetChanges {
  top: string;
  old_listed: number;
  new_listed: number;
  /** Among the leading cut sets of NEW: sets OLD did not list at all. */
  appeared: RankedCutSet[];
  /** Among the leading cut sets of OLD: sets NEW does not list at all. */
  vanished: RankedCutSet[];
  /** Sets among the leading ones of either revision whose rank changed. */
  moved: RankedCutSet[];
  /** Totals over the whole lists. */
  appeared_total: number;
  vanished_total: number;
}

export interface ImportanceRankChange {
  event: string;
  old_rank?: number;
  new_rank?: number;
  old_fussell_vesely?: number;
  new_fussell_vesely?: number;
}

export interface ImportanceChanges {
  top: string;
  changes: ImportanceRankChange[];
}

export interface ResultsDiff {
  /** How many leading entries of each ranked list were compared in detail. */
  depth: number;
  tops: TopProbabilityChange[];
  cut_sets: CutSetChanges[];
  importance: ImportanceChanges[];
}

export function diffResults(oldResults: Results, newResults: Results, depth = 20): ResultsDiff {
  const oldTops = new Map(oldResults.tops.map((t) => [t.id, t]));
  const newIds = new Set(newResults.tops.map((t) => t.id));
  const tops: TopProbabilityChange[] = [];
  const cutSets: CutSetChanges[] = [];
  const importance: ImportanceChanges[] = [];
  for (const n of newResults.tops) {
    const o = oldTops.get(n.id);
    const row: TopProbabilityChange = { id: n.id, title: n.title, new: n.probability.exact, new_basis: n.probability.basis };
    if (o) {
      row.old = o.probability.exact;
      row.old_basis = o.probability.basis;
      if (o.probability.exact > 0) row.ratio = n.probability.exact / o.probability.exact;
      cutSets.push(diffCutSets(o, n, depth));
      importance.push(diffImportance(o, n, depth));
    }
    tops.push(row);
  }
  for (const o of oldResults.tops) {
    if (!newIds.has(o.id)) tops.push({ id: o.id, title: o.title, old: o.probability.exact, old_basis: o.probability.basis });
  }
  return { depth, tops, cut_sets: cutSets, importance };
}

/** A cut set's identity: its events as a set (order in the list is the engine's, not meaningful). */
export function cutSetKey(events: string[]): string {
  return [...events].sort().join(' & ');
}

function diffCutSets(o: TopResult, n: TopResult, depth: number): CutSetChanges {
  const index = (t: TopResult) => new Map(t.cut_sets.map((c, i) => [cutSetKey(c.events), { rank: i + 1, c }]));
  const oi = index(o);
  const ni = index(n);
  const appeared: RankedCutSet[] = [];
  const vanished: RankedCutSet[] = [];
  const moved: RankedCutSet[] = [];
  let appearedTotal = 0;
  let vanishedTotal = 0;
  for (const [key, x] of ni) {
    if (!oi.has(key)) {
      appearedTotal += 1;
      if (x.rank <= depth) appeared.push({ events: x.c.events, new_rank: x.rank, new_probability: x.c.probability });
    }
  }
  for (const [key, x] of oi) {
    if (!ni.has(key)) {
      vanishedTotal += 1;
      if (x.rank <= depth) vanished.push({ events: x.c.events, old_rank: x.rank, old_probability: x.c.probability });
    }
  }
  const seen = new Set<string>();
  for (const list of [n.cut_sets.slice(0, depth), o.cut_sets.slice(0, depth)]) {
    for (const c of list) {
      const key = cutSetKey(c.events);
      if (seen.has(key)) continue;
      seen.add(key);
      const a = oi.get(key);
      const b = ni.get(key);
      if (a && b && a.rank !== b.rank) {
        moved.push({ events: b.c.events, old_rank: a.rank, new_rank: b.rank, old_probability: a.c.probability, new_probability: b.c.probability });
      }
    }
  }
  moved.sort((x, y) => x.new_rank! - y.new_rank!);
  return { top: n.id, old_listed: o.cut_sets.length, new_listed: n.cut_sets.length, appeared, vanished, moved, appeared_total: appearedTotal, vanished_total: vanishedTotal };
}

function diffImportance(o: TopResult, n: TopResult, depth: number): ImportanceChanges {
  const ranks = (t: TopResult) => new Map((t.importance ?? []).map((x, i) => [x.event, { rank: i + 1, fv: x.fussell_vesely }]));
  const or = ranks(o);
  const nr = ranks(n);
  const changes: ImportanceRankChange[] = [];
  const seen = new Set<string>();
  for (const list of [(n.importance ?? []).slice(0, depth), (o.importance ?? []).slice(0, depth)]) {
    for (const x of list) {
      if (seen.has(x.event)) continue;
      seen.add(x.event);
      const a = or.get(x.event);
      const b = nr.get(x.event);
      if (a?.rank === b?.rank) continue;
      const c: ImportanceRankChange = { event: x.event };
      if (a) {
        c.old_rank = a.rank;
        c.old_fussell_vesely = a.fv;
      }
      if (b) {
        c.new_rank = b.rank;
        c.new_fussell_vesely = b.fv;
      }
      changes.push(c);
    }
  }
  changes.sort((x, y) => (x.new_rank ?? Infinity) - (y.new_rank ?? Infinity) || (x.old_rank ?? Infinity) - (y.old_rank ?? Infinity));
  return { top: n.id, changes };
}
