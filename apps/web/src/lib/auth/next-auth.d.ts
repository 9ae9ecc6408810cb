import "next-auth";
import "next-auth/jwt";

declare module "next-auth" {
  interface Session {
    user?: { id?: number; name?: string | null; email?: string | null; image?: string | null };
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    userId?: number;
    /** Fingerprint of the password hash the session was opened with (see currentCredentialStamp). */
    credentialStamp?: string | null;
    /** The random id of the server-side session (see lib/auth/sessions.ts); revoking it ends the session. */
    sid?: string;
  }
}
