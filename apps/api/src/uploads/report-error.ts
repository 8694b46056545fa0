// A validation report with errors as the API's one error shape: the first problem in the
// message, every listed problem as an issue naming its row and column.
import type { IntakeIssue, ValidationReport } from "@tributary/contracts";
import { Invalid } from "../http/errors";

function issuePath(issue: IntakeIssue): string {
  if (issue.row !== null && issue.column !== null) return `row ${issue.row}, ${issue.column}`;
  if (issue.row !== null) return `row ${issue.row}`;
  if (issue.column !== null) return issue.column;
  return "file";
}

export function invalidFromReport(lead: string, report: ValidationReport): Invalid {
  const first = report.errors[0]?.message ?? "the data has errors";
  const more = report.errorCount > 1 ? ` (${report.errorCount} problems in all; see the list)` : "";
  return new Invalid(
    `${lead}: ${first}${more}`,
    report.errors.map((issue) => ({ path: issuePath(issue), message: issue.message })),
  );
}
