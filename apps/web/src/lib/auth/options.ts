import "server-only";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import bcrypt from "bcryptjs";
import { z } from "zod";
import { credentialStampOf, currentCredentialStamp, findUserForSignIn } from "@coldtrail/db";
import { db } from "../db";
import { env } from "../env";

const credentials = z.object({
  email: z.string().trim().toLowerCase().email(),
  password: z.string().min(1).max(200),
});

export const authOptions: NextAuthOptions = {
  secret: env.NEXTAUTH_SECRET,
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
  pages: { signIn: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "Email and password",
      credentials: {
        email: { label: "Email", type: "email" },
        password: { label: "Password", type: "password" },
      },
      async authorize(raw) {
        const parsed = credentials.safeParse(raw);
        if (!parsed.success) return null;
        const user = await findUserForSignIn(db(), parsed.data.email);
        // Compare against a dummy hash when the user is unknown so timing does not reveal accounts.
        const hash = user?.passwordHash ?? "$2b$10$QDffZTER43.CMZeTT4IEVuwOw/lL8BIXPUIgpjgYEeRb78UzHh5wC";
        const ok = await bcrypt.compare(parsed.data.password, hash);
        if (!user || !ok || !user.active) return null;
        return { id: String(user.id), email: user.email, name: user.name, credentialStamp: credentialStampOf(user.passwordHash) };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        token.userId = Number(user.id);
        token.credentialStamp = (user as { credentialStamp?: string | null }).credentialStamp ?? null;
        return token;
      }
      // A session opened before the password changed (or the person was deactivated) ends here.
      if (typeof token.userId === "number" && (await currentCredentialStamp(db(), token.userId)) !== token.credentialStamp) {
        delete token.userId;
      }
      return token;
    },
    async session({ session, token }) {
      if (typeof token.userId !== "number") return { ...session, user: undefined };
      if (session.user) session.user.id = token.userId;
      return session;
    },
  },
};
