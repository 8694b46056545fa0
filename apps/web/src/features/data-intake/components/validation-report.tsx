import type { IntakeIssue, IssueCount, ValidationReport as Report } from "@tributary/contracts";
import { formatWeek } from "../../../lib/format";
import { issueLabels } from "./issue-labels";

function plural(count: number, noun: string): string {
  return `${count.toLocaleString("en-GB")} ${noun}${count === 1 ? "" : "s"}`;
}

function where(issue: IntakeIssue): string | null {
  const parts = [issue.row !== null ? `Row ${issue.row}` : null, issue.column !== null ? `column ${issue.column}` : null].filter(Boolean);
  return parts.length > 0 ? parts.join(", ") : null;
}

function IssueGroup({ count, issues }: { count: IssueCount; issues: IntakeIssue[] }) {
  const error = count.severity === "error";
  const headingId = `issues-${count.severity}-${count.code}`;
  return (
    <section aria-labelledby={headingId} className="py-3 first:pt-0 last:pb-0">
      <h4 id={headingId} className="flex flex-wrap items-baseline gap-2 text-small font-semibold text-ink-900">
        <span>{issueLabels[count.code]}</span>
        <span className={`rounded-sm px-1.5 text-caption font-semibold ${error ? "bg-alert-100 text-alert-700" : "bg-caution-100 text-caution-700"}`}>
          {plural(count.count, error ? "error" : "warning")}
        </span>
      </h4>
      <ul className="mt-1 space-y-1 text-small">
        {issues.map((issue, i) => {
          const place = where(issue);
          return (
            <li key={i} className="flex gap-2">
              {place ? <span className="shrink-0 font-medium text-ink-800">{place}:</span> : null}
              <span className="text-ink-700">{issue.message}</span>
            </li>
          );
        })}
      </ul>
      {count.count > count.shown ? (
        <p className="mt-1 text-caption text-ink-600">
          Showing the first {count.shown.toLocaleString("en-GB")} of {count.count.toLocaleString("en-GB")}; fix these and check again to see the rest.
        </p>
      ) : null}
    </section>
  );
}

function IssueList({ severity, report }: { severity: "error" | "warning"; report: Report }) {
  const issues = severity === "error" ? report.errors : report.warnings;
  const total = severity === "error" ? report.errorCount : report.warningCount;
  const counts = report.counts.filter((count) => count.severity === severity);
  // Kinds the counts miss (should not happen) still show, so nothing listed is lost.
  for (const issue of issues) {
    if (!counts.some((count) => count.code === issue.code)) counts.push({ severity, code: issue.code, count: 1, shown: 1 });
  }
  const title = severity === "error" ? "Errors (these block saving)" : "Warnings (worth a look; they do not block saving)";
  if (total === 0) return null;
  return (
    <section
      aria-label={severity === "error" ? "Errors" : "Warnings"}
      className={`rounded-lg border px-4 py-3 ${severity === "error" ? "border-alert-700/30 bg-alert-100/40" : "border-silt-500/40 bg-caution-100/40"}`}
    >
      <h3 className="mb-2 text-body font-semibold text-ink-900">
        {title}: {total.toLocaleString("en-GB")}
      </h3>
      <div className="divide-y divide-line">
        {counts.map((count) => (
          <IssueGroup key={count.code} count={count} issues={issues.filter((issue) => issue.code === count.code)} />
        ))}
      </div>
    </section>
  );
}

/** The validation report: what was found, grouped by kind, each with its row and column. */
export function ValidationReport({ report }: { report: Report }) {
  const summary = report.summary;
  return (
    <div className="space-y-4">
      <div
        role="status"
        className={`flex flex-wrap items-center gap-x-4 gap-y-1 rounded-md px-4 py-3 text-small ${report.ok ? "bg-ok-100 text-ok-700" : "bg-alert-100 text-alert-700"}`}
      >
        <strong className="font-semibold">
          {report.ok ? "No errors: this data can be saved." : `${plural(report.errorCount, "error")} to fix before saving.`}
        </strong>
        <span>{plural(report.errorCount, "error")}</span>
        <span>{plural(report.warningCount, "warning")}</span>
      </div>
      {summary ? (
        <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-small md:grid-cols-4">
          <div>
            <dt className="text-ink-600">Rows</dt>
            <dd className="font-semibold text-ink-900">{summary.rows.toLocaleString("en-GB")}</dd>
          </div>
          <div>
            <dt className="text-ink-600">Cells (brand × market)</dt>
            <dd className="font-semibold text-ink-900">{summary.cells.length}</dd>
          </div>
          <div>
            <dt className="text-ink-600">Channels</dt>
            <dd className="font-semibold text-ink-900">{summary.channels.join(", ") || "none"}</dd>
          </div>
          <div>
            <dt className="text-ink-600">Weeks</dt>
            <dd className="font-semibold text-ink-900">
              {summary.firstWeek && summary.lastWeek ? `${formatWeek(summary.firstWeek)} – ${formatWeek(summary.lastWeek)}` : "–"}
            </dd>
          </div>
        </dl>
      ) : null}
      <IssueList severity="error" report={report} />
      <IssueList severity="warning" report={report} />
    </div>
  );
}
