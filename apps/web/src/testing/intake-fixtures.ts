// Invented uploads and reports for the Data intake tests.
import type { UploadCreated, ValidationReport } from "@tributary/contracts";

export const testUpload: UploadCreated = {
  uploadId: "up-1",
  fileName: "weekly-tallowmere.csv",
  bytes: 2048,
  expiresAt: "2030-01-01T00:00:00.000Z",
  header: ["week_start", "brand", "market", "new_customers", "spend_search", "spend_radio", "price_index", "comment"],
  rowCount: 208,
  previewRows: [
    ["2024-01-01", "Fennick", "Ardeval", "412", "1200", "300", "1.01", "launch"],
    ["2024-01-08", "Fennick", "Ardeval", "398", "1100", "0", "1.00", ""],
  ],
  guess: {
    week: "week_start",
    brand: "brand",
    market: "market",
    outcome: "new_customers",
    channels: [
      { column: "spend_search", channel: "search" },
      { column: "spend_radio", channel: "radio" },
    ],
    controls: ["price_index"],
    ignored: ["comment"],
    notes: [{ role: "ignored", message: "“comment” holds text, so it was left out." }],
  },
};

export const testReport: ValidationReport = {
  ok: false,
  errors: [
    { severity: "error", code: "negative_spend", row: 14, column: "spend_radio", message: "Spend cannot be negative (−300)." },
    { severity: "error", code: "negative_spend", row: 15, column: "spend_radio", message: "Spend cannot be negative (−120)." },
    { severity: "error", code: "duplicate_row", row: 40, column: null, message: "Week 2024-03-04 of Fennick in Ardeval appears twice (rows 39 and 40)." },
  ],
  warnings: [{ severity: "warning", code: "spike", row: 77, column: "new_customers", message: "This week is 6 times the cell's typical week." }],
  errorCount: 7,
  warningCount: 1,
  counts: [
    { severity: "error", code: "negative_spend", count: 6, shown: 2 },
    { severity: "error", code: "duplicate_row", count: 1, shown: 1 },
    { severity: "warning", code: "spike", count: 1, shown: 1 },
  ],
  summary: {
    rows: 208,
    cells: [{ brand: "Fennick", market: "Ardeval", firstWeek: "2024-01-01", lastWeek: "2025-12-22", weeks: 104, rows: 104 }],
    brands: ["Fennick"],
    markets: ["Ardeval"],
    channels: ["search", "radio"],
    controls: ["price_index"],
    firstWeek: "2024-01-01",
    lastWeek: "2025-12-22",
    totals: { outcome: 80_000, spend: [{ channel: "search", total: 120_000 }, { channel: "radio", total: 30_000 }] },
  },
};
