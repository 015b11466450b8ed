/**
 * Calls `step` every `intervalMs` (never two at once) until stopped; errors are logged and the
 * loop goes on, because a database or mail hiccup must not stop the worker.
 */
export function startLoop(name: string, intervalMs: number, step: () => Promise<void>): { stop: () => Promise<void> } {
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<void> = Promise.resolve();
  const tick = () => {
    running = step()
      .catch((err: unknown) => console.error(`${name} failed: ${err instanceof Error ? err.message : String(err)}`))
      .finally(() => {
        if (!stopped) timer = setTimeout(tick, intervalMs);
      });
  };
  timer = setTimeout(tick, 0);
  return {
    stop: async () => {
      stopped = true;
      if (timer) clearTimeout(timer);
      await running;
    },
  };
}
