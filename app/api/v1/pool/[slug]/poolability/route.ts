// GET /api/v1/pool/:slug/poolability — the stored poolability (Chow tests), batch influence and overall F test of the pool.
import { poolabilityHandler } from "@/lib/pool/questions-handlers";

export const GET = poolabilityHandler;
