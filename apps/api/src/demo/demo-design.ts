// The demo portfolio: an invented household-goods group, its brands, markets and
// channels, and the design its weekly data is simulated from. Every name is invented.
import type { ChannelTruth, SimulationDesign } from "@tributary/stats";
import { absoluteWeekOf, mondayOfAbsoluteWeek } from "@tributary/stats";

export const demoSeed = 20_250_929;

export const demoWorkspace = { companyName: "Quillfern Household Group", currency: "EUR" } as const;

export const demoBrands = [
  { code: "kestrova", name: "Kestrova", customerValue: 140 },
  { code: "plumrise", name: "Plumrise", customerValue: 95 },
  { code: "sundrift", name: "Sundrift", customerValue: 180 },
] as const;

export const demoMarkets = [
  { code: "veltria", name: "Veltria" },
  { code: "solvera", name: "Solvera" },
  { code: "kessland", name: "Kessland" },
  { code: "marendi", name: "Marendi" },
  { code: "tallowmere", name: "Tallowmere" },
  { code: "lunesse", name: "Lunesse" },
] as const;

export const demoChannels = [
  { code: "search", name: "Search" },
  { code: "social", name: "Social" },
  { code: "online_video", name: "Online video" },
  { code: "tv", name: "TV" },
  { code: "audio", name: "Audio" },
] as const;

export type DemoBrandCode = (typeof demoBrands)[number]["code"];
export type DemoMarketCode = (typeof demoMarkets)[number]["code"];
export type DemoChannelCode = (typeof demoChannels)[number]["code"];

/** Every cell's data ends on this Monday. */
export const demoLastWeek = "2025-09-29";

interface DemoCell {
  readonly brand: DemoBrandCode;
  readonly market: DemoMarketCode;
  readonly weeks: number;
  /** Mean weekly new customers without advertising. */
  readonly baseline: number;
  /** Typical weekly spend: search, social, online video, tv, audio (0 = channel not used). */
  readonly typicalSpend: readonly [number, number, number, number, number];
}

/** 14 of the 18 brand × market pairs; Lunesse launched 26 weeks ago. */
export const demoCells: readonly DemoCell[] = [
  { brand: "kestrova", market: "veltria", weeks: 156, baseline: 3200, typicalSpend: [22_000, 15_000, 12_000, 40_000, 6_000] },
  { brand: "kestrova", market: "solvera", weeks: 156, baseline: 2400, typicalSpend: [16_000, 12_000, 9_000, 30_000, 5_000] },
  { brand: "kestrova", market: "kessland", weeks: 156, baseline: 1800, typicalSpend: [12_000, 10_000, 8_000, 24_000, 0] },
  { brand: "kestrova", market: "marendi", weeks: 156, baseline: 1500, typicalSpend: [10_000, 9_000, 6_000, 18_000, 4_000] },
  { brand: "kestrova", market: "tallowmere", weeks: 130, baseline: 1100, typicalSpend: [8_000, 7_000, 5_000, 0, 3_000] },
  { brand: "kestrova", market: "lunesse", weeks: 26, baseline: 420, typicalSpend: [6_000, 5_000, 3_000, 0, 0] },
  { brand: "plumrise", market: "veltria", weeks: 156, baseline: 2600, typicalSpend: [18_000, 14_000, 10_000, 32_000, 5_000] },
  { brand: "plumrise", market: "solvera", weeks: 156, baseline: 2000, typicalSpend: [14_000, 11_000, 12_000, 26_000, 4_000] },
  { brand: "plumrise", market: "kessland", weeks: 104, baseline: 1300, typicalSpend: [9_000, 8_000, 6_000, 16_000, 0] },
  { brand: "plumrise", market: "tallowmere", weeks: 78, baseline: 900, typicalSpend: [7_000, 6_000, 4_000, 0, 2_500] },
  { brand: "sundrift", market: "veltria", weeks: 156, baseline: 1700, typicalSpend: [14_000, 16_000, 9_000, 20_000, 4_000] },
  { brand: "sundrift", market: "kessland", weeks: 156, baseline: 1200, typicalSpend: [9_000, 10_000, 7_000, 14_000, 0] },
  { brand: "sundrift", market: "marendi", weeks: 104, baseline: 1000, typicalSpend: [8_000, 9_000, 5_000, 12_000, 3_000] },
  { brand: "sundrift", market: "lunesse", weeks: 26, baseline: 350, typicalSpend: [5_000, 6_000, 2_500, 0, 0] },
];

/**
 * The cell whose true effect for one channel really differs from its group: Plumrise's
 * online video in Solvera brings three times the customers per euro its pooled draw
 * would (a third of the cost per new customer), so the pooling review has something
 * true to find.
 */
export const demoRealDifference = {
  brand: "plumrise",
  market: "solvera",
  channel: "online_video",
  betaFactor: 3,
} as const satisfies { brand: DemoBrandCode; market: DemoMarketCode; channel: DemoChannelCode; betaFactor: number };

/** Channel-level truths, fixed rather than drawn so the demo reads plausibly. mu = −log(low-spend CAC). */
export const demoChannelTruths: readonly ChannelTruth[] = [
  { channel: "search", mu: -Math.log(45), tauBrand: 0.2, tauMarket: 0.15, tauCell: 0.1, alpha: 0.2, lambda: 1.5 },
  { channel: "social", mu: -Math.log(80), tauBrand: 0.25, tauMarket: 0.2, tauCell: 0.1, alpha: 0.35, lambda: 2 },
  { channel: "online_video", mu: -Math.log(110), tauBrand: 0.2, tauMarket: 0.2, tauCell: 0.1, alpha: 0.5, lambda: 2.5 },
  { channel: "tv", mu: -Math.log(160), tauBrand: 0.15, tauMarket: 0.25, tauCell: 0.1, alpha: 0.7, lambda: 3 },
  { channel: "audio", mu: -Math.log(140), tauBrand: 0.2, tauMarket: 0.15, tauCell: 0.1, alpha: 0.45, lambda: 2 },
];

/** The Monday `weeks − 1` weeks before the last week, so that every cell ends on `demoLastWeek`. */
export function firstWeekFor(weeks: number): string {
  return mondayOfAbsoluteWeek(absoluteWeekOf(demoLastWeek) - (weeks - 1));
}

export const demoDesign: SimulationDesign = {
  channels: demoChannels.map((channel) => channel.code),
  cells: demoCells.map((cell) => ({
    brand: cell.brand,
    market: cell.market,
    firstWeek: firstWeekFor(cell.weeks),
    weeks: cell.weeks,
    typicalSpend: cell.typicalSpend,
    baseline: cell.baseline,
  })),
};
