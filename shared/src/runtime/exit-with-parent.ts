/**
 * When started by the project's supervisor, stop if the supervisor disappears (killed with
 * SIGKILL, say) so that no orphan keeps a port. Node-only; the web app never imports it.
 */
export function exitWithParent(shutdown: () => void, env: NodeJS.ProcessEnv = process.env): void {
  if (env.RATEWARDEN_SUPERVISED !== '1') return;
  const parent = process.ppid;
  setInterval(() => {
    if (process.ppid !== parent) shutdown();
  }, 1_000).unref();
}
