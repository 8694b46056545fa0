import type { RunReport as Report } from "@tributary/contracts";
import type { ReactNode } from "react";
import { formatDuration } from "../../../lib/format";
import { DiagnosticsTable } from "./diagnostics-table";
import { HoldoutAccuracy } from "./holdout-accuracy";
import { PredictiveCheck } from "./predictive-check";
import { PublishPanel } from "./publish-panel";
import { TracePlots } from "./trace-plots";
import { TrustSummary } from "./trust-summary";

function ReportSection({ id, title, description, children }: { id: string; title: string; description?: ReactNode; children: ReactNode }) {
  return (
    <section aria-labelledby={id} className="rounded-lg border border-line bg-surface p-5 shadow-card">
      <h2 id={id} className="text-heading font-semibold text-ink-900">
        {title}
      </h2>
      {description ? <p className="mt-1 max-w-3xl text-small text-ink-700">{description}</p> : null}
      <div className="mt-4">{children}</div>
    </section>
  );
}

/** A finished run's report: trust, diagnostics, traces, predictive check, holdout and publishing. */
export function RunReport({ report, outcomeLabel }: { report: Report; outcomeLabel: string }) {
  return (
    <div className="space-y-6">
      <TrustSummary diagnostics={report.diagnostics} publishReason={report.run.publication?.reason ?? null} />
      <PublishPanel run={report.run} />
      <ReportSection id="diagnostics-title" title="Diagnostics" description="Posterior summaries and convergence numbers of every parameter of the pooled model. Flagged values break the trust rule.">
        <DiagnosticsTable parameters={report.parameters} />
      </ReportSection>
      <ReportSection id="traces-title" title="Trace and rank plots" description="The parameters whose chains agree least, drawn so you can see how they moved.">
        <TracePlots traces={report.traces} />
      </ReportSection>
      <ReportSection id="ppc-title" title="Posterior predictive check" description="Does data replicated from the fitted model look like the data it was fitted to?">
        <PredictiveCheck cells={report.predictiveCheck} outcomeLabel={outcomeLabel} />
      </ReportSection>
      <ReportSection id="holdout-title" title="Holdout accuracy" description="How well the fit forecast weeks it never saw.">
        <HoldoutAccuracy holdout={report.holdout} holdoutWeeks={report.run.settings.holdoutWeeks} />
      </ReportSection>
      <p className="text-caption text-ink-600">
        Sampling took {formatDuration(report.timing.samplingSeconds)} (pooled {formatDuration(report.timing.pooledSeconds)}, each cell alone{" "}
        {formatDuration(report.timing.unpooledSeconds)}); the whole fit {formatDuration(report.timing.totalSeconds)}.
      </p>
    </div>
  );
}
