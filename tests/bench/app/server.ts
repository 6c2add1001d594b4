// Starts the built app (`next start`, after `npx next build`) on a loopback port with a fresh demo
// database, for the API and page benches. Not part of `npm test`.
import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync } from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";

export type BenchServer = { url: string; stop: () => void; cookie: (email: string) => Promise<string>; projectId: (cookie: string) => Promise<string> };

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const a = server.address();
      const port = typeof a === "object" && a ? a.port : 0;
      server.close(() => resolve(port));
    });
  });
}

/** `next start` on a free loopback port, demo seeded (APP_URL is loopback), its own SQLite file. */
export async function startServer(env: Record<string, string> = {}): Promise<BenchServer> {
  const port = await freePort();
  const smtp = await freePort();
  const dir = mkdtempSync(path.join(os.tmpdir(), "portolan-bench-"));
  const url = `http://127.0.0.1:${port}`;
  const child: ChildProcess = spawn(process.execPath, [...(process.env.BENCH_NODE_ARGS ?? "").split(" ").filter(Boolean), path.resolve("node_modules/next/dist/bin/next"), "start", "-p", String(port), "-H", "127.0.0.1"], {
    env: { ...process.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1", DATABASE_URL: `file:${path.join(dir, "bench.db")}`, APP_URL: url, SEED_DEMO: "1", FAKE_SMTP_PORT: String(smtp), ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let log = "";
  child.stdout?.on("data", (d: Buffer) => (log += d.toString()));
  child.stderr?.on("data", (d: Buffer) => (log += d.toString()));
  for (let i = 0; ; i++) {
    try {
      const res = await fetch(`${url}/sign-in`);
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (i > 600 || child.exitCode !== null) throw new Error(`next start did not come up:\n${log}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    url,
    stop: () => child.kill("SIGTERM"),
    async cookie(email: string) {
      const res = await fetch(`${url}/api/auth/sign-in`, { method: "POST", headers: { "content-type": "application/json", origin: url }, body: JSON.stringify({ email, password: "portolan-demo" }) });
      if (!res.ok) throw new Error(`sign-in as ${email}: ${res.status} ${await res.text()}`);
      const set = res.headers.get("set-cookie") ?? "";
      return set.split(";")[0];
    },
    async projectId(cookie: string) {
      const res = await fetch(`${url}/api/projects`, { headers: { cookie } });
      const { projects } = (await res.json()) as { projects: { id: string }[] };
      return projects[0].id;
    },
  };
}
