// GET /api/v1/pool/:slug/if-accepted?batch=&version= — the pool's figures with a version ready for review added, and drift.
import { ifAcceptedHandler } from "@/lib/pool/handlers";

export const GET = ifAcceptedHandler;
