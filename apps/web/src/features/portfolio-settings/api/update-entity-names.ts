import { brandNamesInput, marketNamesInput, portfolioSettingsSchema, type BrandNamesInput, type MarketNamesInput, type PortfolioSettings } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { settingsSaved } from "./settings-saved";

export { brandNamesInput, marketNamesInput, type BrandNamesInput, type MarketNamesInput };

/** PUT /api/portfolio-settings/brand-names: new display names for the brands listed (codes never change). */
export function updateBrandNames(input: BrandNamesInput): Promise<PortfolioSettings> {
  return api.put("/api/portfolio-settings/brand-names", portfolioSettingsSchema, brandNamesInput.parse(input));
}

/** PUT /api/portfolio-settings/market-names: new display names for the markets listed (codes never change). */
export function updateMarketNames(input: MarketNamesInput): Promise<PortfolioSettings> {
  return api.put("/api/portfolio-settings/market-names", portfolioSettingsSchema, marketNamesInput.parse(input));
}

export function useUpdateBrandNames() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateBrandNames, onSuccess: (settings) => settingsSaved(queryClient, settings) });
}

export function useUpdateMarketNames() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateMarketNames, onSuccess: (settings) => settingsSaved(queryClient, settings) });
}
