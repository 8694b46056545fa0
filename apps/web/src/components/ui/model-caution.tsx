/** Shown wherever allocations or profitability are shown. */
export function ModelCaution() {
  return (
    <aside
      aria-label="Caution about estimates"
      className="rounded-md border border-silt-500/40 bg-silt-100 px-4 py-3 text-small text-ink-900"
    >
      <strong className="font-semibold">Estimates, not guarantees.</strong> Figures here come from a model and depend on
      the data and the priors behind it. Before moving a large budget, confirm the estimate with a controlled experiment
      (a lift test).
    </aside>
  );
}
