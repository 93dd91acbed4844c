import { data } from "react-router";

/** What a form post must be; said with the 415 when a body is something else. */
export const NOT_A_FORM = "Send the form as application/x-www-form-urlencoded or multipart/form-data.";

/**
 * The request's form. A body that is not a form (none, JSON, plain text, a broken multipart) is a
 * 415 saying what is accepted, never an error from deep in the action.
 */
export async function readForm(request: Request): Promise<FormData> {
  try {
    return await request.formData();
  } catch {
    throw data(NOT_A_FORM, { status: 415, headers: { "Cache-Control": "no-store" } });
  }
}

/** The text fields of a form, by name (the last of a repeated name; a file where text belongs is left out). */
export function textFields(form: FormData): Record<string, string> {
  return Object.fromEntries([...form.entries()].filter((e): e is [string, string] => typeof e[1] === "string"));
}

/** The request's form as text fields: `readForm`, then `textFields`. */
export async function readTextFields(request: Request): Promise<Record<string, string>> {
  return textFields(await readForm(request));
}
