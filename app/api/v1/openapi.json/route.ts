// GET /api/v1/openapi.json — the OpenAPI 3.1 document of this API (public: it describes, it holds no data).
import { openApiDocument } from "@/lib/http/openapi";

export function GET(): Response {
  return Response.json(openApiDocument(), { headers: { "cache-control": "public, max-age=300" } });
}
