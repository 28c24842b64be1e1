// GET /api/v1/pool — each visible study's pool in brief (analysts: assigned studies; leads, admins: all).
import { listPoolsHandler } from "@/lib/pool/handlers";

export const GET = listPoolsHandler;
