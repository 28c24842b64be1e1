// GET /api/v1/pool/:slug — the study's pool: merged report of the accepted versions and the versions in it.
import { poolHandler } from "@/lib/pool/handlers";

export const GET = poolHandler;
