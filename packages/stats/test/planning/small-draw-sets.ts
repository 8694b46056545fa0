import { handDrawSet } from "./hand-draw-set";

/**
 * Two invented cells with two channels and three posterior draws, every number written
 * out: the cell Alder × Northland has 20 weeks of data, Birchwood × Southmere 10.
 */
export function twoCellDrawSet(maxLag = 4) {
  const spendAN = [
    Array.from({ length: 20 }, (_, t) => 1000 + 50 * t), // Search: 1000, 1050, …, 1950
    Array.from({ length: 20 }, (_, t) => (t % 4 === 0 ? 0 : 2000)), // Video: on/off flights
  ];
  const spendBS = [
    Array.from({ length: 10 }, (_, t) => 400 + 10 * t),
    Array.from({ length: 10 }, () => 0), // Video never ran here
  ];
  const beta = [
    [[0.02, 0.01], [0.03, 0.015]],
    [[0.025, 0.012], [0.028, 0.02]],
    [[0.015, 0.008], [0.035, 0.01]],
  ]; // [draw][cell][channel]
  const theta = [
    [[3000, 6000], [900, 1]],
    [[2500, 5000], [1100, 1.5]],
    [[3500, 7000], [800, 0.8]],
  ];
  const alpha = [
    [[0.5, 0.7], [0.5, 0.7]],
    [[0.4, 0.6], [0.4, 0.6]],
    [[0.6, 0.8], [0.6, 0.8]],
  ];
  const set = handDrawSet({
    channels: ["Search", "Video"],
    cells: [
      { brand: "Alder", market: "Northland", firstWeek: "2024-01-01", spend: spendAN },
      { brand: "Birchwood", market: "Southmere", firstWeek: "2024-03-04", spend: spendBS },
    ],
    draws: 3,
    maxLag,
    parameters: {
      beta: (d, g, c) => beta[d]![g]![c]!,
      theta: (d, g, c) => theta[d]![g]![c]!,
      alpha: (d, g, c) => alpha[d]![g]![c]!,
      baselineLevel: (d, g) => [400, 150][g]! + 10 * d,
      beta1: (d, g) => [20, -5][g]! + d,
      gamma: (d, g, j) => [12, 4][g]! / (j + 1) + d,
      delta: (d, g, j) => [-6, 3][g]! / (j + 1) - d,
      sigma: (d, g) => [25, 10][g]! + d,
    },
  });
  return { set, beta, theta, alpha, spendAN, spendBS };
}
