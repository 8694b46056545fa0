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
