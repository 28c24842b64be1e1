// GET /api/v1/board[?weeks=] — the lead's status board: batches by state, turnaround, providers, silent providers, pools, intake flow.
import { boardQuery } from "@/lib/http/queries";
import { apiRoute } from "@/lib/http/route";
import { parseQuery } from "@/lib/http/parse";
import { jsonData } from "@/lib/http/respond";
import { loadBoard } from "@/lib/pool";

export const GET = apiRoute({ action: "board.read" }, async ({ req }) => {
  const { weeks } = parseQuery(req, boardQuery);
  return jsonData(await loadBoard(weeks));
});
