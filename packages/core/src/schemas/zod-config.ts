import { z } from "zod";

// In the browser zod compiles object parsers with `new Function` unless told not to; even its
// feature probe is reported as a violation by the app's Content-Security-Policy (no 'unsafe-eval').
// Schemas read this setting when they are built, so this module is imported before any schema.
if (typeof window !== "undefined") z.config({ jitless: true });
