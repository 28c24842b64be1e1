// next-auth's own endpoints: sign-in, sign-out, session, CSRF.
import NextAuth from "next-auth";
import { authOptions } from "@/lib/auth/options";

const handler = NextAuth(authOptions);

export { handler as GET, handler as POST };
