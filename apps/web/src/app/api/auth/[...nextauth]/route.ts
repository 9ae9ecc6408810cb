import NextAuth from "next-auth";
import type { NextRequest } from "next/server";
import { NextResponse } from "next/server";
import { authOptions } from "@/lib/auth/options";

// eslint-disable-next-line @typescript-eslint/no-unsafe-assignment -- next-auth 4 types its App Router handler as any
const handler = NextAuth(authOptions);

type Context = { params: Promise<{ nextauth: string[] }> };

/**
 * next-auth's own routes. Signing in with a password is a POST only: a GET of the credentials callback
 * (a link, a crawler) is answered 405 instead of reaching next-auth, which has no answer for it.
 */
export async function GET(req: NextRequest, context: Context): Promise<Response> {
  const [action, provider] = (await context.params).nextauth ?? [];
  if (action === "callback" && provider === "credentials") {
    return NextResponse.json(
      { error: { code: "method_not_allowed", message: "Sign in with a POST of the sign-in form" } },
      { status: 405, headers: { Allow: "POST" } },
    );
  }
  return handler(req, context);
}

export { handler as POST };
