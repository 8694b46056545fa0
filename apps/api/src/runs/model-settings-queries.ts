// Stored model settings as the API sends them.
import { desc, eq } from "drizzle-orm";
import type { ModelSettings, ModelSettingsRecord } from "@tributary/contracts";
import type { Queryable } from "../db/client";
import { datasetVersions, modelSettings, users } from "../db/schema";
import { NotFound } from "../http/errors";

export async function modelSettingsRecords(db: Queryable, where: { id?: string; datasetVersionId?: string }): Promise<ModelSettingsRecord[]> {
  const rows = await db
    .select({
      id: modelSettings.id,
      datasetVersionId: modelSettings.datasetVersionId,
      datasetVersionNumber: datasetVersions.number,
      settings: modelSettings.settings,
      createdAt: modelSettings.createdAt,
      createdById: modelSettings.createdBy,
      createdByName: users.name,
    })
    .from(modelSettings)
    .innerJoin(datasetVersions, eq(datasetVersions.id, modelSettings.datasetVersionId))
    .leftJoin(users, eq(users.id, modelSettings.createdBy))
    .where(where.id ? eq(modelSettings.id, where.id) : where.datasetVersionId ? eq(modelSettings.datasetVersionId, where.datasetVersionId) : undefined)
    .orderBy(desc(modelSettings.createdAt));
  return rows.map(({ createdById, createdByName, createdAt, settings, ...row }) => ({
    ...row,
    settings: settings as ModelSettings,
    createdAt: createdAt.toISOString(),
    createdBy: createdById && createdByName ? { id: createdById, name: createdByName } : null,
  }));
}

export async function modelSettingsRecord(db: Queryable, id: string): Promise<ModelSettingsRecord> {
  const [record] = await modelSettingsRecords(db, { id });
  if (!record) throw new NotFound("No such model settings");
  return record;
}
