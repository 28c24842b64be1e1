// GET /api/v1/board[?weeks=] — the lead's status board: batches by state, turnaround, providers, silent providers, pools, intake flow.
import { z } from "zod";
import { apiRoute } from "@/lib/http/route";
import { parseQuery } from "@/lib/http/parse";
import { jsonData } from "@/lib/http/respond";
import { loadBoard } from "@/lib/pool";

const querySchema = z.object({ weeks: z.coerce.number().int().min(1, "weeks is at least 1.").max(104, "weeks is at most 104.").default(12) });

export const GET = apiRoute({ action: "board.read" }, async ({ req }) => {
  const { weeks } = parseQuery(req, querySchema);
  return jsonData(await loadBoard(weeks));
});
