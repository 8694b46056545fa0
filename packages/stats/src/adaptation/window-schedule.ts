/** One slow warm-up window: the metric is estimated from iterations start..end (inclusive). */
export interface SlowWindow {
  start: number;
  end: number;
}

export interface WarmupSchedule {
  /** Iterations (0-based) of fast step-size-only adaptation at the start. */
  initBuffer: number;
  /** Iterations of fast adaptation at the end. */
  termBuffer: number;
  /** Slow windows in order; empty when warm-up is too short to estimate a metric. */
  windows: SlowWindow[];
}

export interface WarmupScheduleSettings {
  initBuffer?: number;
  termBuffer?: number;
  baseWindow?: number;
}

/**
 * Stan's windowed warm-up (Stan Reference Manual, "HMC algorithm parameters"): a fast
 * initial buffer (75), slow windows that double from 25, a fast terminal buffer (50);
 * the last slow window is stretched to meet the terminal buffer. With fewer than 20
 * warm-up iterations no metric is estimated; when the defaults do not fit, the buffers
 * become 15 % and 10 % of warm-up (as Stan's windowed_adaptation).
 */
export function warmupSchedule(numWarmup: number, settings: WarmupScheduleSettings = {}): WarmupSchedule {
  if (!Number.isInteger(numWarmup) || numWarmup < 0) throw new Error(`warm-up length must be a non-negative integer, got ${String(numWarmup)}`);
  let initBuffer = settings.initBuffer ?? 75;
  let termBuffer = settings.termBuffer ?? 50;
  let baseWindow = settings.baseWindow ?? 25;
  if (numWarmup < 20) return { initBuffer: numWarmup, termBuffer: 0, windows: [] };
  if (initBuffer + baseWindow + termBuffer > numWarmup) {
    initBuffer = Math.floor(0.15 * numWarmup);
    termBuffer = Math.floor(0.1 * numWarmup);
    baseWindow = numWarmup - (initBuffer + termBuffer);
  }
  const lastSlow = numWarmup - termBuffer - 1;
  const windows: SlowWindow[] = [];
  let size = baseWindow;
  let start = initBuffer;
  let end = initBuffer + size - 1;
  for (;;) {
    windows.push({ start, end });
    if (end >= lastSlow) break;
    size *= 2;
    start = end + 1;
    end = start + size - 1;
    if (end + 2 * size >= lastSlow + 1) end = lastSlow;
  }
  return { initBuffer, termBuffer, windows };
}
