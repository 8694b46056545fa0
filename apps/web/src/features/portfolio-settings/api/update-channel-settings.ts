import { channelSettingsInput, portfolioSettingsSchema, type ChannelSettingsInput, type PortfolioSettings } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { settingsSaved } from "./settings-saved";

export { channelSettingsInput, type ChannelSettingsInput };

/** PUT /api/portfolio-settings/channels: every channel once, in the new display order, with its display name. */
export function updateChannelSettings(input: ChannelSettingsInput): Promise<PortfolioSettings> {
  return api.put("/api/portfolio-settings/channels", portfolioSettingsSchema, channelSettingsInput.parse(input));
}

export function useUpdateChannelSettings() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateChannelSettings, onSuccess: (settings) => settingsSaved(queryClient, settings) });
}
