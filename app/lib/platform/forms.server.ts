import { data } from "react-router";
import { toCleanLines } from "~/lib/format/clean-text";

/** What a form post must be; said with the 415 when a body is something else. */
export const NOT_A_FORM = "Send the form as application/x-www-form-urlencoded or multipart/form-data.";

/** Fields kept exactly as typed: a password and its confirmation must match what is hashed. */
const KEPT_AS_TYPED = /password|^confirm$/i;

/**
 * The request's form, its text cleaned. A body that is not a form (none, JSON, plain text, a broken
 * multipart) is a 415 saying what is accepted, never an error from deep in the action.
 *
 * Every text field loses its control characters (tabs and line breaks stay, CRLF becomes LF), its
 * bidirectional overrides and its zero-width spaces before any check reads it, so "at least 3
 * characters" counts characters a reader sees, and nothing hidden reaches a PDF, an e-mail or a
 * signature. A password and its confirmation are left exactly as typed.
 */
export async function readForm(request: Request): Promise<FormData> {
  let raw: FormData;
  try {
    raw = await request.formData();
  } catch {
    throw data(NOT_A_FORM, { status: 415, headers: { "Cache-Control": "no-store" } });
  }
  const form = new FormData();
  for (const [name, value] of raw.entries())
    form.append(name, typeof value === "string" && !KEPT_AS_TYPED.test(name) ? toCleanLines(value) : value);
  return form;
}

/** The text fields of a form, by name (the last of a repeated name; a file where text belongs is left out). */
export function textFields(form: FormData): Record<string, string> {
  return Object.fromEntries([...form.entries()].filter((e): e is [string, string] => typeof e[1] === "string"));
}

/** The request's form as text fields: `readForm`, then `textFields`. */
export async function readTextFields(request: Request): Promise<Record<string, string>> {
  return textFields(await readForm(request));
}
