import { customerValuesInput, portfolioSettingsSchema, type CustomerValuesInput, type PortfolioSettings } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { settingsSaved } from "./settings-saved";

export { customerValuesInput, type CustomerValuesInput };

/** PUT /api/portfolio-settings/customer-values: the value of a new customer for the brands listed (null: not known). */
export function updateCustomerValues(input: CustomerValuesInput): Promise<PortfolioSettings> {
  return api.put("/api/portfolio-settings/customer-values", portfolioSettingsSchema, customerValuesInput.parse(input));
}

export function useUpdateCustomerValues() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateCustomerValues, onSuccess: (settings) => settingsSaved(queryClient, settings) });
}
