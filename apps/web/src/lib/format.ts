// Fixed three-letter months: the same text in every browser and locale build.
const months = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

/** An ISO week date (the week's Monday, "2024-03-04") as "4 Mar 2024". */
export function formatWeek(isoDate: string): string {
  const date = new Date(`${isoDate.slice(0, 10)}T00:00:00Z`);
  if (Number.isNaN(date.getTime())) return isoDate;
  return `${date.getUTCDate()} ${months[date.getUTCMonth()]} ${date.getUTCFullYear()}`;
}

export function formatWeekRange(firstWeek: string | null, lastWeek: string | null): string | null {
  if (!firstWeek || !lastWeek) return null;
  return `${formatWeek(firstWeek)} – ${formatWeek(lastWeek)}`;
}

export function formatWeeks(weeks: number): string {
  return `${weeks} ${weeks === 1 ? "week" : "weeks"}`;
}

export function formatMoney(amount: number, currency: string): string {
  try {
    return new Intl.NumberFormat("en-GB", { style: "currency", currency, maximumFractionDigits: 0 }).format(amount);
  } catch {
    return `${amount.toLocaleString("en-GB")} ${currency}`;
  }
}

/** An ISO timestamp as "4 Mar 2024, 14:05" in the browser's time zone. */
export function formatDateTime(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  const hours = String(date.getHours()).padStart(2, "0");
  const minutes = String(date.getMinutes()).padStart(2, "0");
  return `${date.getDate()} ${months[date.getMonth()]} ${date.getFullYear()}, ${hours}:${minutes}`;
}

/** A length of time in seconds as "45 s", "12 min 5 s" or "2 h 3 min". */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) return "–";
  const total = Math.round(seconds);
  if (total < 60) return `${total} s`;
  const minutes = Math.floor(total / 60);
  if (minutes < 60) return `${minutes} min ${total % 60} s`;
  return `${Math.floor(minutes / 60)} h ${minutes % 60} min`;
}

/** A number with at most `digits` significant digits and thin grouping: 1234.5 → "1,235", 0.01234 → "0.0123". */
export function formatNumber(value: number | null, digits = 3): string {
  if (value === null) return "–";
  if (!Number.isFinite(value)) return value > 0 ? "∞" : value < 0 ? "−∞" : "–";
  const abs = Math.abs(value);
  const text =
    abs >= 10 ** digits ? Math.round(value).toLocaleString("en-GB") : Number(value.toPrecision(digits)).toLocaleString("en-GB", { maximumFractionDigits: 10 });
  // A true minus sign, not a hyphen.
  return text.replace("-", "−");
}

/**
 * A cost per new customer in the reporting currency with 3 significant digits:
 * 48.26 → "€48.3", 1234 → "€1,230", 0.5 → "€0.5". Infinite costs read "∞".
 */
export function formatCac(amount: number | null, currency: string): string {
  if (amount === null || Number.isNaN(amount)) return "–";
  if (!Number.isFinite(amount)) return amount > 0 ? "∞" : "–";
  try {
    return new Intl.NumberFormat("en-GB", { style: "currency", currency, maximumSignificantDigits: 3 }).format(amount);
  } catch {
    return `${formatNumber(amount, 3)} ${currency}`;
  }
}

/** A median and its 90 % interval: "€48.3 (€31–€77.4)". */
export function formatCacInterval(median: number | null, low: number | null, high: number | null, currency: string): string {
  return `${formatCac(median, currency)} (${formatCac(low, currency)}–${formatCac(high, currency)})`;
}

/**
 * A chance 0–1 as a whole percentage: 0.734 → "73 %". Finitely many draws cannot show
 * a certainty, so the ends read "< 1 %" and "> 99 %" rather than 0 % and 100 %.
 */
export function formatChance(share: number | null): string {
  if (share === null || !Number.isFinite(share)) return "–";
  if (share < 0.01) return "< 1 %";
  if (share > 0.99) return "> 99 %";
  return `${Math.round(share * 100)} %`;
}
