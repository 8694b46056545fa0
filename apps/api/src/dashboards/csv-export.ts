// CSV exports of the dashboard tables, written with papaparse from the same views the
// JSON routes send (so they carry exactly the viewer's markets). Text cells that a
// spreadsheet would read as a formula (starting with = + - @, a tab or a carriage
// return) get a leading single quote; numbers stay numbers.
import Papa from "papaparse";
import type { Response } from "express";
import type { BrandComparison, CacInterval, ChannelSheet, Flag, MarketDesk, PoolingReview, PortfolioMap, Run } from "@tributary/contracts";
import { flagKindLabels } from "@tributary/contracts";
import { Invalid } from "../http/errors";

/** Any text starting with one of these is neutralised (the whole text, even when it spans lines). */
export const FORMULA_START = /^[=+\-@\t\r]/;

export type CsvValue = string | number | boolean | null;
export interface CsvTable {
  readonly fields: readonly string[];
  readonly rows: readonly (readonly CsvValue[])[];
}

export function toCsv(table: CsvTable): string {
  return Papa.unparse(
    { fields: [...table.fields], data: table.rows.map((row) => row.map((v) => (v === null ? "" : v))) },
    { escapeFormulae: FORMULA_START, newline: "\r\n" },
  );
}

/** Sends a table as a CSV attachment. */
export function sendCsv(res: Response, fileName: string, table: CsvTable): void {
  res.status(200);
  res.setHeader("Content-Type", "text/csv; charset=utf-8");
  res.setHeader("Content-Disposition", `attachment; filename="${fileName.replace(/[^\w.-]/g, "_")}"`);
  res.setHeader("Cache-Control", "no-store");
  res.send(toCsv(table));
}

/** The `table` query parameter of a multi-table export. */
export function tableParam<T extends string>(raw: unknown, tables: readonly T[]): T {
  if (raw === undefined || raw === "") return tables[0]!;
  if (typeof raw === "string" && (tables as readonly string[]).includes(raw)) return raw as T;
  throw new Invalid(`Unknown table "${String(raw)}"; choose ${tables.join(", ")}`, [{ path: "table", message: `Choose ${tables.join(", ")}` }]);
}

const intervalFields = (prefix: string) => [`${prefix}_median`, `${prefix}_q05`, `${prefix}_q95`];
const intervalValues = (i: CacInterval | null | undefined): CsvValue[] => (i ? [i.q50, i.q05, i.q95] : [null, null, null]);
const runFields = ["run_id", "run_fitted_at", "run_trustworthy", "run_publish_reason"];
const runValues = (run: Run): CsvValue[] => [run.id, run.finishedAt, run.trust.trustworthy, run.publication?.reason ?? null];

type NamedChannel = { readonly code: string; readonly name: string } | { readonly channel: string; readonly name: string };

/** Channel code → display name (the code when a channel has no name): exports are read by people. */
function channelNamer(channels: readonly NamedChannel[]): (code: string) => string {
  const names = new Map(channels.map((c) => ["code" in c ? c.code : c.channel, c.name] as const));
  return (code) => names.get(code) || code;
}

function flagText(flags: readonly Flag[], ids: readonly string[]): string {
  const byId = new Map(flags.map((f) => [f.id, f] as const));
  return ids
    .map((id) => byId.get(id))
    .filter((f): f is Flag => f !== undefined)
    .map((f) => `${flagKindLabels[f.kind]} (${f.channelName || f.channel}): ${f.note}`)
    .join(" | ");
}

export function portfolioMapTable(view: PortfolioMap): CsvTable {
  return {
    fields: [
      "brand",
      "market",
      "channel",
      ...intervalFields("cac"),
      "cac_basis",
      ...intervalFields("average_cac"),
      "customer_value",
      "chance_of_profit",
      "weeks",
      "fitted_weeks",
      "shrinkage",
      "shrinkage_mark",
      "pooled_to_unpooled_median",
      "outlier",
      "flags",
      ...runFields,
    ],
    rows: view.cells.map((cell) => [
      cell.brand,
      cell.market,
      view.channel === null ? "all channels" : channelNamer(view.channels)(view.channel),
      ...intervalValues(cell.cac),
      view.headline.label,
      ...intervalValues(cell.cacAverage),
      cell.customerValue,
      cell.probabilityProfitable,
      cell.weeks,
      cell.fittedWeeks,
      cell.pooling.shrinkage,
      cell.pooling.shrinkageMark,
      cell.pooling.medianRatio,
      cell.outlier,
      flagText(view.flags, cell.flagIds),
      ...runValues(view.run),
    ]),
  };
}

export function brandComparisonTable(view: BrandComparison): CsvTable {
  const reference = new Map(view.channels.map((c) => [c.channel, c.portfolioEffect] as const));
  const channelName = channelNamer(view.channels);
  return {
    fields: ["channel", "brand", "market", "has_spend", ...intervalFields("cac"), ...intervalFields("cac_unpooled"), ...intervalFields("brand_effect"), ...intervalFields("portfolio_effect"), "shrinkage", "outlier", "flags", ...runFields],
    rows: view.rows.flatMap((row) =>
      row.cells.map((cell) => [
        channelName(row.channel),
        row.brand,
        cell.market,
        cell.hasSpend,
        ...intervalValues(cell.cac),
        ...intervalValues(cell.cacUnpooled),
        ...intervalValues(row.brandEffect),
        ...intervalValues(reference.get(row.channel)),
        cell.pooling.shrinkage,
        cell.outlier,
        flagText(view.flags, cell.flagIds),
        ...runValues(view.run),
      ]),
    ),
  };
}

export const marketDeskTables = ["estimates", "changes", "plans"] as const;

export function marketDeskTable(view: MarketDesk, table: (typeof marketDeskTables)[number]): CsvTable {
  const channelName = channelNamer(view.channels);
  if (table === "changes") {
    return {
      fields: ["brand", "market", "channel", "status", ...intervalFields("cac_before"), ...intervalFields("cac_after"), "median_change", "intervals_overlap", "previous_run_id", ...runFields],
      rows: view.changes.map((x) => [
        x.brand,
        x.market,
        channelName(x.channel),
        x.status,
        x.before?.q50 ?? null,
        x.before?.q05 ?? null,
        x.before?.q95 ?? null,
        x.after?.q50 ?? null,
        x.after?.q05 ?? null,
        x.after?.q95 ?? null,
        x.medianChange,
        x.intervalsOverlap,
        view.previousRun?.id ?? null,
        ...runValues(view.run),
      ]),
    };
  }
  if (table === "plans") {
    return {
      fields: ["name", "kind", "status", "markets", "created_by", "created_at", "updated_at"],
      rows: view.plans.map((p) => [p.name, p.kind, p.status, p.markets.join(", "), p.createdBy?.name ?? null, p.createdAt, p.updatedAt]),
    };
  }
  return {
    fields: ["brand", "market", "channel", "has_spend", ...intervalFields("cac"), ...intervalFields("average_cac"), "current_weekly_spend", "customer_value", "chance_of_profit", "shrinkage", "outlier", "flags", ...runFields],
    rows: view.cells.flatMap((cell) =>
      cell.channels.map((ch) => [
        cell.brand,
        cell.market,
        channelName(ch.channel),
        ch.hasSpend,
        ...intervalValues(ch.cac),
        ...intervalValues(ch.cacAverage),
        ch.currentWeeklySpend,
        cell.customerValue,
        ch.probabilityProfitable,
        ch.pooling.shrinkage,
        ch.outlier,
        flagText(view.flags, ch.flagIds),
        ...runValues(view.run),
      ]),
    ),
  };
}

export const channelSheetTables = ["response-curve", "carry-over", "contribution", "profit-draws"] as const;

export function channelSheetTable(view: ChannelSheet, table: (typeof channelSheetTables)[number]): CsvTable {
  const who: CsvValue[] = [view.cell.brand, view.cell.market, view.channel.name || view.channel.code];
  const whoFields = ["brand", "market", "channel"];
  const band = (prefix: string) => [`${prefix}_q05`, `${prefix}_q25`, `${prefix}_median`, `${prefix}_q75`, `${prefix}_q95`];
  if (table === "carry-over") {
    return { fields: [...whoFields, "lag_weeks", ...band("weight")], rows: view.carryOver.lags.map((l) => [...who, l.lag, l.q05, l.q25, l.q50, l.q75, l.q95]) };
  }
  if (table === "contribution") {
    const { contribution: x } = view;
    return {
      fields: [...whoFields, "week", "spend", "observed_outcome", "fitted", ...band("contribution"), ...band("baseline")],
      rows: x.weeks.map((week, t) => [
        ...who,
        week,
        x.spend[t]!,
        x.observed[t]!,
        x.fitted[t]!,
        x.contribution.q05[t]!,
        x.contribution.q25[t]!,
        x.contribution.q50[t]!,
        x.contribution.q75[t]!,
        x.contribution.q95[t]!,
        x.baseline.q05[t]!,
        x.baseline.q25[t]!,
        x.baseline.q50[t]!,
        x.baseline.q75[t]!,
        x.baseline.q95[t]!,
      ]),
    };
  }
  if (table === "profit-draws") {
    return { fields: [...whoFields, "draw", "average_cac"], rows: view.profit.draws.map((v, k) => [...who, k + 1, v]) };
  }
  return {
    fields: [...whoFields, "weekly_spend", "is_current_spend", ...band("weekly_customers"), "marginal_cac_q05", "marginal_cac_median", "marginal_cac_q95"],
    rows: view.responseCurve.points.map((p) => [
      ...who,
      p.weeklySpend,
      p.weeklySpend === view.responseCurve.currentWeeklySpend,
      p.response.q05,
      p.response.q25,
      p.response.q50,
      p.response.q75,
      p.response.q95,
      p.marginalCac.q05,
      p.marginalCac.q50,
      p.marginalCac.q95,
    ]),
  };
}

export const poolingReviewTables = ["estimates", "pooling-factors", "outliers"] as const;

export function poolingReviewTable(view: PoolingReview, table: (typeof poolingReviewTables)[number]): CsvTable {
  const channelName = channelNamer(view.channels);
  if (table === "pooling-factors") {
    return { fields: ["level", "channel", "pooling_factor", "run_id"], rows: view.poolingFactors.map((p) => [p.level, channelName(p.channel), p.poolingFactor, view.run.id]) };
  }
  if (table === "outliers") {
    return { fields: ["brand", "market", "channel", "reason", "run_id"], rows: view.outliers.map((o) => [o.brand, o.market, o.channelName || o.channel, o.reason, view.run.id]) };
  }
  return {
    fields: ["brand", "market", "channel", "has_spend", ...intervalFields("pooled_cac"), ...intervalFields("unpooled_cac"), ...intervalFields("group_cac"), "shrinkage", "shrinkage_mark", "outlier", "outlier_reason", "flags", ...runFields],
    rows: view.rows.map((r) => [
      r.brand,
      r.market,
      channelName(r.channel),
      r.hasSpend,
      ...intervalValues(r.pooled),
      ...intervalValues(r.unpooled),
      ...intervalValues(r.group),
      r.pooling.shrinkage,
      r.pooling.shrinkageMark,
      r.outlier,
      r.outlierReason,
      flagText(view.flags, r.flagIds),
      ...runValues(view.run),
    ]),
  };
}

export function flagsTable(flags: readonly Flag[]): CsvTable {
  return {
    fields: ["brand", "market", "channel", "kind", "note", "flagged_by", "flagged_at", "active", "cleared_by", "cleared_at", "run_id"],
    rows: flags.map((f) => [f.brand, f.market, f.channelName || f.channel, flagKindLabels[f.kind], f.note, f.createdBy?.name ?? null, f.createdAt, f.active, f.clearedBy?.name ?? null, f.clearedAt, f.runId]),
  };
}
