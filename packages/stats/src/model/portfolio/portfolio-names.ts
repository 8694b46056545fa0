import type { ParameterLayout } from "./parameter-layout";
import type { PortfolioConstants } from "./portfolio-constants";
import type { ResolvedPortfolioOptions } from "./portfolio-options";

/**
 * Names of the constrained quantities, in the order `constrain` writes them. Cells are
 * named by their 0-based position in the data (`beta[3,Search]`), brands and markets by
 * their 0-based position in order of first appearance, Fourier terms by their harmonic
 * j = 1..J. Pooled model:
 *   mu[ch], tauBrand[ch], tauMarket[ch], tauCell[ch], alpha[ch], lambda[ch], (hillShape[ch]),
 *   beta[g,ch], cac0[g,ch], theta[g,ch], logBetaGroup[g,ch], brandDeviation[b,ch],
 *   marketDeviation[m,ch], cellDeviation[g,ch], beta0[g], beta1[g], sigma[g],
 *   baselineLevel[g], gamma[g,j], delta[g,j], controlCoef[g,control], (nu).
 * Unpooled model (one cell g): alpha[g,ch], lambda[g,ch], (hillShape[g,ch]), eta[g,ch] (= log β),
 * beta, cac0, theta, beta0, beta1, sigma, baselineLevel, gamma, delta, controlCoef, (nu[g]).
 * baselineLevel[g] = β0 − Σ_c β·mean_t r: the cell's mean weekly outcome without media.
 */
export function portfolioParameterNames(
  constants: PortfolioConstants,
  options: ResolvedPortfolioOptions,
  layout: ParameterLayout,
  cellIndexOffset = 0,
): string[] {
  const channels = constants.channels;
  const G = constants.cellCount;
  const J = constants.seasonalityOrder;
  const names: string[] = [];
  const cells = Array.from({ length: G }, (_, g) => g + cellIndexOffset);
  const perChannel = (base: string): void => {
    for (const ch of channels) names.push(`${base}[${ch}]`);
  };
  const perCellChannel = (base: string): void => {
    for (const g of cells) for (const ch of channels) names.push(`${base}[${g},${ch}]`);
  };
  const perCell = (base: string): void => {
    for (const g of cells) names.push(`${base}[${g}]`);
  };
  const pooled = layout.structure === "pooled";
  if (pooled) {
    perChannel("mu");
    if (layout.tauBrand >= 0) perChannel("tauBrand");
    if (layout.tauMarket >= 0) perChannel("tauMarket");
    perChannel("tauCell");
    perChannel("alpha");
    perChannel("lambda");
    if (layout.hillShape >= 0) perChannel("hillShape");
  } else {
    perCellChannel("alpha");
    perCellChannel("lambda");
    if (layout.hillShape >= 0) perCellChannel("hillShape");
    perCellChannel("eta");
  }
  perCellChannel("beta");
  perCellChannel("cac0");
  perCellChannel("theta");
  if (pooled) {
    perCellChannel("logBetaGroup");
    if (layout.zBrand >= 0) constants.brands.forEach((_, b) => channels.forEach((ch) => names.push(`brandDeviation[${b},${ch}]`)));
    if (layout.zMarket >= 0) constants.markets.forEach((_, m) => channels.forEach((ch) => names.push(`marketDeviation[${m},${ch}]`)));
    perCellChannel("cellDeviation");
  }
  perCell("beta0");
  perCell("beta1");
  perCell("sigma");
  perCell("baselineLevel");
  for (const g of cells) for (let j = 1; j <= J; j++) names.push(`gamma[${g},${j}]`);
  for (const g of cells) for (let j = 1; j <= J; j++) names.push(`delta[${g},${j}]`);
  for (const g of cells) for (const control of constants.controls) names.push(`controlCoef[${g},${control}]`);
  if (options.likelihood === "student-t") names.push(pooled ? "nu" : `nu[${cells[0]}]`);
  return names;
}

/** Maps parameter names to column indices of a draws matrix and back. */
export class ParameterColumns {
  private readonly index: Map<string, number>;
  constructor(readonly names: readonly string[]) {
    this.index = new Map(names.map((name, i) => [name, i]));
    if (this.index.size !== names.length) throw new RangeError("parameter names must be unique");
  }
  /** Column of a name; throws when the name is unknown. */
  indexOf(name: string): number {
    const i = this.index.get(name);
    if (i === undefined) throw new RangeError(`no parameter named "${name}"`);
    return i;
  }
  /** Column of a name, or −1. */
  find(name: string): number {
    return this.index.get(name) ?? -1;
  }
  nameOf(column: number): string {
    const name = this.names[column];
    if (name === undefined) throw new RangeError(`no parameter in column ${column}`);
    return name;
  }
  has(name: string): boolean {
    return this.index.has(name);
  }
  cellChannel(base: string, cell: number, channel: string): number {
    return this.indexOf(`${base}[${cell},${channel}]`);
  }
  channel(base: string, channel: string): number {
    return this.indexOf(`${base}[${channel}]`);
  }
  cell(base: string, cell: number): number {
    return this.indexOf(`${base}[${cell}]`);
  }
}
