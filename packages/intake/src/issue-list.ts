import type { DatasetSummary, IntakeIssue, IntakeIssueCode, IssueCount, ValidationReport } from "@tributary/contracts";

export type IssueSeverity = IntakeIssue["severity"];

export interface IssueLimits {
  /** At most this many issues of one kind (code) are listed; the rest are only counted. */
  readonly maxIssuesPerKind?: number;
  /** At most this many errors, and this many warnings, are listed in all. */
  readonly maxIssues?: number;
}

export const DEFAULT_MAX_ISSUES_PER_KIND = 20;
export const DEFAULT_MAX_ISSUES = 200;

/** Collects issues, listing a capped number of each kind and counting them all. */
export class IssueList {
  private readonly errors: IntakeIssue[] = [];
  private readonly warnings: IntakeIssue[] = [];
  private readonly counts = new Map<string, IssueCount>();
  private errorTotal = 0;
  private warningTotal = 0;
  private readonly maxPerKind: number;
  private readonly maxTotal: number;

  constructor(limits: IssueLimits = {}) {
    this.maxPerKind = Math.max(1, limits.maxIssuesPerKind ?? DEFAULT_MAX_ISSUES_PER_KIND);
    this.maxTotal = Math.max(1, limits.maxIssues ?? DEFAULT_MAX_ISSUES);
  }

  error(code: IntakeIssueCode, row: number | null, column: string | null, message: string): void {
    this.add({ severity: "error", code, row, column, message });
  }

  warning(code: IntakeIssueCode, row: number | null, column: string | null, message: string): void {
    this.add({ severity: "warning", code, row, column, message });
  }

  add(issue: IntakeIssue): void {
    const key = `${issue.severity}:${issue.code}`;
    let count = this.counts.get(key);
    if (!count) {
      count = { severity: issue.severity, code: issue.code, count: 0, shown: 0 };
      this.counts.set(key, count);
    }
    count.count += 1;
    const list = issue.severity === "error" ? this.errors : this.warnings;
    if (issue.severity === "error") this.errorTotal += 1;
    else this.warningTotal += 1;
    if (count.shown < this.maxPerKind && list.length < this.maxTotal) {
      list.push(issue);
      count.shown += 1;
    }
  }

  get errorCount(): number {
    return this.errorTotal;
  }

  get warningCount(): number {
    return this.warningTotal;
  }

  hasErrors(): boolean {
    return this.errorTotal > 0;
  }

  report(summary: DatasetSummary | null): ValidationReport {
    return {
      ok: this.errorTotal === 0,
      errors: [...this.errors],
      warnings: [...this.warnings],
      errorCount: this.errorTotal,
      warningCount: this.warningTotal,
      counts: [...this.counts.values()].map((count) => ({ ...count })),
      summary,
    };
  }
}

/** A report holding only the given issues (e.g. a file that could not be read). */
export function reportOf(issues: readonly IntakeIssue[], summary: DatasetSummary | null = null, limits?: IssueLimits): ValidationReport {
  const list = new IssueList(limits);
  for (const issue of issues) list.add(issue);
  return list.report(summary);
}

/** The report with more issues added in front (counted in full, listed as the caps allow). */
export function withIssues(report: ValidationReport, extra: readonly IntakeIssue[], limits?: IssueLimits): ValidationReport {
  if (extra.length === 0) return report;
  const list = new IssueList(limits);
  for (const issue of extra) list.add(issue);
  const front = list.report(report.summary);
  const counts = new Map<string, IssueCount>();
  for (const count of [...front.counts, ...report.counts]) {
    const key = `${count.severity}:${count.code}`;
    const seen = counts.get(key);
    if (seen) counts.set(key, { ...seen, count: seen.count + count.count, shown: seen.shown + count.shown });
    else counts.set(key, { ...count });
  }
  return {
    ok: report.ok && front.ok,
    errors: [...front.errors, ...report.errors],
    warnings: [...front.warnings, ...report.warnings],
    errorCount: front.errorCount + report.errorCount,
    warningCount: front.warningCount + report.warningCount,
    counts: [...counts.values()],
    summary: report.summary,
  };
}
