import type { Market } from "@tributary/contracts";

type MarketChoiceProps = {
  idPrefix: string;
  markets: readonly Market[];
  value: readonly string[];
  onChange: (marketIds: string[]) => void;
  error?: string;
  legend?: string;
};

/** Markets a market manager looks after, as a group of checkboxes. */
export function MarketChoice({ idPrefix, markets, value, onChange, error, legend = "Markets" }: MarketChoiceProps) {
  return (
    <fieldset aria-describedby={error ? `${idPrefix}-error` : undefined}>
      <legend className="text-small font-medium text-ink-800">{legend}</legend>
      {markets.length === 0 ? <p className="mt-1 text-small text-ink-700">The workspace has no markets yet.</p> : null}
      <div className="mt-1 flex flex-wrap gap-x-5 gap-y-1">
        {markets.map((market) => (
          <label key={market.id} className="flex items-center gap-2 text-small text-ink-800">
            <input
              type="checkbox"
              checked={value.includes(market.id)}
              onChange={(event) => onChange(event.target.checked ? [...value, market.id] : value.filter((id) => id !== market.id))}
            />
            {market.name}
          </label>
        ))}
      </div>
      {error ? (
        <p id={`${idPrefix}-error`} className="mt-1 text-caption font-medium text-alert-700">
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}
