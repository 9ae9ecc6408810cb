import "server-only";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import bcrypt from "bcryptjs";
import { z } from "zod";
import { findUserForSignIn } from "@coldtrail/db";
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
        return { id: String(user.id), email: user.email, name: user.name };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) token.userId = Number(user.id);
      return token;
    },
    async session({ session, token }) {
      if (session.user && typeof token.userId === "number") session.user.id = token.userId;
      return session;
    },
  },
};
