import "server-only";
import { getEnv } from "@/lib/base/env";
import { migrateDatabase } from "./migrate";
import { migrateScenarioRules } from "./migrate-scenario-rules";
import { seedDemo } from "./seed";

const globalForStartup = globalThis as unknown as { portolanStartup?: Promise<void> };

/** Migrate (schema, then scenario rules), seed the demo (unless SEED_DEMO=0) and start the fake SMTP server (if enabled). Runs once per process. */
export function startApp(): Promise<void> {
  globalForStartup.portolanStartup ??= (async () => {
    const env = getEnv();
    await migrateDatabase();
    const moved = await migrateScenarioRules();
    if (moved.migrated > 0) console.log(`[migrate] ${moved.migrated} scenario(s): copies of project rules made explicit overrides`);
    if (env.seedDemo) {
      const result = await seedDemo();
      if (result.seeded) console.log("[seed] demo project and users created (password: portolan-demo)");
    }
    if (env.fakeSmtp) {
      const { ensureFakeSmtpServer } = await import("@/lib/server/mail/fake-smtp");
      await ensureFakeSmtpServer(env.fakeSmtpPort);
    }
  })();
  return globalForStartup.portolanStartup;
}
