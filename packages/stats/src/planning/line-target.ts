import { cellLabel, type CellRef } from "./plan-cells";

/**
 * Which lines (cell × channel) an operation or a bound applies to. Every list given
 * narrows the choice (a line must match all of them); a list left out means "all".
 */
export interface LineTarget {
  readonly channels?: readonly string[];
  readonly markets?: readonly string[];
  readonly brands?: readonly string[];
  readonly cells?: readonly CellRef[];
}

/** Describes a target in words for messages, e.g. "channel Video in market Northland". */
export function describeTarget(target: LineTarget | undefined): string {
  if (target === undefined) return "every line";
  const parts: string[] = [];
  if (target.channels) parts.push(`channel ${target.channels.join(", ")}`);
  if (target.brands) parts.push(`brand ${target.brands.join(", ")}`);
  if (target.markets) parts.push(`market ${target.markets.join(", ")}`);
  if (target.cells) parts.push(`cell ${target.cells.map(cellLabel).join(", ")}`);
  return parts.length === 0 ? "every line" : parts.join(" in ");
}

/**
 * The lines a target selects among the plan's cells × channels, as a mask at i·C + c.
 * Unknown names, empty lists and a target that selects nothing are errors.
 */
export function matchLines(target: LineTarget | undefined, cells: readonly CellRef[], channels: readonly string[], what: string): Uint8Array {
  const C = channels.length;
  const mask = new Uint8Array(cells.length * C);
  const t = target ?? {};
  const known = (list: readonly string[] | undefined, names: readonly string[], kind: string): void => {
    if (list === undefined) return;
    if (!Array.isArray(list) || list.length === 0) throw new RangeError(`${what}: the list of ${kind}s is empty; leave it out to mean all ${kind}s`);
    for (const name of list) {
      if (typeof name !== "string" || !names.includes(name)) {
        throw new RangeError(`${what}: ${kind} "${String(name)}" is not among the planned ${kind}s (${[...new Set(names)].join(", ")})`);
      }
    }
  };
  known(t.channels, channels, "channel");
  known(t.markets, cells.map((c) => c.market), "market");
  known(t.brands, cells.map((c) => c.brand), "brand");
  if (t.cells !== undefined) {
    if (!Array.isArray(t.cells) || t.cells.length === 0) throw new RangeError(`${what}: the list of cells is empty; leave it out to mean all cells`);
    for (const ref of t.cells) {
      if (!cells.some((c) => c.brand === ref.brand && c.market === ref.market)) {
        throw new RangeError(`${what}: cell ${cellLabel(ref)} is not among the planned cells (${cells.map(cellLabel).join(", ")})`);
      }
    }
  }
  let count = 0;
  cells.forEach((cell, i) => {
    if (t.markets && !t.markets.includes(cell.market)) return;
    if (t.brands && !t.brands.includes(cell.brand)) return;
    if (t.cells && !t.cells.some((r) => r.brand === cell.brand && r.market === cell.market)) return;
    channels.forEach((channel, c) => {
      if (t.channels && !t.channels.includes(channel)) return;
      mask[i * C + c] = 1;
      count++;
    });
  });
  if (count === 0) throw new RangeError(`${what}: ${describeTarget(target)} matches no line of the planned cells`);
  return mask;
}
