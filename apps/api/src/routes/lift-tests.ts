// Lift tests of a dataset version: entered as JSON or uploaded as a CSV, each checked
// against the version's data (the cell and channel exist, the weeks lie inside the
// cell's data, standard error > 0). A batch is stored whole or not at all.
import { and, asc, eq } from "drizzle-orm";
import { liftTestsCreateInput, type IntakeIssue, type LiftTestRecord, type LiftTestsCreated, type ValidationReport } from "@tributary/contracts";
import { nameKey, parseLiftTestsCsv, reportOf, validateLiftTest, type LiftTest } from "@tributary/intake";
import { inScope } from "../access/market-scope";
import { defineRoute, markets, signedIn, type MarketScope } from "../access/route-table";
import type { Queryable } from "../db/client";
import { datasetVersionExists, loadPortfolioData } from "../datasets/dataset-queries";
import { auditLog, brands, cells, channels, liftTests, markets as marketTable, users } from "../db/schema";
import { NotFound } from "../http/errors";
import { csvUpload, decodeUploadedBytes } from "../uploads/csv-upload";
import { invalidFromReport } from "../uploads/report-error";

const intakeRoles = ["analyst", "admin"] as const;

export async function listLiftTests(db: Queryable, versionId: string, scope: MarketScope, ids?: readonly string[]): Promise<LiftTestRecord[]> {
  const rows = await db
    .select({
      id: liftTests.id,
      datasetVersionId: liftTests.datasetVersionId,
      cellId: liftTests.cellId,
      marketId: cells.marketId,
      brand: brands.name,
      market: marketTable.name,
      channel: channels.code,
      firstWeek: liftTests.firstWeek,
      lastWeek: liftTests.lastWeek,
      spend: liftTests.spend,
      incrementalOutcome: liftTests.measuredLift,
      standardError: liftTests.standardError,
      note: liftTests.note,
      createdAt: liftTests.createdAt,
      createdById: liftTests.createdBy,
      createdByName: users.name,
    })
    .from(liftTests)
    .innerJoin(cells, eq(cells.id, liftTests.cellId))
    .innerJoin(brands, eq(brands.id, cells.brandId))
    .innerJoin(marketTable, eq(marketTable.id, cells.marketId))
    .innerJoin(channels, eq(channels.id, liftTests.channelId))
    .leftJoin(users, eq(users.id, liftTests.createdBy))
    .where(and(eq(liftTests.datasetVersionId, versionId), inScope(cells.marketId, scope)))
    .orderBy(asc(brands.name), asc(marketTable.name), asc(channels.position), asc(liftTests.firstWeek));
  const wanted = ids ? new Set(ids) : null;
  return rows
    .filter((row) => wanted === null || wanted.has(row.id))
    .map(({ createdById, createdByName, note, createdAt, ...row }) => ({
      ...row,
      ...(note === null ? {} : { note }),
      createdAt: createdAt.toISOString(),
      createdBy: createdById && createdByName ? { id: createdById, name: createdByName } : null,
    }));
}

/** All tests of a JSON body: one test, or `{ tests: [...] }`. */
function testsOfBody(body: unknown): unknown[] {
  const parsed = liftTestsCreateInput.parse(body ?? {});
  return "tests" in parsed && Array.isArray(parsed.tests) ? parsed.tests : [parsed];
}

function mergeReports(reports: readonly ValidationReport[], label: (k: number) => string | null): ValidationReport {
  const issues: IntakeIssue[] = [];
  reports.forEach((report, k) => {
    const prefix = label(k);
    for (const issue of [...report.errors, ...report.warnings]) issues.push(prefix ? { ...issue, message: `${prefix}: ${issue.message}` } : issue);
  });
  return reportOf(issues, null);
}

export const liftTestRoutes = [
  defineRoute({
    method: "get",
    path: "/api/datasets/:datasetId/lift-tests",
    access: signedIn(markets.filtered),
    handler: async ({ req, db, scope }): Promise<LiftTestRecord[]> => {
      const versionId = String(req.params.datasetId);
      if (!(await datasetVersionExists(db, versionId))) throw new NotFound("No such dataset version");
      return listLiftTests(db, versionId, scope);
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/datasets/:datasetId/lift-tests",
    access: signedIn(markets.unscoped, intakeRoles),
    // A CSV arrives as multipart (field "file"); JSON bodies pass through untouched.
    before: ({ config }) => [csvUpload(config.uploadMaxBytes)],
    handler: async ({ req, res, db, user, scope, config }): Promise<LiftTestsCreated> => {
      const versionId = String(req.params.datasetId);
      if (!(await datasetVersionExists(db, versionId))) throw new NotFound("No such dataset version");
      const stored = await loadPortfolioData(db, versionId);
      const { data } = stored;

      let tests: readonly LiftTest[];
      let report: ValidationReport;
      let source: "csv" | "json";
      if (req.file) {
        source = "csv";
        const text = decodeUploadedBytes(req.file.buffer);
        const parsed = parseLiftTestsCsv(text, data, { maxBytes: config.uploadMaxBytes });
        if (!parsed.ok) throw invalidFromReport("The lift tests were not saved", parsed.report);
        tests = parsed.tests;
        report = parsed.report;
      } else {
        source = "json";
        const inputs = testsOfBody(req.body);
        const results = inputs.map((input) => validateLiftTest(input, data));
        report = mergeReports(
          results.map((r) => r.report),
          (k) => (inputs.length > 1 ? `Lift test ${k + 1}` : null),
        );
        if (!report.ok) throw invalidFromReport("The lift tests were not saved", report);
        tests = results.map((r) => (r.ok ? r.test : null)).filter((t): t is LiftTest => t !== null);
      }

      const cellIdOf = (test: LiftTest) => {
        const g = data.cells.findIndex((cell) => nameKey(cell.brand) === nameKey(test.brand) && nameKey(cell.market) === nameKey(test.market));
        return stored.cells[g]!.cellId;
      };
      const channelRows = await db.select({ id: channels.id, code: channels.code }).from(channels);
      const channelId = new Map(channelRows.map((c) => [c.code, c.id] as const));

      const existing = await db
        .select({ cellId: liftTests.cellId, channelId: liftTests.channelId, firstWeek: liftTests.firstWeek, lastWeek: liftTests.lastWeek })
        .from(liftTests)
        .where(eq(liftTests.datasetVersionId, versionId));
      const keyOf = (t: { cellId: string; channelId: string; firstWeek: string; lastWeek: string }) => [t.cellId, t.channelId, t.firstWeek, t.lastWeek].join("|");
      const taken = new Set(existing.map(keyOf));
      const values = tests.map((test) => ({
        datasetVersionId: versionId,
        cellId: cellIdOf(test),
        channelId: channelId.get(test.channel)!,
        firstWeek: test.firstWeek,
        lastWeek: test.lastWeek,
        spend: test.spend,
        measuredLift: test.incrementalOutcome,
        standardError: test.standardError,
        note: test.note ?? null,
        createdBy: user.id,
      }));
      const repeats: IntakeIssue[] = values.flatMap((value, k) =>
        taken.has(keyOf(value))
          ? [{
              severity: "error" as const,
              code: "duplicate_row" as const,
              row: null,
              column: null,
              message: `The lift test of ${tests[k]!.brand} × ${tests[k]!.market} on ${tests[k]!.channel} from ${tests[k]!.firstWeek} to ${tests[k]!.lastWeek} is already stored for this dataset version.`,
            }]
          : [],
      );
      if (repeats.length > 0) throw invalidFromReport("The lift tests were not saved", reportOf(repeats, null));

      const created = await db.transaction(async (tx) => {
        const rows = await tx.insert(liftTests).values(values).returning({ id: liftTests.id });
        await tx.insert(auditLog).values({
          userId: user.id,
          action: "lift_tests_added",
          target: `dataset_version:${versionId}`,
          details: { count: rows.length, source, ids: rows.map((r) => r.id) },
        });
        return rows.map((r) => r.id);
      });
      res.status(201);
      return { created: await listLiftTests(db, versionId, scope, created), report };
    },
  }),
  defineRoute({
    method: "delete",
    path: "/api/datasets/:datasetId/lift-tests/:liftTestId",
    access: signedIn(markets.unscoped, intakeRoles),
    handler: async ({ req, db, user }) => {
      const versionId = String(req.params.datasetId);
      const id = String(req.params.liftTestId);
      await db.transaction(async (tx) => {
        const removed = await tx
          .delete(liftTests)
          .where(and(eq(liftTests.id, id), eq(liftTests.datasetVersionId, versionId)))
          .returning({ id: liftTests.id });
        if (removed.length === 0) throw new NotFound("No such lift test in this dataset version");
        await tx.insert(auditLog).values({ userId: user.id, action: "lift_test_deleted", target: `lift_test:${id}`, details: { datasetVersionId: versionId } });
      });
      return undefined;
    },
  }),
];
