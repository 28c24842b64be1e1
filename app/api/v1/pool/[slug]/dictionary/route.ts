// GET /api/v1/pool/:slug/dictionary[?format=csv] — the data dictionary (plan and pool figures); audited.
import { dictionaryHandler } from "@/lib/pool/handlers";

export const GET = dictionaryHandler;
