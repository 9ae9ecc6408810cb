import "server-only";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { PASSWORD_MAX_LENGTH } from "@coldtrail/core";
import { DUMMY_PASSWORD_HASH, credentialStampOf, currentCredentialStamp, findUserForSignIn, verifyPassword } from "@coldtrail/db";
import { db } from "../db";
import { env } from "../env";
import { clientAddress, throttle } from "../server/throttle";
import { finishSession, sessionStillOpen, startSession } from "./sessions";

const credentials = z.object({
  email: z.string().trim().toLowerCase().email().max(320),
  password: z.string().min(1).max(PASSWORD_MAX_LENGTH),
});

/** Message of a sign-in refused by the throttle; the sign-in form shows it as it is. */
export const THROTTLED_PREFIX = "Too many failed sign-ins.";

/** Longest a session lasts however active it is (ASVS V3.3.2 level 2: 12 hours). */
const SESSION_MAX_SECONDS = 12 * 60 * 60;

export const authOptions: NextAuthOptions = {
  secret: env.NEXTAUTH_SECRET,
  session: { strategy: "jwt", maxAge: SESSION_MAX_SECONDS },
  pages: { signIn: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "Email and password",
      credentials: {
        email: { label: "Email", type: "email" },
        password: { label: "Password", type: "password" },
      },
      async authorize(raw, req) {
        const parsed = credentials.safeParse(raw);
        if (!parsed.success) return null;
        const { email, password } = parsed.data;
        const address = clientAddress(req?.headers ?? {});
        // Refused before the password is even compared: after too many failures the right one is refused too.
        const refusal = await throttle().signInRefusal(email, address);
        if (refusal) throw new Error(`${THROTTLED_PREFIX} ${refusal.message}`);

        const user = await findUserForSignIn(db(), email);
        // Compare against a dummy hash when the user is unknown so timing does not reveal accounts.
        const ok = await verifyPassword(password, user?.passwordHash ?? DUMMY_PASSWORD_HASH);
        if (!user || !ok || !user.active) {
          const now = await throttle().signInFailed(email, address);
          if (now) throw new Error(`${THROTTLED_PREFIX} ${now.message}`);
          return null;
        }
        await throttle().signInSucceeded(email, address);
        const userAgent = typeof req?.headers?.["user-agent"] === "string" ? req.headers["user-agent"] : null;
        const sessionId = await startSession({ userId: user.id, organisationId: user.organisationId, userAgent });
        return {
          id: String(user.id),
          email: user.email,
          name: user.name,
          credentialStamp: credentialStampOf(user.passwordHash),
          sessionId,
        };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        const signedIn = user as { credentialStamp?: string | null; sessionId?: string };
        token.userId = Number(user.id);
        token.credentialStamp = signedIn.credentialStamp ?? null;
        token.sid = signedIn.sessionId;
        return token;
      }
      if (typeof token.userId !== "number") return token;
      // Every request that reads the session: the server-side session must still be open (not signed
      // out, not ended everywhere, not idle) and the password the same as at sign-in.
      const open = await sessionStillOpen(token.sid, token.userId);
      if (!open || (await currentCredentialStamp(db(), token.userId)) !== token.credentialStamp) {
        delete token.userId;
        delete token.sid;
      }
      return token;
    },
    async session({ session, token }) {
      if (typeof token.userId !== "number") return { ...session, user: undefined };
      if (session.user) session.user.id = token.userId;
      return session;
    },
  },
  events: {
    async signOut({ token }) {
      await finishSession(token?.sid);
    },
  },
};
