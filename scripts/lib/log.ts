/** Console lines from the orchestration scripts, prefixed so they stand out from the services'. */
export function say(message: string): void {
  console.log(`[ratewarden] ${message}`);
}

/** An error whose message is meant for the person at the terminal, printed without a stack. */
export class SetupError extends Error {
  override name = 'SetupError';
}

/** Runs a script's main function: SetupErrors print one clear line, anything else its stack. */
export function runMain(main: () => Promise<number | void>): void {
  main().then(
    (code) => process.exit(code ?? 0),
    (err: unknown) => {
      if (err instanceof SetupError) console.error(`[ratewarden] ${err.message}`);
      else console.error(err);
      process.exit(1);
    },
  );
}
