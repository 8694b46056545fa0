import { modelSettingsRecordSchema, modelSettingsSchema, type ModelSettingsInput, type ModelSettingsRecord } from "@tributary/contracts";
import { useMutation } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";

export { modelSettingsSchema as createModelSettingsInput };

/** Stores a set of model settings (the server checks them with the same schema). */
export function createModelSettings(input: ModelSettingsInput): Promise<ModelSettingsRecord> {
  return api.post("/api/model-settings", modelSettingsRecordSchema, modelSettingsSchema.parse(input));
}

export function useCreateModelSettings() {
  return useMutation({ mutationFn: createModelSettings });
}
