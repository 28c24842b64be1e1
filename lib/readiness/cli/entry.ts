/**
 * Entry of `tributary-check` (bin/tributary-check.mjs loads it). The same module is the entry
 * of checkFile's worker threads, which start from the running script: such a thread reads its
 * byte range instead of running the command.
 */
import { isRangeWorker, runRangeWorker } from "../node";
import { runCli } from "./main";

if (isRangeWorker()) {
  void runRangeWorker();
} else {
  runCli(process.argv.slice(2)).then(
    (code) => {
      process.exitCode = code;
    },
    (e: unknown) => {
      process.stderr.write(`internal error: ${(e as Error).stack ?? e}\n`);
      process.exitCode = 2;
    },
  );
}
