import { Button } from "../ui/button";

export type PickableCell = { cellId: string; brand: string; market: string };

type CellPickerProps = {
  cells: readonly PickableCell[];
  selected: readonly string[];
  onSelect: (cellIds: string[]) => void;
  legend?: string;
};

/** Brand × market cells to choose from, grouped by market, with a "choose all" per market. Keeps the cells' own order. */
export function CellPicker({ cells, selected, onSelect, legend = "Cells (brand in market)" }: CellPickerProps) {
  const markets = [...new Set(cells.map((cell) => cell.market))].sort((a, b) => a.localeCompare(b));
  // The chosen ids in the order of `cells`, so that plans name their cells in a stable order.
  const ordered = (ids: Set<string>) => cells.filter((cell) => ids.has(cell.cellId)).map((cell) => cell.cellId);
  const toggle = (cellId: string, on: boolean) => {
    const ids = new Set(selected);
    if (on) ids.add(cellId);
    else ids.delete(cellId);
    onSelect(ordered(ids));
  };
  return (
    <fieldset>
      <legend className="text-small font-medium text-ink-800">{legend}</legend>
      <div className="mt-2 grid gap-3 sm:grid-cols-2 xl:grid-cols-3">
        {markets.map((market) => {
          const inMarket = cells.filter((cell) => cell.market === market);
          const all = inMarket.every((cell) => selected.includes(cell.cellId));
          const setMarket = () => {
            const ids = new Set(selected);
            for (const cell of inMarket) {
              if (all) ids.delete(cell.cellId);
              else ids.add(cell.cellId);
            }
            onSelect(ordered(ids));
          };
          return (
            <div key={market} className="rounded-md border border-line p-3">
              <div className="flex items-center justify-between gap-2">
                <span className="text-small font-semibold text-ink-900">{market}</span>
                <Button variant="quiet" className="px-1.5! py-0.5! text-caption!" onClick={setMarket} aria-label={all ? `Clear every cell of ${market}` : `Choose every cell of ${market}`}>
                  {all ? "Clear" : "All"}
                </Button>
              </div>
              <ul className="mt-1 space-y-1">
                {inMarket.map((cell) => (
                  <li key={cell.cellId}>
                    <label className="flex items-center gap-2 text-small text-ink-800">
                      <input type="checkbox" checked={selected.includes(cell.cellId)} onChange={(event) => toggle(cell.cellId, event.target.checked)} />
                      {cell.brand} in {cell.market}
                    </label>
                  </li>
                ))}
              </ul>
            </div>
          );
        })}
      </div>
      {selected.length === 0 ? <p className="mt-2 text-caption font-medium text-alert-700">Choose at least one cell.</p> : null}
    </fieldset>
  );
}
