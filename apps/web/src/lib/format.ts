const weekFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });

/** An ISO week date (the week's Monday, "2024-03-04") as "4 Mar 2024". */
export function formatWeek(isoDate: string): string {
  const date = new Date(`${isoDate.slice(0, 10)}T00:00:00Z`);
  return Number.isNaN(date.getTime()) ? isoDate : weekFormat.format(date);
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
