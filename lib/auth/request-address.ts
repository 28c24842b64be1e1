import "server-only";
import { headers } from "next/headers";
import { clientIpOf } from "./credentials";

/**
 * The client address of the request a server action runs in, for the rate limits
 * (X-Forwarded-For, then X-Real-IP). Outside a request scope (scripts) it is "local".
 */
export async function requestAddress(): Promise<string> {
  let h: Headers;
  try {
    h = await headers();
  } catch {
    return "local";
  }
  return clientIpOf(h);
}
