// Invented dashboard responses for the web tests: the fictional Tallowmere Goods Co
// (brands Fennick and Hollowby; markets Ardeval, Briskmoor, Celowen), shaped exactly as
// the contracts say, and checked against them when the module loads.
import {
  brandComparisonSchema,
  channelSheetSchema,
  marketDeskSchema,
  poolingReviewSchema,
  portfolioMapSchema,
  type BrandComparison,
  type CacInterval,
  type ChannelSheet,
  type Flag,
  type MarketDesk,
  type PoolingReview,
  type PortfolioMap,
  type PortfolioMapCell,
} from "@tributary/contracts";
import { testRun, untrustworthyTrust } from "./run-fixtures";
import { testMarkets } from "./test-utils";

const brands = [
  { id: "b-fen", code: "fennick", name: "Fennick", customerValue: 120 },
  { id: "b-hol", code: "hollo", name: "Hollowby", customerValue: null },
];
const channels = [
  { id: "ch-s", code: "search", name: "Search" },
  { id: "ch-r", code: "radio", name: "Radio" },
];

export const publishedRun = testRun({
  id: "run-7f3a9c21",
  current: true,
  trust: untrustworthyTrust,
  publication: { at: "2025-02-03T11:00:00.000Z", by: { id: "u-n", name: "Nell Ostrand" }, reason: "Lift tests run last spring agree with these estimates." },
});

export function interval(q50: number, spread = 1.4): CacInterval {
  return { mean: q50 * 1.02, q05: q50 / spread, q25: q50 / Math.sqrt(spread), q50, q75: q50 * Math.sqrt(spread), q95: q50 * spread };
}

export function testFlag(overrides: Partial<Flag> = {}): Flag {
  return {
    id: "flag-1",
    cellId: "c2",
    brandId: "b-fen",
    marketId: "m-bri",
    brand: "Fennick",
    market: "Briskmoor",
    channel: "search",
    channelName: "Search",
    kind: "needs_lift_test",
    note: "Only 20 weeks; confirm before moving budget.",
    runId: publishedRun.id,
    createdAt: "2025-02-04T09:30:00.000Z",
    createdBy: { id: "u-n", name: "Nell Ostrand" },
    active: true,
    clearedAt: null,
    clearedBy: null,
    ...overrides,
  };
}

const mapCells: PortfolioMapCell[] = [
  {
    cellId: "c1",
    brandId: "b-fen",
    marketId: "m-ard",
    brand: "Fennick",
    market: "Ardeval",
    weeks: 104,
    fittedWeeks: 100,
    firstWeek: "2023-01-02",
    lastWeek: "2024-12-23",
    hasSpend: true,
    cac: interval(48.26),
    cacLowSpend: interval(48.26),
    cacAverage: interval(61),
    customerValue: 120,
    probabilityProfitable: 0.734,
    pooling: { shrinkage: 0.12, shrinkageMark: "little", medianRatio: 0.97 },
    moveChannel: "search",
    outlier: false,
    flagIds: [],
  },
  {
    cellId: "c2",
    brandId: "b-fen",
    marketId: "m-bri",
    brand: "Fennick",
    market: "Briskmoor",
    weeks: 20,
    fittedWeeks: 20,
    firstWeek: "2024-08-05",
    lastWeek: "2024-12-16",
    hasSpend: true,
    cac: interval(1234, 2.2),
    cacLowSpend: interval(1234, 2.2),
    cacAverage: interval(1500, 2.2),
    customerValue: 120,
    probabilityProfitable: 0.004,
    pooling: { shrinkage: 0.81, shrinkageMark: "strong", medianRatio: 0.6 },
    moveChannel: "search",
    outlier: true,
    flagIds: ["flag-1"],
  },
  {
    cellId: "c3",
    brandId: "b-hol",
    marketId: "m-ard",
    brand: "Hollowby",
    market: "Ardeval",
    weeks: 52,
    fittedWeeks: 52,
    firstWeek: "2024-01-01",
    lastWeek: "2024-12-23",
    hasSpend: false,
    cac: null,
    cacLowSpend: null,
    cacAverage: null,
    customerValue: null,
    probabilityProfitable: null,
    pooling: { shrinkage: null, shrinkageMark: null, medianRatio: null },
    moveChannel: null,
    outlier: false,
    flagIds: [],
  },
];

/** The Portfolio map for search; a market manager's copy holds only their markets. */
export function testPortfolioMap(marketIds?: string[]): PortfolioMap {
  const markets = marketIds ? testMarkets.filter((market) => marketIds.includes(market.id)) : testMarkets;
  const cells = mapCells.filter((cell) => markets.some((market) => market.id === cell.marketId));
  return portfolioMapSchema.parse({
    run: publishedRun,
    currency: "EUR",
    caution: "Model-based estimates; confirm with a lift test.",
    flags: cells.some((cell) => cell.flagIds.includes("flag-1")) ? [testFlag()] : [],
    channel: "search",
    channels,
    brands,
    markets,
    headline: { kind: "low_spend", weeks: null, label: "low-spend CAC (1/β)" },
    profitBasis: { kind: "average_recent", weeks: 13, label: "average CAC over the last 13 fitted weeks" },
    cells,
  });
}

export function testBrandComparison(): BrandComparison {
  return brandComparisonSchema.parse({
    run: publishedRun,
    currency: "EUR",
    caution: "Model-based estimates; confirm with a lift test.",
    flags: [testFlag()],
    basis: { kind: "low_spend", weeks: null, label: "low-spend CAC (1/β)" },
    channels: [
      { channel: "search", name: "Search", portfolioEffect: interval(60, 1.8) },
      { channel: "radio", name: "Radio", portfolioEffect: interval(140, 2) },
    ],
    brands,
    markets: testMarkets,
    rows: [
      {
        channel: "search",
        brandId: "b-fen",
        brand: "Fennick",
        brandEffect: interval(70),
        cells: [
          { cellId: "c2", marketId: "m-bri", market: "Briskmoor", hasSpend: true, cac: interval(90), cacUnpooled: interval(150, 3), pooling: { shrinkage: 0.8, shrinkageMark: "strong", medianRatio: 0.6 }, outlier: true, flagIds: ["flag-1"] },
          { cellId: "c1", marketId: "m-ard", market: "Ardeval", hasSpend: true, cac: interval(48.26), cacUnpooled: interval(47), pooling: { shrinkage: 0.12, shrinkageMark: "little", medianRatio: 1.02 }, outlier: false, flagIds: [] },
        ],
      },
      {
        channel: "search",
        brandId: "b-hol",
        brand: "Hollowby",
        brandEffect: interval(40),
        cells: [{ cellId: "c3", marketId: "m-ard", market: "Ardeval", hasSpend: true, cac: interval(38), cacUnpooled: null, pooling: { shrinkage: null, shrinkageMark: null, medianRatio: null }, outlier: false, flagIds: [] }],
      },
      {
        channel: "radio",
        brandId: "b-fen",
        brand: "Fennick",
        brandEffect: null,
        cells: [{ cellId: "c1", marketId: "m-ard", market: "Ardeval", hasSpend: true, cac: interval(210), cacUnpooled: interval(260), pooling: { shrinkage: 0.4, shrinkageMark: "moderate", medianRatio: 0.8 }, outlier: false, flagIds: [] }],
      },
    ],
  });
}

export function testMarketDesk(): MarketDesk {
  return marketDeskSchema.parse({
    run: publishedRun,
    currency: "EUR",
    caution: "Model-based estimates; confirm with a lift test.",
    flags: [testFlag()],
    previousRun: null,
    markets: [testMarkets[1]],
    brands,
    channels,
    basis: { kind: "low_spend", weeks: null, label: "low-spend CAC (1/β)" },
    profitBasis: { kind: "average_recent", weeks: 13, label: "average CAC over the last 13 fitted weeks" },
    cells: [
      {
        cellId: "c2",
        brandId: "b-fen",
        marketId: "m-bri",
        brand: "Fennick",
        market: "Briskmoor",
        customerValue: 120,
        weeks: 20,
        lastWeek: "2024-12-16",
        channels: [
          {
            channel: "search",
            channelName: "Search",
            hasSpend: true,
            cac: interval(90),
            cacAverage: interval(110),
            currentWeeklySpend: 4200,
            probabilityProfitable: 0.62,
            pooling: { shrinkage: 0.8, shrinkageMark: "strong", medianRatio: 0.6 },
            outlier: true,
            flagIds: ["flag-1"],
          },
          {
            channel: "radio",
            channelName: "Radio",
            hasSpend: false,
            cac: interval(300),
            cacAverage: null,
            currentWeeklySpend: 0,
            probabilityProfitable: null,
            pooling: { shrinkage: null, shrinkageMark: null, medianRatio: null },
            outlier: false,
            flagIds: [],
          },
        ],
      },
    ],
    changes: [],
    plans: [],
  });
}

/** Draws of the cost per customer for the slider: 10 values, one with no finite CAC (null). */
export const profitDraws = [40, 55, 60, 80, 95, 110, 130, 150, 200, null];

export function testChannelSheet(): ChannelSheet {
  const weeks = Array.from({ length: 12 }, (_, t) => new Date(Date.UTC(2024, 0, 1 + 7 * t)).toISOString().slice(0, 10));
  const band = (level: number) => ({ q05: weeks.map(() => level * 0.8), q25: weeks.map(() => level * 0.9), q50: weeks.map(() => level), q75: weeks.map(() => level * 1.1), q95: weeks.map(() => level * 1.2) });
  const histogram = { scale: "log" as const, edges: [20, 40, 80, 160, 320], counts: [1, 4, 4, 1], below: 0, above: 0, total: 10 };
  return channelSheetSchema.parse({
    run: publishedRun,
    currency: "EUR",
    caution: "Model-based estimates; confirm with a lift test.",
    flags: [testFlag()],
    cell: { cellId: "c2", brandId: "b-fen", marketId: "m-bri", brand: "Fennick", market: "Briskmoor", customerValue: 120, weeks: 20, fittedWeeks: 20, firstWeek: "2024-08-05", lastWeek: "2024-12-16" },
    channel: channels[0],
    hasSpend: true,
    recentWeeks: 13,
    currentWeeklySpend: 4200,
    lowSpendCac: { basis: { kind: "low_spend", weeks: null, label: "low-spend CAC (1/β)" }, summary: interval(90), histogram },
    marginalCac: { basis: { kind: "marginal", weeks: null, label: "marginal CAC at the current weekly spend" }, summary: interval(130), histogram },
    averageCac: { basis: { kind: "average_recent", weeks: 13, label: "average CAC over the last 13 fitted weeks" }, summary: interval(110), histogram },
    responseCurve: {
      points: [0, 2000, 4000, 8000].map((s) => ({
        weeklySpend: s,
        response: { q05: s / 150, q25: s / 120, q50: s / 100, q75: s / 90, q95: s / 80 },
        marginalCac: { q05: 60, q50: 90, q95: 140 },
      })),
      currentWeeklySpend: 4200,
      maxObservedWeeklySpend: 7000,
    },
    carryOver: {
      maxLag: 3,
      alpha: { q05: 0.2, q25: 0.3, q50: 0.4, q75: 0.5, q95: 0.6 },
      lags: [
        { lag: 0, q05: 0.5, q25: 0.55, q50: 0.6, q75: 0.65, q95: 0.7 },
        { lag: 1, q05: 0.2, q25: 0.22, q50: 0.25, q75: 0.28, q95: 0.3 },
        { lag: 2, q05: 0.05, q25: 0.1, q50: 0.15, q75: 0.18, q95: 0.2 },
      ],
    },
    contribution: {
      weeks,
      spend: weeks.map(() => 4200),
      observed: weeks.map((_, t) => 300 + t),
      fitted: weeks.map((_, t) => t < 10),
      contribution: band(40),
      baseline: band(260),
    },
    profit: {
      basis: { kind: "average_recent", weeks: 13, label: "average CAC over the last 13 fitted weeks" },
      customerValue: 120,
      // From every stored draw on the server, so a little different from the 10 sent.
      probabilityAtCustomerValue: 0.61,
      draws: profitDraws,
    },
    estimates: {
      pooled: interval(90),
      unpooled: interval(150, 3),
      group: interval(70),
      pooling: { shrinkage: 0.8, shrinkageMark: "strong", medianRatio: 0.6 },
      outlier: true,
      outlierReason: "Its own interval excludes the group estimate.",
    },
    flagHistory: [testFlag(), testFlag({ id: "flag-0", kind: "data_problem", note: "Week of 2 Sep double-counted.", active: false, clearedAt: "2025-01-20T10:00:00.000Z", clearedBy: { id: "u-a", name: "Ada Quern" } })],
  });
}

export function testPoolingReview(): PoolingReview {
  return poolingReviewSchema.parse({
    run: publishedRun,
    currency: "EUR",
    caution: "Model-based estimates; confirm with a lift test.",
    flags: [testFlag()],
    basis: { kind: "low_spend", weeks: null, label: "low-spend CAC (1/β)" },
    channels: [
      { channel: "search", name: "Search", portfolioEffect: interval(60, 1.8) },
      { channel: "radio", name: "Radio", portfolioEffect: interval(140, 2) },
    ],
    rows: [
      {
        cellId: "c2",
        brandId: "b-fen",
        marketId: "m-bri",
        brand: "Fennick",
        market: "Briskmoor",
        channel: "search",
        channelName: "Search",
        hasSpend: true,
        pooled: interval(90),
        unpooled: interval(150, 3),
        group: interval(70),
        pooling: { shrinkage: 0.8, shrinkageMark: "strong", medianRatio: 0.6 },
        outlier: true,
        outlierReason: "Its own interval excludes the group estimate.",
        flagIds: ["flag-1"],
      },
      {
        cellId: "c1",
        brandId: "b-fen",
        marketId: "m-ard",
        brand: "Fennick",
        market: "Ardeval",
        channel: "radio",
        channelName: "Radio",
        hasSpend: true,
        pooled: interval(210),
        unpooled: interval(260),
        group: interval(160),
        pooling: { shrinkage: -0.3, shrinkageMark: "outside", medianRatio: 0.8 },
        outlier: false,
        outlierReason: null,
        flagIds: [],
      },
    ],
    poolingFactors: [
      { level: "brand", channel: "search", poolingFactor: 0.42 },
      { level: "market", channel: "search", poolingFactor: 0.61 },
      { level: "cell", channel: "search", poolingFactor: 0.88 },
      { level: "brand", channel: "radio", poolingFactor: null },
    ],
    outliers: [{ cellId: "c2", brand: "Fennick", market: "Briskmoor", channel: "search", channelName: "Search", reason: "Its own interval excludes the group estimate." }],
  });
}
