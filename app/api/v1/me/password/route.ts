// POST /api/v1/me/password — change one's own password (the current one is checked); every
// session opened before ends, as on the settings page. The settings page's service.
import { apiRoute } from "@/lib/http/route";
import { parseJsonBody } from "@/lib/http/parse";
import { resultResponse } from "@/lib/http/respond";
import { changePasswordSchema } from "@/lib/people/schemas";
import { changeOwnPassword } from "@/lib/people/commands-users";

export const POST = apiRoute({}, async ({ req, actor }) => {
  const input = await parseJsonBody(req, changePasswordSchema);
  const r = await changeOwnPassword(
    actor.id,
    input.currentPassword,
    input.newPassword,
    input.confirmPassword,
  );
  return resultResponse(r.ok ? { ok: true, data: { changed: true } } : r);
});
