import type { EmailTag, StoredAttachment } from "./store";

/** The error names the SDK types as RESEND_ERROR_CODE_KEY that this fake can produce. */
export type ApiErrorName =
  | "validation_error"
  | "missing_required_field"
  | "invalid_attachment"
  | "missing_api_key"
  | "invalid_api_key"
  | "invalid_idempotency_key"
  | "invalid_idempotent_request"
  | "not_found"
  | "method_not_allowed"
  | "rate_limit_exceeded"
  | "application_error";

/** The body the service answers with on any error; the SDK hands it back as `error` unchanged. */
export interface ApiError {
  statusCode: number;
  name: ApiErrorName;
  message: string;
}

export interface ParsedEmail {
  from: string;
  to: string[];
  cc: string[];
  bcc: string[];
  reply_to: string[];
  subject: string;
  html: string | null;
  text: string | null;
  headers: Record<string, string>;
  tags: EmailTag[];
  attachments: StoredAttachment[];
  scheduled_at: string | null;
}

export type ParseResult = { ok: true; email: ParsedEmail } | { ok: false; error: ApiError };

// The service caps `to` at 50 addresses per message; the same cap is applied to cc, bcc and reply_to.
export const MAX_RECIPIENTS = 50;
// The batch endpoint takes at most 100 messages per call.
export const MAX_BATCH_SIZE = 100;

const ADDRESS_HINT = "use `email@example.com` or `Name <email@example.com>`";

// Pragmatic address check: dot-atom local part, dotted host name with a 2–63 letter top-level label.
// Quoted local parts and IP-literal domains are valid in RFC 5322 but rejected here, as transactional
// mail never needs them.
const LOCAL_PART = "[A-Za-z0-9!#$%&'*+/=?^_`{|}~-]+(?:\\.[A-Za-z0-9!#$%&'*+/=?^_`{|}~-]+)*";
const DOMAIN = "(?:[A-Za-z0-9](?:[A-Za-z0-9-]{0,61}[A-Za-z0-9])?\\.)+[A-Za-z]{2,63}";
const BARE_ADDRESS = new RegExp(`^${LOCAL_PART}@${DOMAIN}$`);
const NAMED_ADDRESS = /^(.*?)\s*<([^<>]*)>$/;

// Tag names and values: ASCII letters, digits, underscores and dashes, at most 256 characters.
const TAG_PART = /^[A-Za-z0-9_-]{1,256}$/;
const BASE64 = /^[A-Za-z0-9+/]*={0,2}$/;

/** Splits `addr` or `Name <addr>` into its parts; null when the address part is not a valid address. */
export function parseMailbox(value: string): { name: string | null; address: string } | null {
  const trimmed = value.trim();
  if (trimmed.length === 0 || trimmed.length > 320 + 256) return null;
  const named = NAMED_ADDRESS.exec(trimmed);
  if (named) {
    const address = named[2].trim();
    if (!BARE_ADDRESS.test(address)) return null;
    const rawName = named[1].trim();
    const name =
      rawName.startsWith('"') && rawName.endsWith('"') && rawName.length >= 2 ? rawName.slice(1, -1) : rawName;
    if (/[<>\r\n]/.test(name)) return null;
    return { name: name.length > 0 ? name : null, address };
  }
  return BARE_ADDRESS.test(trimmed) ? { name: null, address: trimmed } : null;
}

/** Lower-cased bare address of `addr` or `Name <addr>`, for matching; the raw text when unparsable. */
export function bareAddress(value: string): string {
  return (parseMailbox(value)?.address ?? value.trim()).toLowerCase();
}

function fail(name: ApiErrorName, message: string, statusCode = 422): { ok: false; error: ApiError } {
  return { ok: false, error: { statusCode, name, message } };
}

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function isAbsent(value: unknown): boolean {
  return value === undefined || value === null;
}

function parseAddressList(
  field: string,
  value: unknown,
  required: boolean,
): { ok: true; list: string[] } | { ok: false; error: ApiError } {
  if (isAbsent(value) || value === "" || (Array.isArray(value) && value.length === 0)) {
    return required ? fail("missing_required_field", `Missing \`${field}\` field.`) : { ok: true, list: [] };
  }
  const items = typeof value === "string" ? [value] : value;
  if (!Array.isArray(items) || !items.every((item) => typeof item === "string")) {
    return fail("validation_error", `Invalid \`${field}\` field: give one address as a string or an array of strings.`);
  }
  if (items.length > MAX_RECIPIENTS) {
    return fail(
      "validation_error",
      `Invalid \`${field}\` field: ${items.length} addresses given, at most ${MAX_RECIPIENTS} are allowed.`,
    );
  }
  for (const item of items) {
    if (!parseMailbox(item)) {
      return fail(
        "validation_error",
        `Invalid \`${field}\` field: ${JSON.stringify(item)} is not an address; ${ADDRESS_HINT}.`,
      );
    }
  }
  return { ok: true, list: items.map((item) => item.trim()) };
}

function parseOptionalString(
  field: string,
  value: unknown,
): { ok: true; value: string | null } | { ok: false; error: ApiError } {
  if (isAbsent(value)) return { ok: true, value: null };
  if (typeof value !== "string") return fail("validation_error", `Invalid \`${field}\` field: it must be a string.`);
  return { ok: true, value };
}

// A small extension map is enough to label what an estimating app attaches (calendar invites, PDFs, photos).
const CONTENT_TYPES: Record<string, string> = {
  ics: "text/calendar",
  pdf: "application/pdf",
  png: "image/png",
  jpg: "image/jpeg",
  jpeg: "image/jpeg",
  webp: "image/webp",
  gif: "image/gif",
  svg: "image/svg+xml",
  txt: "text/plain",
  csv: "text/csv",
  html: "text/html",
  json: "application/json",
  zip: "application/zip",
};

/** MIME type guessed from a file name's extension; application/octet-stream when unknown. */
export function guessContentType(filename: string): string {
  const extension = filename.includes(".") ? filename.split(".").pop()!.toLowerCase() : "";
  return CONTENT_TYPES[extension] ?? "application/octet-stream";
}

function parseAttachments(value: unknown): { ok: true; list: StoredAttachment[] } | { ok: false; error: ApiError } {
  if (isAbsent(value)) return { ok: true, list: [] };
  if (!Array.isArray(value)) return fail("validation_error", "Invalid `attachments` field: it must be an array.");
  const list: StoredAttachment[] = [];
  for (const [index, item] of value.entries()) {
    const field = `attachments[${index}]`;
    if (!isPlainObject(item))
      return fail("invalid_attachment", `Invalid \`${field}\`: each attachment must be an object.`);
    const { content, path, filename, content_type: contentType, content_id: contentId } = item;
    if (!isAbsent(filename) && (typeof filename !== "string" || filename.trim() === "")) {
      return fail("invalid_attachment", `Invalid \`${field}.filename\`: it must be a non-empty string.`);
    }
    if (!isAbsent(contentType) && (typeof contentType !== "string" || !/^[\w.+-]+\/[\w.+-]+/.test(contentType))) {
      return fail(
        "invalid_attachment",
        `Invalid \`${field}.content_type\`: expected a MIME type such as text/calendar.`,
      );
    }
    if (!isAbsent(contentId) && typeof contentId !== "string") {
      return fail("invalid_attachment", `Invalid \`${field}.content_id\`: it must be a string.`);
    }
    let bytes: Buffer;
    let remotePath: string | null = null;
    if (typeof content === "string") {
      const compact = content.replace(/\s+/g, "");
      if (compact.length % 4 === 1 || !BASE64.test(compact)) {
        return fail("invalid_attachment", `Invalid \`${field}.content\`: it must be base64-encoded.`);
      }
      bytes = Buffer.from(compact, "base64");
    } else if (!isAbsent(content)) {
      return fail("invalid_attachment", `Invalid \`${field}.content\`: it must be a base64 string.`);
    } else if (typeof path === "string" && path.trim() !== "") {
      // The real service downloads `path`; this fake never fetches remote URLs and records the link only.
      bytes = Buffer.alloc(0);
      remotePath = path;
    } else {
      return fail(
        "invalid_attachment",
        `Invalid \`${field}\`: an attachment needs either \`content\` (base64) or \`path\`.`,
      );
    }
    const name = typeof filename === "string" ? filename.trim() : `attachment-${index + 1}`;
    list.push({
      filename: name,
      contentType: typeof contentType === "string" ? contentType : guessContentType(name),
      size: bytes.length,
      contentId: typeof contentId === "string" ? contentId : null,
      path: remotePath,
      contentBase64: bytes.toString("base64"),
    });
  }
  return { ok: true, list };
}

/**
 * Validates one message in the JSON shape the resend SDK posts (snake_case: reply_to, scheduled_at,
 * attachments[].content_type) and normalises it for storage. Batch messages may not carry
 * attachments or scheduled_at, as on the service.
 */
export function parseEmailPayload(body: unknown, options: { isBatch: boolean }): ParseResult {
  if (!isPlainObject(body))
    return fail("validation_error", "The request body must be a JSON object describing one e-mail.");

  if (!isAbsent(body.template)) {
    return fail(
      "validation_error",
      "Invalid `template` field: this local fake does not render hosted templates; send `html` or `text`.",
    );
  }

  if (isAbsent(body.from) || body.from === "") return fail("missing_required_field", "Missing `from` field.");
  if (typeof body.from !== "string" || !parseMailbox(body.from)) {
    return fail("validation_error", `Invalid \`from\` field: ${ADDRESS_HINT}.`);
  }

  const to = parseAddressList("to", body.to, true);
  if (!to.ok) return to;
  const cc = parseAddressList("cc", body.cc, false);
  if (!cc.ok) return cc;
  const bcc = parseAddressList("bcc", body.bcc, false);
  if (!bcc.ok) return bcc;
  const replyTo = parseAddressList("reply_to", body.reply_to, false);
  if (!replyTo.ok) return replyTo;

  if (!isAbsent(body.subject) && typeof body.subject !== "string") {
    return fail("validation_error", "Invalid `subject` field: it must be a string.");
  }
  if (typeof body.subject !== "string" || body.subject.trim() === "") {
    return fail("missing_required_field", "Missing `subject` field.");
  }

  const html = parseOptionalString("html", body.html);
  if (!html.ok) return html;
  const text = parseOptionalString("text", body.text);
  if (!text.ok) return text;
  if (!html.value && !text.value) return fail("missing_required_field", "Missing `html` or `text` field.");

  let headers: Record<string, string> = {};
  if (!isAbsent(body.headers)) {
    if (!isPlainObject(body.headers) || !Object.values(body.headers).every((value) => typeof value === "string")) {
      return fail("validation_error", "Invalid `headers` field: it must be an object whose values are strings.");
    }
    headers = body.headers as Record<string, string>;
    for (const [name, value] of Object.entries(headers)) {
      if (!/^[!#$%&'*+.^_`|~0-9A-Za-z-]+$/.test(name) || /[\r\n]/.test(value)) {
        return fail("validation_error", `Invalid \`headers\` field: ${JSON.stringify(name)} is not a valid header.`);
      }
    }
  }

  const tags: EmailTag[] = [];
  if (!isAbsent(body.tags)) {
    if (!Array.isArray(body.tags))
      return fail("validation_error", "Invalid `tags` field: it must be an array of { name, value }.");
    for (const [index, tag] of body.tags.entries()) {
      if (!isPlainObject(tag))
        return fail("validation_error", `Invalid \`tags[${index}]\`: it must be an object { name, value }.`);
      for (const part of ["name", "value"] as const) {
        const value = tag[part];
        if (typeof value !== "string" || !TAG_PART.test(value)) {
          return fail(
            "validation_error",
            `Invalid \`tags[${index}].${part}\`: use 1–256 ASCII letters, digits, underscores or dashes.`,
          );
        }
      }
      tags.push({ name: tag.name as string, value: tag.value as string });
    }
  }

  if (options.isBatch && !isAbsent(body.attachments)) {
    return fail(
      "validation_error",
      "Invalid `attachments` field: attachments are not supported on the batch endpoint.",
    );
  }
  if (options.isBatch && !isAbsent(body.scheduled_at)) {
    return fail("validation_error", "Invalid `scheduled_at` field: scheduling is not supported on the batch endpoint.");
  }
  const attachments = parseAttachments(body.attachments);
  if (!attachments.ok) return attachments;

  const scheduledAt = parseOptionalString("scheduled_at", body.scheduled_at);
  if (!scheduledAt.ok) return scheduledAt;

  return {
    ok: true,
    email: {
      from: body.from.trim(),
      to: to.list,
      cc: cc.list,
      bcc: bcc.list,
      reply_to: replyTo.list,
      subject: body.subject,
      html: html.value || null,
      text: text.value || null,
      headers,
      tags,
      attachments: attachments.list,
      scheduled_at: scheduledAt.value,
    },
  };
}
