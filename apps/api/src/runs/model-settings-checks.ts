// Model settings checked against their dataset version: the shape is the shared schema's
// job; here, what depends on the data (channels exist, the holdout leaves enough weeks,
// and whatever else the model itself refuses).
import { validateFitInput } from "@tributary/stats";
import type { ModelSettings } from "@tributary/contracts";
import type { Queryable } from "../db/client";
import { datasetVersionExists } from "../datasets/dataset-queries";
import { Invalid, type FieldIssue } from "../http/errors";
import { fitOptionsOf, loadFitInput, type FitInput } from "./fit-input";

/** Weeks every cell must keep for the fit once the holdout is set aside (the intake's minimum per cell). */
export const MIN_FIT_WEEKS = 8;

/** Throws Invalid naming every problem; returns the fit's input when the settings fit the data. */
export async function checkSettingsAgainstData(db: Queryable, settings: ModelSettings): Promise<FitInput> {
  const version = await datasetVersionExists(db, settings.datasetVersionId);
  if (!version) throw new Invalid("No such dataset version", [{ path: "datasetVersionId", message: "No such dataset version" }]);
  const input = await loadFitInput(db, settings.datasetVersionId);
  const issues: FieldIssue[] = [];

  settings.cacRanges.forEach((range, k) => {
    if (!input.data.channels.includes(range.channel)) {
      issues.push({
        path: `cacRanges.${k}.channel`,
        message: `Dataset version ${version.number} has no channel "${range.channel}"; its channels are ${input.data.channels.join(", ")}`,
      });
    }
  });

  if (settings.holdoutWeeks > 0) {
    const shortest = Math.min(...input.data.cells.map((cell) => cell.outcome.length));
    const tooShort = input.data.cells.filter((cell) => cell.outcome.length - settings.holdoutWeeks < MIN_FIT_WEEKS);
    if (tooShort.length > 0) {
      const named = tooShort.slice(0, 5).map((cell) => `${cell.brand} × ${cell.market} (${cell.outcome.length} weeks)`);
      const most = Math.max(0, shortest - MIN_FIT_WEEKS);
      issues.push({
        path: "holdoutWeeks",
        message: `A holdout of ${settings.holdoutWeeks} weeks leaves fewer than ${MIN_FIT_WEEKS} weeks to fit in ${named.join(", ")}${tooShort.length > 5 ? " and others" : ""}; at most ${most} holdout weeks fit this dataset`,
      });
    }
  }

  if (issues.length === 0) {
    try {
      validateFitInput(input.data, fitOptionsOf(settings, settings.seed ?? 1, input.liftTests));
    } catch (error) {
      if (!(error instanceof RangeError)) throw error;
      issues.push({ path: "settings", message: `The model cannot be fitted with these settings: ${error.message}` });
    }
  }
  if (issues.length > 0) throw new Invalid(issues.length === 1 ? issues[0]!.message : `${issues.length} settings do not fit the data: ${issues.map((i) => i.path).join(", ")}`, issues);
  return input;
}
