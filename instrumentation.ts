/** Runs once when a server instance starts, before it serves requests: migrations, demo seed, fake SMTP. */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { startApp } = await import("./db/startup");
  await startApp();
}
