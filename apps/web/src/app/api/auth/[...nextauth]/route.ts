import NextAuth from "next-auth";
import { authOptions } from "@/lib/auth/options";

// eslint-disable-next-line @typescript-eslint/no-unsafe-assignment -- next-auth 4 types its App Router handler as any
const handler = NextAuth(authOptions);
export { handler as GET, handler as POST };
