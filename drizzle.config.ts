import { defineConfig } from "drizzle-kit";

// "turso" is drizzle-kit's dialect for @libsql/client: it accepts file: URLs and libsql:// servers alike.
export default defineConfig({
  schema: "./db/schema.ts",
  out: "./drizzle",
  dialect: "turso",
  dbCredentials: {
    url: process.env.DATABASE_URL ?? "file:data/portolan.db",
    authToken: process.env.DATABASE_AUTH_TOKEN,
  },
});
