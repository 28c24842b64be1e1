"use server";

import type { Result } from "@/lib/result";
import { requestAddress } from "@/lib/auth/request-address";
import { requestPasswordReset, setPasswordWithLink } from "@/lib/people/commands-links";

export async function requestResetAction(email: string): Promise<Result<null>> {
  return requestPasswordReset(email, { ip: await requestAddress() });
}

export async function setPasswordAction(
  token: string,
  password: string,
  confirmPassword: string,
): Promise<Result<{ email: string }>> {
  return setPasswordWithLink(token, { password, confirmPassword });
}
