import { checkCellChannel, type DrawSet } from "./draw-set";
import { contributionSeries } from "./media-contribution";

/**
 * Average CAC of all channels of a cell together over weeks [fromWeek, toWeek] (0-based,
 * inclusive), per draw: Σ_c Σ_t spend / Σ_c Σ_t contribution, where contributions carry
 * over spend from before the window. NaN when no channel spent in the window.
 */
export function averageCacCombined(set: DrawSet, g: number, fromWeek: number, toWeek: number): Float64Array {
  checkCellChannel(set, g, 0);
  const cell = set.cells[g]!;
  if (!Number.isInteger(fromWeek) || !Number.isInteger(toWeek) || fromWeek < 0 || toWeek >= cell.weeks || toWeek < fromWeek) {
    throw new RangeError(`combined CAC window must be weeks within 0..${cell.weeks - 1}, got ${fromWeek}..${toWeek}`);
  }
  const C = set.channels.length;
  const length = toWeek + 1;
  let spent = 0;
  const active: number[] = [];
  for (let c = 0; c < C; c++) {
    const spend = cell.spend[c]!;
    let channelSpent = 0;
    for (let t = fromWeek; t <= toWeek; t++) channelSpent += spend[t]!;
    spent += channelSpent;
    // A channel that spent nothing up to the window's end contributes nothing in it.
    let any = false;
    for (let t = 0; t < length && !any; t++) any = spend[t]! > 0;
    if (any) active.push(c);
  }
  const out = new Float64Array(set.drawCount);
  if (!(spent > 0)) return out.fill(NaN);
  const contribution = new Float64Array(length);
  const buffer = new Float64Array(length);
  for (let d = 0; d < set.drawCount; d++) {
    let gained = 0;
    for (const c of active) {
      contributionSeries(set, d, g, c, cell.spend[c]!.subarray(0, length), contribution, buffer);
      for (let t = fromWeek; t <= toWeek; t++) gained += contribution[t]!;
    }
    out[d] = spent / gained;
  }
  return out;
}

/** Combined average CAC over the last `weeks` fitted weeks of the cell (13 by default), per draw. */
export function averageCacCombinedRecent(set: DrawSet, g: number, weeks = 13): Float64Array {
  checkCellChannel(set, g, 0);
  const train = set.cells[g]!.trainWeeks;
  return averageCacCombined(set, g, Math.max(0, train - weeks), train - 1);
}

/** Mean weekly spend of a channel over the last `weeks` fitted weeks of the cell: the "current spend". */
export function recentWeeklySpend(set: DrawSet, g: number, c: number, weeks = 13): number {
  checkCellChannel(set, g, c);
  if (!Number.isInteger(weeks) || weeks < 1) throw new RangeError(`weeks must be a positive integer, got ${weeks}`);
  const cell = set.cells[g]!;
  const from = Math.max(0, cell.trainWeeks - weeks);
  let sum = 0;
  for (let t = from; t < cell.trainWeeks; t++) sum += cell.spend[c]![t]!;
  return sum / (cell.trainWeeks - from);
}
