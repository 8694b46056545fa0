import { useId, useState } from "react";
import { Button } from "../../../components/ui/button";
import { inputClass } from "../../../components/ui/field";
import { useDownloadRunReport, type RunReportSubject } from "../api/download-run-report";

type Named = { id: string; name: string };

/** Hands a downloaded file to the browser. */
function saveFile(fileName: string, blob: Blob): void {
  const url = URL.createObjectURL(blob);
  const link = document.createElement("a");
  link.href = url;
  link.download = fileName;
  link.rel = "noopener";
  document.body.append(link);
  link.click();
  link.remove();
  // Some browsers read the blob after the click returns.
  setTimeout(() => URL.revokeObjectURL(url), 1_000);
}

/**
 * The current fit's PDF report for one brand or one market. Shown on the Budget split
 * and reusable on any screen (pass the brands and markets the viewer may see).
 */
export function ReportDownloads({ brands, markets, title = "Reports" }: { brands: readonly Named[]; markets: readonly Named[]; title?: string }) {
  const id = useId();
  const first = brands[0] ? `brand:${brands[0].id}` : markets[0] ? `market:${markets[0].id}` : "";
  const [choice, setChoice] = useState(first);
  const download = useDownloadRunReport();
  const [done, setDone] = useState<string | null>(null);
  const subjectOf = (value: string): RunReportSubject | null => {
    const [kind, ...rest] = value.split(":");
    const key = rest.join(":");
    if (!key) return null;
    return kind === "brand" ? { brand: key } : { market: key };
  };
  const name = (value: string) => [...brands, ...markets].find((x) => value.endsWith(`:${x.id}`))?.name ?? "";
  const start = () => {
    const subject = subjectOf(choice);
    if (!subject) return;
    setDone(null);
    download.mutate(subject, {
      onSuccess: ({ blob, fileName }) => {
        saveFile(fileName, blob);
        setDone(`Downloaded ${fileName}.`);
      },
    });
  };
  if (brands.length === 0 && markets.length === 0) return null;
  return (
    <section aria-labelledby={`${id}-title`} className="rounded-lg border border-line bg-surface p-4 shadow-card">
      <h2 id={`${id}-title`} className="text-body font-semibold text-ink-900">
        {title}
      </h2>
      <p className="mt-1 text-small text-ink-700">The current fit's cost per customer, intervals and cautions as a PDF, for one brand or one market.</p>
      <div className="mt-3 flex flex-wrap items-end gap-3">
        <div>
          <label htmlFor={`${id}-subject`} className="block text-small font-medium text-ink-800">
            Report for
          </label>
          <select id={`${id}-subject`} className={`${inputClass} mt-1 w-64`} value={choice} onChange={(event) => setChoice(event.target.value)}>
            {brands.length > 0 ? (
              <optgroup label="Brands">
                {brands.map((brand) => (
                  <option key={brand.id} value={`brand:${brand.id}`}>
                    Brand {brand.name}
                  </option>
                ))}
              </optgroup>
            ) : null}
            {markets.length > 0 ? (
              <optgroup label="Markets">
                {markets.map((market) => (
                  <option key={market.id} value={`market:${market.id}`}>
                    Market {market.name}
                  </option>
                ))}
              </optgroup>
            ) : null}
          </select>
        </div>
        <Button variant="secondary" onClick={start} disabled={download.isPending || choice === ""}>
          {download.isPending ? "Preparing the PDF…" : `Download PDF${choice ? ` for ${name(choice)}` : ""}`}
        </Button>
      </div>
      {download.isError ? (
        <p role="alert" className="mt-2 text-small font-medium text-alert-700">
          The report could not be made: {download.error.message}
        </p>
      ) : null}
      {done ? (
        <p role="status" className="mt-2 text-small text-ok-700">
          {done}
        </p>
      ) : null}
    </section>
  );
}
