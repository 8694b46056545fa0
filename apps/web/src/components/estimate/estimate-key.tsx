// The key to the small marks the dashboards draw: interval bar, shrinkage mark, flags.
import { flagKinds, flagKindLabels } from "@tributary/contracts";
import { FlagGlyph } from "./flag-badge";
import { IntervalBar } from "./interval-bar";
import { ShrinkageMark } from "./shrinkage-mark";

type EstimateKeyProps = {
  /** Say what the upright line on an interval bar is, when there is one. */
  referenceLabel?: string;
  shrinkage?: boolean;
  flags?: boolean;
};

export function EstimateKey({ referenceLabel, shrinkage = true, flags = true }: EstimateKeyProps) {
  return (
    <section aria-label="Key to the marks" className="flex flex-wrap items-center gap-x-6 gap-y-2 rounded-md border border-line bg-surface/70 px-4 py-2.5 text-caption text-ink-700">
      <span className="inline-flex items-center gap-2">
        <IntervalBar className="w-20" median={40} low={20} high={90} domain={[10, 160]} reference={referenceLabel ? 120 : null} />
        <span>
          dot: median; bar: 90 % interval{referenceLabel ? `; upright line: ${referenceLabel}` : ""}
        </span>
      </span>
      {shrinkage ? (
        <span className="inline-flex items-center gap-2">
          <ShrinkageMark shrinkage={0.6} />
          <span>shrinkage: bar from the cell’s own estimate (tick) toward the group (ring); a chevron: outside 0–1</span>
        </span>
      ) : null}
      {flags ? (
        <span className="inline-flex flex-wrap items-center gap-x-3 gap-y-1">
          <span>flags:</span>
          {flagKinds.map((kind) => (
            <span key={kind} className="inline-flex items-center gap-1">
              <FlagGlyph kind={kind} />
              {flagKindLabels[kind].toLowerCase()}
            </span>
          ))}
        </span>
      ) : null}
    </section>
  );
}
