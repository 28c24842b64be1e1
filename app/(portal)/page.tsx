import { redirect } from "next/navigation";
import { requireUser } from "@/lib/auth/session";
import { ROLE_HOME } from "@/components/portal/nav";

/** "/" sends each signed-in user to their role's home. */
export default async function PortalIndex() {
  const user = await requireUser();
  redirect(ROLE_HOME[user.role]);
}
