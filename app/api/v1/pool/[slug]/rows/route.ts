// GET /api/v1/pool/:slug/rows — all accepted rows as one CSV with provenance columns, streamed; audited.
import { poolRowsHandler } from "@/lib/pool/handlers";
import { openStoredFile } from "@/lib/batches/intake/file-store";

export const GET = poolRowsHandler((key) => openStoredFile(key));
