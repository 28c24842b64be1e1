// POST /api/v1/board/digest — queue the weekly digest to every active lead now. Leads and admins.
import { apiRoute } from "@/lib/http/route";
import { resultResponse } from "@/lib/http/respond";
import { sendDigest } from "@/lib/pool/digest-send";

export const POST = apiRoute({ action: "board.read" }, async ({ actor }) =>
  resultResponse(await sendDigest({ actorId: actor.id, reason: "now" }), 202),
);
