const compact = new Intl.NumberFormat("en-GB", { notation: "compact", maximumFractionDigits: 1 });

/** Axis ticks in a short, readable form: 0, 500, 1.5K, 20K, 1.2M. */
export function compactNumber(value: number): string {
  return compact.format(value).replace("-", "−");
}
