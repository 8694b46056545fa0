import type { FitProgress } from "@tributary/stats";

/** Where progress goes: a terminal (redrawn bars) or a log (plain lines). */
export interface ProgressStream {
  readonly isTTY?: boolean;
  write(text: string): unknown;
}

interface ChainState {
  iteration: number;
  total: number;
  phase: FitProgress["phase"];
  divergences: number;
  cell: number | undefined;
  cellCount: number | undefined;
  /** Last quarter (0–4) printed in plain mode, per phase. */
  printedQuarter: number;
  printedPhase: FitProgress["phase"] | null;
}

const BAR_WIDTH = 24;
const REDRAW_MS = 100;

export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) return "--:--";
  const s = Math.round(seconds);
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const r = s % 60;
  const mm = h > 0 ? String(m).padStart(2, "0") : String(m);
  return `${h > 0 ? `${h}:` : ""}${mm}:${String(r).padStart(2, "0")}`;
}

function modelName(model: FitProgress["model"]): string {
  return model === "pooled" ? "pooled model" : "no-pooling comparison";
}

function phaseName(phase: FitProgress["phase"]): string {
  return phase === "warmup" ? "warm-up " : "sampling";
}

/**
 * Shows the progress of a fit: one bar per chain with phase, divergences and an ETA on a
 * terminal; on a log (not a TTY), a plain line when a chain changes phase or passes a quarter.
 */
export class ProgressDisplay {
  private readonly tty: boolean;
  private model: FitProgress["model"] | null = null;
  private attempt = 1;
  private chains: ChainState[] = [];
  private modelStarted = 0;
  private drawnLines = 0;
  private lastDraw = 0;

  constructor(
    private readonly stream: ProgressStream,
    private readonly chainCount: number,
    private readonly clock: () => number = () => Date.now(),
  ) {
    this.tty = stream.isTTY === true;
  }

  update(p: FitProgress): void {
    if (p.model !== this.model || p.attempt !== this.attempt) this.startModel(p);
    const chain = this.chains[p.chain];
    if (chain === undefined) return;
    chain.iteration = p.iteration;
    chain.total = p.total;
    chain.phase = p.phase;
    chain.divergences = p.divergences;
    chain.cell = p.cell;
    chain.cellCount = p.cellCount;
    if (this.tty) {
      const t = this.clock();
      if (t - this.lastDraw >= REDRAW_MS || p.iteration === p.total) this.redraw();
    } else this.plainLine(p.chain, chain);
  }

  /** Draws the final state of the current bars (TTY) so the last picture stays on screen. */
  finish(): void {
    if (this.tty && this.model !== null) this.redraw();
    this.model = null;
    this.drawnLines = 0;
  }

  private startModel(p: FitProgress): void {
    this.finish();
    this.model = p.model;
    this.attempt = p.attempt;
    this.modelStarted = this.clock();
    this.chains = Array.from({ length: this.chainCount }, () => ({
      iteration: 0,
      total: p.total,
      phase: "warmup" as const,
      divergences: 0,
      cell: undefined,
      cellCount: undefined,
      printedQuarter: -1,
      printedPhase: null,
    }));
    const again = p.attempt > 1 ? " (run again at target acceptance 0.9 after divergences)" : "";
    this.stream.write(`Fitting the ${modelName(p.model)}${again}:\n`);
  }

  /** Seconds left for the current model, from its average pace so far. */
  private eta(): number {
    let done = 0;
    let total = 0;
    for (const c of this.chains) {
      done += c.iteration;
      total += c.total;
    }
    const elapsed = (this.clock() - this.modelStarted) / 1000;
    if (done === 0 || total === 0 || elapsed <= 0) return Number.NaN;
    return (elapsed * (total - done)) / done;
  }

  private chainLine(k: number, c: ChainState): string {
    const share = c.total > 0 ? c.iteration / c.total : 0;
    const filled = Math.round(share * BAR_WIDTH);
    const bar = "#".repeat(filled) + "-".repeat(BAR_WIDTH - filled);
    const cell = c.cell !== undefined && c.cellCount !== undefined ? `  cell ${c.cell + 1}/${c.cellCount}` : "";
    const div = `${c.divergences} divergence${c.divergences === 1 ? "" : "s"}`;
    return `  chain ${k + 1}/${this.chainCount} [${bar}] ${String(Math.floor(share * 100)).padStart(3)}%  ${phaseName(c.phase)}${cell}  ${div}`;
  }

  private redraw(): void {
    this.lastDraw = this.clock();
    const lines = this.chains.map((c, k) => this.chainLine(k, c));
    lines.push(`  time left about ${formatDuration(this.eta())}`);
    let out = this.drawnLines > 0 ? `\x1b[${this.drawnLines}A` : "";
    for (const line of lines) out += `\x1b[2K${line}\n`;
    this.stream.write(out);
    this.drawnLines = lines.length;
  }

  private plainLine(k: number, c: ChainState): void {
    const quarter = c.total > 0 ? Math.floor((4 * c.iteration) / c.total) : 0;
    if (c.printedPhase === c.phase && quarter <= c.printedQuarter) return;
    c.printedPhase = c.phase;
    c.printedQuarter = quarter;
    const cell = c.cell !== undefined && c.cellCount !== undefined ? `, cell ${c.cell + 1}/${c.cellCount}` : "";
    this.stream.write(
      `${modelName(this.model ?? "pooled")}: chain ${k + 1}/${this.chainCount} ${phaseName(c.phase).trim()} ${c.iteration}/${c.total}${cell}, ` +
        `${c.divergences} divergence${c.divergences === 1 ? "" : "s"}, time left about ${formatDuration(this.eta())}\n`,
    );
  }
}
