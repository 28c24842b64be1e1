// Worker-thread entry of checkFile (lib/readiness/node.ts) for hosts whose own script is not one:
// the server's check worker (lib/readiness/node-stream.ts).
import { isRangeWorker, runRangeWorker } from "./node";

if (isRangeWorker()) void runRangeWorker();
