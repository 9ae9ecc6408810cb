import { z } from "zod";

/**
 * Free text as every input schema takes it. Bidirectional control characters are removed (they
 * make a name or a file name display in a different order than it is stored, e.g. "invoice‮fdp.exe"
 * shown as "invoiceexe.pdf"); a NUL byte is refused (it truncates text in C-based tools and some
 * databases); a value made only of invisible characters (zero-width or format characters, with or
 * without spaces) is refused, because it looks empty on every screen while counting as entered.
 * Plain whitespace-only values are left to the field: a required field calls them missing, an
 * optional one treats them as not entered.
 */

/** U+202A–U+202E (embeddings, overrides), U+2066–U+2069 (isolates), U+200E/U+200F (marks), U+061C (Arabic letter mark). */
const BIDI_CONTROLS = /[\u202A-\u202E\u2066-\u2069\u200E\u200F\u061C]/g;

/** Characters that draw nothing: whitespace, control and format characters (zero-width space/joiners, BOM, soft hyphen …) and blank fillers. */
const INVISIBLE = /^[\s\p{Cc}\p{Cf}\p{Zs}\p{Zl}\p{Zp}\u115F\u1160\u2800\u3164\uFFA0]*$/u;

export function stripBidiControls(value: string): string {
  return value.replace(BIDI_CONTROLS, "");
}

/** True when the text has characters but none of them can be seen (and not only plain whitespace). */
export function isInvisibleOnly(value: string): boolean {
  return value.length > 0 && INVISIBLE.test(value) && value.trim().length > 0;
}

export const NUL_MESSAGE = "Remove the NUL character: it is not allowed in text";
export const INVISIBLE_MESSAGE = "Enter visible text: this only contains invisible characters";

/** The checks of `text()` as plain functions, for text that does not pass through a schema. */
export function textProblem(value: string): string | null {
  if (value.includes("\u0000")) return NUL_MESSAGE;
  if (isInvisibleOnly(stripBidiControls(value))) return INVISIBLE_MESSAGE;
  return null;
}

/**
 * A string schema for any text field: `text({ error }).trim().min(1, …).max(200, …)` chains like
 * `z.string()`. The bidi controls are removed before the length checks count characters.
 */
export const text = (params?: Parameters<typeof z.string>[0]) =>
  z
    .string(params)
    .overwrite(stripBidiControls)
    .superRefine((value, ctx) => {
      if (value.includes("\u0000")) ctx.addIssue({ code: "custom", message: NUL_MESSAGE });
      else if (isInvisibleOnly(value)) ctx.addIssue({ code: "custom", message: INVISIBLE_MESSAGE });
    });

/** An uploaded file's name, as shown back to people: the same cleaning, and at most 255 characters. */
export const fileNameText = text({ error: "The file has no name" })
  .trim()
  .min(1, "The file has no name")
  .max(255, "The file name is too long");
