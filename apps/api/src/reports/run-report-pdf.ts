// The PDF report of the current published run for one brand or one market: a headline
// table of the cost per new customer per cell × channel (median and 90 % interval), an
// intervals chart drawn with vector shapes, pooling notes (shrinkage, outliers, flags),
// the trust mark with the publish reason, and the cautions. The numbers come through
// runResultsFor with the request's scope, so a market manager's report holds their
// markets' cells only.
import PDFDocument from "pdfkit";
import { flagKindLabels, modelCaution, type CellChannelResultView, type Flag, type RunResults } from "@tributary/contracts";

export interface RunReportInput {
  readonly title: string;
  /** "Brand Kestrova" or "Market Veltria": what the report covers. */
  readonly subject: string;
  readonly company: string;
  readonly results: RunResults;
  readonly flags: readonly Flag[];
  /** A channel's display name from its code: the report is read by people. */
  readonly channelName: (code: string) => string;
  readonly generatedAt: Date;
  /** Compress content streams (default true; tests may read them plain). */
  readonly compress?: boolean;
}

const PAGE = { width: 595.28, height: 841.89, margin: 48 };
const INK = "#1d2a33";
const MUTED = "#5b6b76";
const RULE = "#d9dee3";
const ACCENT = "#1f6f78";
const WARN = "#a4461b";

function money(x: number, currency: string): string {
  if (!Number.isFinite(x)) return "—";
  const digits = Math.abs(x) >= 100 ? 0 : Math.abs(x) >= 10 ? 1 : 2;
  return `${x.toLocaleString("en-GB", { minimumFractionDigits: digits, maximumFractionDigits: digits })}${currency ? ` ${currency}` : ""}`;
}

const percent = (x: number | null) => (x === null ? "—" : `${Math.round(x * 100)} %`);

type ReportRow = CellChannelResultView & { readonly channelName: string };

/** Sorted rows of the report: by market, brand, channel name. */
function rowsOf(results: RunResults, channelName: (code: string) => string): ReportRow[] {
  return results.cells
    .filter((cell) => cell.hasSpend)
    .map((cell) => ({ ...cell, channelName: channelName(cell.channel) }))
    .sort((a, b) => a.market.localeCompare(b.market) || a.brand.localeCompare(b.brand) || a.channelName.localeCompare(b.channelName));
}

/** Log-scale ticks (1, 2, 5 × 10^k) covering [lo, hi]. */
function logTicks(lo: number, hi: number): number[] {
  const ticks: number[] = [];
  for (let k = Math.floor(Math.log10(lo)) - 1; k <= Math.ceil(Math.log10(hi)); k++) {
    for (const m of [1, 2, 5]) {
      const v = m * 10 ** k;
      if (v >= lo && v <= hi) ticks.push(v);
    }
  }
  return ticks;
}

/** Renders the report; resolves with the PDF bytes. */
export function renderRunReport(input: RunReportInput): Promise<Buffer> {
  const doc = new PDFDocument({
    size: "A4",
    margin: PAGE.margin,
    compress: input.compress ?? true,
    info: { Title: input.title, Author: "Tributary", Subject: input.subject, CreationDate: input.generatedAt },
  });
  const chunks: Buffer[] = [];
  doc.on("data", (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });

  const { results } = input;
  const run = results.run;
  const currency = results.currency;
  const rows = rowsOf(results, input.channelName);
  const left = PAGE.margin;
  const width = PAGE.width - 2 * PAGE.margin;
  const bottom = PAGE.height - PAGE.margin;

  const ensure = (space: number) => {
    if (doc.y + space > bottom) doc.addPage();
  };
  const heading = (text: string) => {
    ensure(40);
    doc.moveDown(0.8).font("Helvetica-Bold").fontSize(13).fillColor(INK).text(text, left, doc.y, { width });
    doc.moveDown(0.3);
  };
  const paragraph = (text: string, color = INK) => {
    doc.font("Helvetica").fontSize(9.5).fillColor(color).text(text, left, doc.y, { width });
    doc.moveDown(0.4);
  };

  // ── title and trust mark ──
  doc.font("Helvetica-Bold").fontSize(18).fillColor(INK).text(input.title, left, PAGE.margin, { width });
  doc.font("Helvetica").fontSize(10).fillColor(MUTED).text(`${input.company} · ${input.subject}`, { width });
  const published = run.publication ? new Date(run.publication.at).toISOString().slice(0, 10) : "not published";
  doc.text(`Fit ${run.id.slice(0, 8)} on dataset version ${run.datasetVersionNumber}, published ${published}${run.publication?.by ? ` by ${run.publication.by.name}` : ""}. Report made ${input.generatedAt.toISOString().slice(0, 16).replace("T", " ")} UTC.`, { width });
  doc.moveDown(0.6);

  const trusted = run.trust.trustworthy === true;
  const markTop = doc.y;
  doc.roundedRect(left, markTop, width, 14, 3).fill(trusted ? "#e4f1ee" : "#f8e9e1");
  doc.font("Helvetica-Bold").fontSize(9.5).fillColor(trusted ? ACCENT : WARN).text(
    trusted ? "Trust mark: this fit passed the convergence checks (R-hat, effective sample size, divergences)." : "Trust mark: this fit did not pass every convergence check; treat its numbers with extra care.",
    left + 6,
    markTop + 3,
    { width: width - 12 },
  );
  doc.y = markTop + 20;
  for (const reason of run.trust.reasons) paragraph(`• ${reason}`, WARN);
  if (run.publication?.reason) paragraph(`Why it was published: ${run.publication.reason}`);

  // ── headline table ──
  heading("Cost per new customer at low spend");
  paragraph(`Median and 90 % credible interval per brand × market cell and channel, in ${currency || "the reporting currency"}. Shrinkage is how far partial pooling moved the cell's own estimate toward its peers (0 % = not at all, 100 % = all the way).`, MUTED);
  const columns = [
    { label: "Brand", width: 78 },
    { label: "Market", width: 74 },
    { label: "Channel", width: 74 },
    { label: "Median", width: 62, right: true },
    { label: "90 % interval", width: 112, right: true },
    { label: "Shrinkage", width: 56, right: true },
    { label: "Note", width: width - 456 },
  ];
  const tableHeader = () => {
    let x = left;
    doc.font("Helvetica-Bold").fontSize(8.5).fillColor(MUTED);
    const y = doc.y;
    for (const col of columns) {
      doc.text(col.label, x, y, { width: col.width - 6, align: col.right ? "right" : "left", lineBreak: false });
      x += col.width;
    }
    doc.moveTo(left, y + 12).lineTo(left + width, y + 12).lineWidth(0.5).strokeColor(RULE).stroke();
    doc.y = y + 16;
  };
  if (rows.length === 0) paragraph("The current fit has no estimates here.", MUTED);
  else {
    tableHeader();
    for (const row of rows) {
      if (doc.y + 14 > bottom) {
        doc.addPage();
        tableHeader();
      }
      const note = [row.outlier ? "candidate outlier" : null, input.flags.some((f) => f.cellId === row.cellId && f.channel === row.channel) ? "flagged" : null].filter(Boolean).join(", ");
      const values = [row.brand, row.market, row.channelName, money(row.cac0.q50, ""), `${money(row.cac0.q05, "")} – ${money(row.cac0.q95, "")}`, percent(row.shrinkage), note];
      let x = left;
      const y = doc.y;
      doc.font("Helvetica").fontSize(8.5).fillColor(INK);
      columns.forEach((col, i) => {
        doc.text(values[i]!, x, y, { width: col.width - 6, align: col.right ? "right" : "left", lineBreak: false });
        x += col.width;
      });
      doc.y = y + 13;
    }
  }

  // ── intervals chart ──
  if (rows.length > 0) {
    doc.addPage();
    heading("Intervals: cost per new customer (log scale)");
    paragraph("Each line is the 90 % credible interval; the dot is the median. Wide lines are uncertain estimates; compare where the lines overlap before preferring one channel to another.", MUTED);
    const lo = Math.min(...rows.map((r) => r.cac0.q05).filter((v) => v > 0));
    const hi = Math.max(...rows.map((r) => r.cac0.q95));
    const axisLo = 10 ** Math.floor(Math.log10(lo));
    const axisHi = 10 ** Math.ceil(Math.log10(hi));
    const labelWidth = 170;
    const plotLeft = left + labelWidth;
    const plotWidth = width - labelWidth - 10;
    const xOf = (v: number) => plotLeft + ((Math.log10(Math.max(v, axisLo)) - Math.log10(axisLo)) / (Math.log10(axisHi) - Math.log10(axisLo))) * plotWidth;
    const ticks = logTicks(axisLo, axisHi);
    const rowHeight = 13;

    const drawAxis = (top: number, bottomY: number) => {
      doc.lineWidth(0.4).strokeColor(RULE);
      for (const tick of ticks) {
        doc.moveTo(xOf(tick), top).lineTo(xOf(tick), bottomY).stroke();
        doc.font("Helvetica").fontSize(7).fillColor(MUTED).text(money(tick, ""), xOf(tick) - 20, bottomY + 3, { width: 40, align: "center", lineBreak: false });
      }
      doc.font("Helvetica").fontSize(7.5).fillColor(MUTED).text(`cost per new customer (${currency || "reporting currency"})`, plotLeft, bottomY + 14, { width: plotWidth, align: "center", lineBreak: false });
    };

    let start = doc.y + 4;
    let top = start;
    let y = start;
    const pageRows = Math.floor((bottom - 40 - start) / rowHeight);
    let onPage = 0;
    for (const row of rows) {
      if (onPage >= pageRows) {
        drawAxis(top, y);
        doc.addPage();
        start = PAGE.margin;
        top = start;
        y = start;
        onPage = 0;
      }
      const mid = y + rowHeight / 2;
      doc.font("Helvetica").fontSize(8).fillColor(INK).text(`${row.brand} × ${row.market} · ${row.channelName}`, left, mid - 4, { width: labelWidth - 8, lineBreak: false, ellipsis: true });
      const color = row.outlier ? WARN : ACCENT;
      doc.lineWidth(2).strokeColor(color).moveTo(xOf(row.cac0.q05), mid).lineTo(xOf(row.cac0.q95), mid).stroke();
      doc.circle(xOf(row.cac0.q50), mid, 2.6).fill(color);
      if (row.cac0Unpooled) {
        // The cell's own (unpooled) median as a hollow mark: how far pooling moved it.
        doc.lineWidth(0.8).strokeColor(MUTED).circle(xOf(row.cac0Unpooled.q50), mid, 2.6).stroke();
      }
      y += rowHeight;
      onPage++;
    }
    drawAxis(top, y);
    doc.y = y + 30;
    doc.x = left;
    paragraph("Filled dot: pooled median. Hollow circle: the cell's own estimate without pooling, where the fit has that comparison. Orange: candidate outlier.", MUTED);
  }

  // ── pooling notes ──
  heading("Pooling notes");
  const pooled = rows.filter((r) => r.shrinkage !== null);
  if (pooled.length > 0) {
    const strongest = [...pooled].sort((a, b) => (b.shrinkage ?? 0) - (a.shrinkage ?? 0)).slice(0, 5);
    paragraph(`Cells with little or noisy data borrow strength from their peers. Most pulled toward the portfolio: ${strongest.map((r) => `${r.brand} × ${r.market}, ${r.channelName} (${percent(r.shrinkage)})`).join("; ")}.`);
  } else paragraph("This fit has no no-pooling comparison, so shrinkage is not shown.", MUTED);
  const outliers = rows.filter((r) => r.outlier);
  for (const r of outliers) paragraph(`Candidate outlier — ${r.brand} × ${r.market}, ${r.channelName}: ${r.outlierReason ?? "its own estimate differs from its peers more than pooling explains"}.`, WARN);
  if (outliers.length === 0) paragraph("No cell × channel was marked as a candidate outlier.", MUTED);
  for (const flag of input.flags) paragraph(`Flag (${flagKindLabels[flag.kind]}) — ${flag.brand} × ${flag.market}, ${flag.channelName}: ${flag.note}`);
  if (input.flags.length === 0) paragraph("No analyst flags on these cells.", MUTED);

  // ── cautions ──
  heading("Cautions");
  paragraph("These are model-based estimates: they depend on the data, the priors and the model's assumptions (carry-over, saturation, baseline), and they are not guarantees.");
  paragraph("Before moving a large budget, confirm the effect with a controlled experiment (a lift test) in the cell and channel concerned.");
  paragraph(modelCaution, MUTED);

  doc.end();
  return done;
}
