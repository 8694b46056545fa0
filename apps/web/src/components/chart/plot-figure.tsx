// A chart drawn by Observable Plot inside a <figure>: a visible caption that says what it
// shows, and the same numbers in a table that screen readers can read.
import { useEffect, useId, useRef, useState, type ReactNode } from "react";

export type ChartTable = {
  caption: string;
  columns: string[];
  rows: (string | number | null)[][];
};

type PlotFigureProps = {
  /** Short name of the chart, shown above it. */
  title: string;
  /** What the chart shows, in words: axes, units, what the bands mean. */
  caption: ReactNode;
  /** Draws the chart for the width available; called again when the width changes. */
  render: (width: number) => Element;
  /** The numbers behind the chart, for people who cannot see it. */
  table: ChartTable;
  /** A key of our own, shown between the title and the chart. */
  legend?: ReactNode;
  /** Extra things under the caption (notes). */
  children?: ReactNode;
};

const FALLBACK_WIDTH = 800;

const adoptedPlotStyles = new Set<string>();

/**
 * Plot writes its default rules into <style> elements, which the app's strict
 * Content-Security-Policy (style-src 'self') refuses once they reach the page. The same
 * rules are adopted through the CSSOM instead (once per distinct text), before the chart
 * is inserted. Without constructable style sheets (test DOMs) the elements stay.
 */
function adoptPlotStyles(chart: Element): void {
  const doc = chart.ownerDocument;
  if (typeof CSSStyleSheet === "undefined" || typeof CSSStyleSheet.prototype.replaceSync !== "function" || !("adoptedStyleSheets" in doc)) return;
  for (const style of chart.querySelectorAll("style")) {
    const text = style.textContent ?? "";
    style.remove();
    if (adoptedPlotStyles.has(text)) continue;
    const sheet = new CSSStyleSheet();
    sheet.replaceSync(text);
    doc.adoptedStyleSheets = [...doc.adoptedStyleSheets, sheet];
    adoptedPlotStyles.add(text);
  }
}

export function PlotFigure({ title, caption, render, table, legend, children }: PlotFigureProps) {
  const holder = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState<number | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const titleId = useId();

  useEffect(() => {
    const element = holder.current;
    if (!element) return;
    const measure = () => setWidth(Math.max(320, Math.floor(element.clientWidth || FALLBACK_WIDTH)));
    measure();
    if (typeof ResizeObserver === "undefined") return;
    const observer = new ResizeObserver(measure);
    observer.observe(element);
    return () => observer.disconnect();
  }, []);

  useEffect(() => {
    const element = holder.current;
    if (!element || width === null) return;
    try {
      const chart = render(width);
      chart.setAttribute("aria-hidden", "true");
      adoptPlotStyles(chart);
      element.replaceChildren(chart);
      setFailure(null);
    } catch (error) {
      element.replaceChildren();
      setFailure(error instanceof Error ? error.message : String(error));
    }
  }, [render, width]);

  return (
    <figure aria-labelledby={titleId} className="min-w-0">
      <h3 id={titleId} className="text-body font-semibold text-ink-900">
        {title}
      </h3>
      {legend ? <div className="mt-2">{legend}</div> : null}
      <div ref={holder} className="plot-holder mt-2 w-full overflow-hidden" />
      {failure ? (
        <p role="alert" className="text-small text-alert-700">
          This chart could not be drawn ({failure}). The numbers are in the table below it for screen readers and in the export.
        </p>
      ) : null}
      <figcaption className="mt-2 text-small text-ink-700">{caption}</figcaption>
      {children}
      {/* A table ignores overflow and height, so the hiding is done by a wrapper. */}
      <div className="sr-only">
        <table>
          <caption>{table.caption}</caption>
          <thead>
            <tr>
              {table.columns.map((column) => (
                <th key={column} scope="col">
                  {column}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {table.rows.map((row, i) => (
              <tr key={i}>
                {row.map((value, j) => (
                  <td key={j}>{value ?? "no value"}</td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </figure>
  );
}
