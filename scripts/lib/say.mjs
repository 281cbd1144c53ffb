// Console output of the start and test scripts: short lines, no stack traces.
const tty = process.stdout.isTTY;
const paint = (code, s) => (tty ? `\x1b[${code}m${s}\x1b[0m` : s);

export const say = (msg) => console.log(`${paint('36', 'crestline')} ${msg}`);
export const warn = (msg) => console.log(`${paint('33', 'crestline')} ${msg}`);
export const bold = (s) => paint('1', s);

/** A problem the person can fix: one clear line, then exit. */
export class SetupError extends Error {}

export function fail(msg) {
  throw new SetupError(msg);
}

/** Runs main(); a SetupError prints its one line, anything else a short line without a stack. */
export async function runMain(main, cleanup = async () => {}) {
  try {
    await main();
  } catch (error) {
    await cleanup().catch(() => {});
    if (error instanceof SetupError) console.error(`${paint('31', 'crestline')} ${error.message}`);
    else console.error(`${paint('31', 'crestline')} unexpected failure: ${error?.message ?? error}`);
    process.exit(1);
  }
}
