// GET /api/v1/pool/:slug/selection — the stored selection preview over the plan's candidate terms.
import { selectionHandler } from "@/lib/pool/questions-handlers";

export const GET = selectionHandler;
