// GET /api/v1/me — the caller, their organisation and what their role allows.
import { apiRoute } from "@/lib/http/route";
import { jsonData } from "@/lib/http/respond";
import { PERMISSIONS } from "@/lib/auth/permissions";

export const GET = apiRoute({}, async ({ actor }) =>
  jsonData({
    id: actor.id,
    email: actor.email,
    name: actor.name,
    role: actor.role,
    organisation:
      actor.organisationId != null ? { id: actor.organisationId, name: actor.organisationName } : null,
    permissions: PERMISSIONS[actor.role],
    via: actor.via,
  }),
);
