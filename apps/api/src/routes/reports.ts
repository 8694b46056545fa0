// GET /api/reports/run.pdf?brand=<brandId> or ?market=<marketId>: the PDF report of the
// current run. The market in the query is checked by the route table (a market manager
// may ask only for their own); a brand report covers the brand's cells in the viewer's
// markets. Every number comes through runResultsFor with the request's scope.
import { eq } from "drizzle-orm";
import { runReportQuery } from "@tributary/contracts";
import { defineRoute, markets as marketRules, signedIn } from "../access/route-table";
import { brands, markets, workspaceSettings } from "../db/schema";
import { listFlags } from "../dashboards/flags";
import { NotFound } from "../http/errors";
import { channelNames } from "../queries/channel-names";
import { renderRunReport } from "../reports/run-report-pdf";
import { currentRunId, runRecord } from "../runs/run-queries";
import { runResultsFor } from "../runs/run-results";

const fileSafe = (text: string) => text.replace(/[^A-Za-z0-9_-]+/g, "-").replace(/^-+|-+$/g, "").toLowerCase() || "report";

export const reportRoutes = [
  defineRoute({
    method: "get",
    path: "/api/reports/run.pdf",
    access: signedIn(marketRules.fromQuery("market")),
    handler: async ({ req, res, db, scope, runs: service }) => {
      const query = runReportQuery.parse(req.query);
      const runId = await currentRunId(db);
      if (!runId) throw new NotFound("No fit has been published yet");
      const all = await runResultsFor(db, await runRecord(db, runId, service.live), scope);
      let subject: string;
      let cells = all.cells;
      if (query.brand !== undefined) {
        const [brand] = await db.select().from(brands).where(eq(brands.id, query.brand));
        if (!brand) throw new NotFound("No such brand");
        cells = cells.filter((cell) => cell.brandId === brand.id);
        if (cells.length === 0) throw new NotFound(`The current fit has no estimates for ${brand.name} in your markets`);
        subject = `Brand ${brand.name}`;
      } else {
        const [market] = await db.select().from(markets).where(eq(markets.id, query.market!));
        if (!market) throw new NotFound("No such market");
        cells = cells.filter((cell) => cell.marketId === market.id);
        subject = `Market ${market.name}`;
      }
      const cellIds = [...new Set(cells.map((cell) => cell.cellId))];
      const flags = await listFlags(db, scope, { cellIds });
      const [settings] = await db.select({ company: workspaceSettings.companyName }).from(workspaceSettings).limit(1);
      const now = new Date();
      const pdf = await renderRunReport({
        title: `Fit report — ${subject}`,
        subject,
        company: settings?.company ?? "",
        results: { ...all, cells },
        flags,
        channelName: await channelNames(db),
        generatedAt: now,
      });
      res.status(200);
      res.setHeader("Content-Type", "application/pdf");
      res.setHeader("Content-Disposition", `attachment; filename="tributary-${fileSafe(subject)}-${now.toISOString().slice(0, 10)}.pdf"`);
      res.setHeader("Cache-Control", "private, no-store");
      res.end(pdf);
    },
  }),
];
