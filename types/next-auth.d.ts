// What Tributary keeps in the next-auth JWT and session: the user id, role (for display
// only; the server re-reads it) and the session version that ends older sessions.
import type { UserRole } from "@/db/schema";
import type { DefaultSession } from "next-auth";

declare module "next-auth" {
  interface Session {
    user: { id: number; email: string; name: string; role: UserRole } & Omit<
      NonNullable<DefaultSession["user"]>,
      "email" | "name"
    >;
    sv: number;
  }
  interface User {
    id: string;
    email: string;
    name: string;
    role: UserRole;
    sv: number;
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    uid?: number;
    role?: UserRole;
    sv?: number;
  }
}
