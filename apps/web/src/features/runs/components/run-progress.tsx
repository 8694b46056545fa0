import { fitStageLabels, type RunChainProgress, type RunProgress as Progress } from "@tributary/contracts";
import { formatDuration } from "../../../lib/format";

const modelLabels: Record<RunChainProgress["model"], string> = {
  pooled: "Pooled model",
  unpooled: "Each cell alone",
};

function Bar({ value, label }: { value: number; label: string }) {
  const percent = Math.max(0, Math.min(100, value * 100));
  return (
    <div
      role="progressbar"
      aria-label={label}
      aria-valuemin={0}
      aria-valuemax={100}
      aria-valuenow={Math.round(percent)}
      className="h-2.5 w-full overflow-hidden rounded-full bg-ink-100"
    >
      <div className="h-full rounded-full bg-stream-600 transition-[width]" style={{ width: `${percent}%` }} />
    </div>
  );
}

function chainLabel(chain: RunChainProgress): string {
  return `${modelLabels[chain.model]}, chain ${chain.chain + 1}`;
}

/** The whole fit's stage, share done and time left, and a row per chain. */
export function RunProgress({ progress, stream }: { progress: Progress; stream: "live" | "polling" }) {
  const chains = [...progress.chains].sort((a, b) => (a.model === b.model ? a.chain - b.chain : a.model === "pooled" ? -1 : 1));
  return (
    <section aria-label="Progress" className="space-y-4">
      <div className="space-y-2">
        <div className="flex flex-wrap items-baseline justify-between gap-2 text-small">
          <p className="font-semibold text-ink-900" data-stage={progress.stage}>
            {fitStageLabels[progress.stage]}
            {progress.queuePosition !== null ? ` · number ${progress.queuePosition} in the queue` : ""}
          </p>
          <p className="text-ink-700">
            {Math.round(progress.fraction * 100)} % done · {formatDuration(progress.elapsedSeconds)} so far
            {progress.etaSeconds !== null ? ` · about ${formatDuration(progress.etaSeconds)} left` : ""}
          </p>
        </div>
        <Bar value={progress.fraction} label="Whole fit" />
        <p className="text-caption text-ink-600">{stream === "live" ? "Live updates." : "Updating every few seconds."}</p>
      </div>
      {chains.length > 0 ? (
        <table className="w-full border-collapse text-small">
          <caption className="sr-only">Progress of each chain</caption>
          <thead>
            <tr className="border-b border-line text-left text-ink-700">
              <th scope="col" className="py-1.5 pr-3 font-semibold">
                Chain
              </th>
              <th scope="col" className="py-1.5 pr-3 font-semibold">
                Phase
              </th>
              <th scope="col" className="w-2/5 py-1.5 pr-3 font-semibold">
                Iterations
              </th>
              <th scope="col" className="py-1.5 pr-3 text-right font-semibold" title="During warm-up some are expected; after it, any is a warning">
                Divergences
              </th>
              <th scope="col" className="py-1.5 text-right font-semibold">
                Time left
              </th>
            </tr>
          </thead>
          <tbody>
            {chains.map((chain) => (
              <tr key={`${chain.model}-${chain.chain}`} className="border-b border-line last:border-b-0">
                <th scope="row" className="py-2 pr-3 text-left font-medium text-ink-900">
                  {chainLabel(chain)}
                  {chain.cell !== null && chain.cellCount !== null ? (
                    <span className="block text-caption font-normal text-ink-600">
                      cell {chain.cell + 1} of {chain.cellCount}
                    </span>
                  ) : null}
                </th>
                <td className="py-2 pr-3 text-ink-800">
                  {chain.phase === "warmup" ? "Warm-up" : "Sampling"}
                  {chain.attempt > 1 ? <span className="block text-caption text-caution-700">second try, higher target acceptance</span> : null}
                </td>
                <td className="py-2 pr-3">
                  <div className="flex items-center gap-3">
                    <Bar value={chain.total > 0 ? chain.iteration / chain.total : 0} label={chainLabel(chain)} />
                    <span className="shrink-0 tabular-nums text-ink-700">
                      {chain.iteration.toLocaleString("en-GB")} / {chain.total.toLocaleString("en-GB")}
                    </span>
                  </div>
                </td>
                <td className={`py-2 pr-3 text-right tabular-nums ${chain.divergences > 0 && chain.phase === "sampling" ? "font-semibold text-caution-700" : "text-ink-800"}`}>
                  {chain.divergences}
                </td>
                <td className="py-2 text-right tabular-nums text-ink-800">{chain.etaSeconds !== null ? formatDuration(chain.etaSeconds) : "–"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
    </section>
  );
}
