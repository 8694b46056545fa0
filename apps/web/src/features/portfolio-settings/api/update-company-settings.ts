import { companySettingsInput, portfolioSettingsSchema, type CompanySettingsInput, type PortfolioSettings } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { settingsSaved } from "./settings-saved";

export { companySettingsInput, type CompanySettingsInput };

/** PATCH /api/portfolio-settings/company: the company name and/or the reporting currency (a relabel, never a conversion). */
export function updateCompanySettings(input: CompanySettingsInput): Promise<PortfolioSettings> {
  return api.patch("/api/portfolio-settings/company", portfolioSettingsSchema, companySettingsInput.parse(input));
}

export function useUpdateCompanySettings() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateCompanySettings, onSuccess: (settings) => settingsSaved(queryClient, settings) });
}
