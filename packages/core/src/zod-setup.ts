import { z } from "zod";

/**
 * In the browser, zod must not compile parsers with `new Function`: the app's Content Security Policy
 * allows no eval (apps/web/src/lib/security-headers.ts), and even zod's caught probe for it is reported
 * as a policy violation. Imported first by the package entry, before any schema is built. The server
 * keeps zod's compiled fast path.
 */
if (typeof window !== "undefined") z.config({ jitless: true });
