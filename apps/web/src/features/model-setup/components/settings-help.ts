// Short help for each model setting, in plain words.
export const settingsHelp = {
  datasetVersionId: "The data the fit learns from. Versions never change, so every run can be traced back to its data.",
  cacRanges:
    "Per channel, the cost of a new customer at low spend that would surprise you on either side. It is read as a 90 % range: the fit starts from it and the data move it.",
  maxLag: "How many weeks an ad can keep bringing customers after it runs (the longest carry-over). 8 suits most media; TV and video may carry longer.",
  saturation: "How returns shrink as weekly spend grows. Exponential is the reference form; Hill allows an S-shape where small budgets do little.",
  likelihood: "How the weekly noise around the model is treated. Student-t lets an odd week (a stock-out, a data glitch) count for less.",
  seasonalityOrder: "Yearly sine and cosine pairs for the seasonal pattern: 0 for none, 1 for one yearly swing, 2 adds a second bump.",
  pooling: "Which cells a cell borrows strength from: sister cells of the same brand, cells in the same market, or both.",
  holdoutWeeks: "The last weeks of every cell are kept out of the fit and used to score its forecast. 0 fits every week.",
  chains: "Samplers run side by side from different starts; comparing them is how convergence is checked. Use 4 for a run you will publish.",
  warmup: "Iterations each chain spends tuning its step size and scales; they are discarded.",
  draws: "Iterations per chain kept after warm-up. Fewer draws run faster but may leave too few effective draws for a trustworthy run.",
  seed: "Fixes the random numbers, so the same settings give the same draws. Leave empty to get a new one.",
  unpooledComparison: "Lets the Pooling review show how far pooling moved each cell's estimate. It adds to the time a fit takes.",
} as const;
