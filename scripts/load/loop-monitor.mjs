// Preloaded into the app by scripts/load-server.sh (NODE_OPTIONS=--import): once a second, the
// longest the event loop was held up, so a load run can tell a busy server from a slow query.
import { monitorEventLoopDelay } from "node:perf_hooks";
const h = monitorEventLoopDelay({ resolution: 10 });
h.enable();
setInterval(() => {
  if (h.count > 0)
    console.log(
      `[loop] ${Date.now()} max=${(h.max / 1e6).toFixed(0)}ms p99=${(h.percentile(99) / 1e6).toFixed(0)}ms`,
    );
  h.reset();
}, 1000).unref();
