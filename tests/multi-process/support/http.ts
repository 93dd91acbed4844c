/*
 * What a browser without JavaScript does, over plain fetch: sign in, send a request from the
 * configurator, read a form off a page and post it back with some fields changed. Every write
 * carries Origin = the public origin (APP_ORIGIN), as a browser on the balancer's address would.
 */
import sharp from "sharp";

export const DEMO_PASSWORD = "ember-demo-2026";
export const COMPANY = "cinder-slate";

export async function signIn(
  target: string,
  publicOrigin: string,
  email: string,
  password = DEMO_PASSWORD,
): Promise<string> {
  const res = await fetch(`${target}/login`, {
    method: "POST",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: publicOrigin },
    body: new URLSearchParams({ email, password }).toString(),
    redirect: "manual",
  });
  const cookie = res.headers.getSetCookie().find((c) => c.includes("="));
  if (!cookie || res.status >= 400)
    throw new Error(`Sign-in as ${email} at ${target} answered ${res.status} without a session cookie.`);
  return cookie.split(";")[0]!;
}

/** A small real JPEG (a gradient), made with sharp so it decodes like a phone photo would. */
export async function yardPhoto(seed = 0): Promise<Buffer> {
  const width = 64;
  const height = 48;
  const pixels = Buffer.alloc(width * height * 3);
  for (let i = 0; i < width * height; i++) {
    pixels[i * 3] = (i + seed * 37) % 256;
    pixels[i * 3 + 1] = (i * 3) % 256;
    pixels[i * 3 + 2] = 120;
  }
  return sharp(pixels, { raw: { width, height, channels: 3 } })
    .jpeg({ quality: 80 })
    .toBuffer();
}

export type LeadAnswer = { status: number; ref: string | null; location: string | null; backend: string | null };

/** Sends one homeowner request through the configurator form (multipart, optional photo). */
export async function sendLead(
  target: string,
  publicOrigin: string,
  args: { email: string; name?: string; photo?: Buffer },
): Promise<LeadAnswer> {
  const form = new FormData();
  form.set("customerName", args.name ?? "Multi Process Homeowner");
  form.set("email", args.email);
  form.set("phone", "970-555-0130");
  form.set("street", "12 Quarry Lane");
  form.set("town", "Millbrook");
  form.set("buildWindow", "this-season");
  form.set("consent", "on");
  form.set("design", "units=14");
  if (args.photo) form.append("photos", new Blob([new Uint8Array(args.photo)], { type: "image/jpeg" }), "yard.jpg");
  const res = await fetch(`${target}/c/${COMPANY}`, {
    method: "POST",
    headers: { Origin: publicOrigin },
    body: form,
    redirect: "manual",
  });
  await res.arrayBuffer().catch(() => undefined);
  const location = res.headers.get("location");
  const ref = res.status === 302 && location ? (/\/sent\/([^/?#]+)/.exec(location)?.[1] ?? null) : null;
  return { status: res.status, ref, location, backend: res.headers.get("x-emberwright-backend") };
}

const decode = (s: string) =>
  s
    .replace(/&quot;/g, '"')
    .replace(/&#x27;|&#39;/g, "'")
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&amp;/g, "&");
const attr = (tag: string, name: string) => {
  const m = new RegExp(`\\s${name}="([^"]*)"`, "i").exec(tag);
  return m ? decode(m[1]!) : null;
};

/** The value of every `<button name=…>` with that name on a page, in page order. */
export function buttonValues(html: string, name: string): string[] {
  return [...html.matchAll(/<button\b[^>]*>/gi)]
    .map(([tag]) => tag)
    .filter((tag) => attr(tag, "name") === name)
    .map((tag) => attr(tag, "value") ?? "");
}

/** The value of every `<input type="radio" name=…>` with that name on a page, in page order (the choices offered). */
export function radioValues(html: string, name: string): string[] {
  return [...html.matchAll(/<input\b[^>]*>/gi)]
    .map(([tag]) => tag)
    .filter((tag) => (attr(tag, "type") ?? "").toLowerCase() === "radio" && attr(tag, "name") === name)
    .map((tag) => attr(tag, "value") ?? "");
}

/**
 * The fields a browser would submit from the page's main POST form (the one with the most fields,
 * so not the sign-out button's): inputs (checkboxes and radios only when checked), selected
 * options, textareas. Buttons are left out.
 */
export function formFields(html: string): Record<string, string> {
  const forms = [...html.matchAll(/<form\b[^>]*method="post"[^>]*>([\s\S]*?)<\/form>/gi)].map((m) => fieldsOf(m[1]!));
  if (forms.length === 0) throw new Error("No POST form on the page.");
  return forms.sort((x, y) => Object.keys(y).length - Object.keys(x).length)[0]!;
}

function fieldsOf(form: string): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const [tag] of form.matchAll(/<input\b[^>]*>/gi)) {
    const name = attr(tag, "name");
    const type = (attr(tag, "type") ?? "text").toLowerCase();
    if (!name || type === "submit" || type === "button" || type === "file") continue;
    if ((type === "checkbox" || type === "radio") && !/\schecked(=|\s|>|\/)/i.test(tag)) continue;
    fields[name] = attr(tag, "value") ?? (type === "checkbox" ? "on" : "");
  }
  for (const [, open, body] of form.matchAll(/(<select\b[^>]*>)([\s\S]*?)<\/select>/gi)) {
    const name = attr(open!, "name");
    if (!name) continue;
    const options = [...body!.matchAll(/<option\b[^>]*>/gi)].map(([o]) => o);
    const chosen = options.find((o) => /\sselected(=|\s|>)/i.test(o)) ?? options[0];
    fields[name] = chosen ? (attr(chosen, "value") ?? "") : "";
  }
  for (const [, open, body] of form.matchAll(/(<textarea\b[^>]*>)([\s\S]*?)<\/textarea>/gi)) {
    const name = attr(open!, "name");
    if (name) fields[name] = decode(body!);
  }
  return fields;
}

/** Opens a page as a signed-in user, changes some of its form's fields and posts it back. */
export async function editForm(
  target: string,
  publicOrigin: string,
  cookie: string,
  pagePath: string,
  changes: Record<string, string>,
): Promise<Response> {
  const page = await fetch(`${target}${pagePath}`, { headers: { Cookie: cookie } });
  if (page.status !== 200) throw new Error(`${pagePath} answered ${page.status}.`);
  const fields = { ...formFields(await page.text()), ...changes };
  return fetch(`${target}${pagePath}`, {
    method: "POST",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: publicOrigin, Cookie: cookie },
    body: new URLSearchParams(fields).toString(),
    redirect: "manual",
  });
}

export async function postJson(
  target: string,
  pagePath: string,
  body: unknown,
  init: { cookie?: string; origin?: string } = {},
) {
  const headers: Record<string, string> = { "Content-Type": "application/json" };
  if (init.cookie) headers.Cookie = init.cookie;
  if (init.origin) headers.Origin = init.origin;
  const res = await fetch(`${target}${pagePath}`, { method: "POST", headers, body: JSON.stringify(body) });
  return {
    status: res.status,
    json: (await res.json()) as Record<string, unknown> & { price?: { lowCents: number; highCents: number } },
    backend: res.headers.get("x-emberwright-backend"),
  };
}
