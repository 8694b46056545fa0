// Model setup: settings for a fit, checked with the shared schema and against the data.
import { modelSettingsSchema, type ModelSettingsRecord } from "@tributary/contracts";
import { defineRoute, markets, signedIn } from "../access/route-table";
import { auditLog, modelSettings } from "../db/schema";
import { checkSettingsAgainstData } from "../runs/model-settings-checks";
import { modelSettingsRecord, modelSettingsRecords } from "../runs/model-settings-queries";

const fitRoles = ["analyst", "admin"] as const;

export const modelSettingsRoutes = [
  defineRoute({
    method: "post",
    path: "/api/model-settings",
    access: signedIn(markets.unscoped, fitRoles),
    handler: async ({ req, res, db, user }): Promise<ModelSettingsRecord> => {
      const settings = modelSettingsSchema.parse(req.body ?? {});
      await checkSettingsAgainstData(db, settings);
      const id = await db.transaction(async (tx) => {
        const [row] = await tx
          .insert(modelSettings)
          .values({ datasetVersionId: settings.datasetVersionId, settings, createdBy: user.id })
          .returning({ id: modelSettings.id });
        await tx.insert(auditLog).values({ userId: user.id, action: "model_settings_saved", target: `model_settings:${row!.id}`, details: { datasetVersionId: settings.datasetVersionId } });
        return row!.id;
      });
      res.status(201);
      return modelSettingsRecord(db, id);
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/model-settings",
    access: signedIn(markets.unscoped, fitRoles),
    handler: ({ req, db }): Promise<ModelSettingsRecord[]> => {
      const dataset = typeof req.query.dataset === "string" && req.query.dataset !== "" ? req.query.dataset : undefined;
      return modelSettingsRecords(db, { datasetVersionId: dataset });
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/model-settings/:settingsId",
    access: signedIn(markets.unscoped, fitRoles),
    handler: ({ req, db }): Promise<ModelSettingsRecord> => modelSettingsRecord(db, String(req.params.settingsId)),
  }),
];
