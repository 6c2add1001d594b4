import "server-only";
import { getEnv } from "@/lib/base/env";
import { migrateDatabase } from "./migrate";
import { migrateScenarioRules } from "./migrate-scenario-rules";
import { revokeDemoSiteAdmins, seedDemo } from "./seed";

const globalForStartup = globalThis as unknown as { portolanStartup?: Promise<void> };

/**
 * Migrate (schema, then scenario rules: db/migrate-scenario-rules.ts), seed the demo (by default only when APP_URL is a loopback address; SEED_DEMO=1 forces it,
 * SEED_DEMO=0 prevents it) and start the fake SMTP server (if enabled). Runs once per process.
 */
export function startApp(): Promise<void> {
  globalForStartup.portolanStartup ??= (async () => {
    const env = getEnv();
    await migrateDatabase();
    const moved = await migrateScenarioRules();
    if (moved.migrated > 0) console.log(`[migrate] ${moved.migrated} scenario(s): copies of project rules made explicit overrides`);
    if (env.demoOnPublicAddress) {
      console.warn(
        `[seed] WARNING: SEED_DEMO=1 on ${env.appUrl}, an address others can reach: the demo accounts have a published password. Remove SEED_DEMO for a real installation.`,
      );
    }
    const demoted = await revokeDemoSiteAdmins();
    if (demoted.length > 0) console.warn(`[seed] demo accounts are no longer site admins: ${demoted.join(", ")}`);
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
