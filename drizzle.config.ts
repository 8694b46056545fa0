// drizzle-kit reads this to generate SQL migrations from the schema:
// `pnpm db:generate` after changing apps/api/src/db/schema.ts.
import { defineConfig } from "drizzle-kit";

export default defineConfig({
  dialect: "postgresql",
  schema: "./apps/api/src/db/schema.ts",
  out: "./apps/api/drizzle",
});
