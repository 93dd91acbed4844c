/**
 * Decoder for the bracketed form encoding the Stripe SDK sends (`a[b][0][c]=v`), and the same
 * shape in GET query strings. Arrays arrive indexed (`expand[0]=x`); `expand[]=x` also works.
 */

export type FormValue = string | FormValue[] | FormObject;
export interface FormObject {
  [key: string]: FormValue;
}

export class FormDecodeError extends Error {
  constructor(
    message: string,
    readonly param: string,
  ) {
    super(message);
  }
}

// Holds children under string keys until the whole body is read; turned into arrays at the end.
interface Branch {
  kind: "branch";
  children: Map<string, Branch | string>;
  appended: number;
}

function newBranch(): Branch {
  return { kind: "branch", children: new Map(), appended: 0 };
}

function decodeComponent(raw: string, whole: string): string {
  try {
    return decodeURIComponent(raw.replace(/\+/g, " "));
  } catch {
    throw new FormDecodeError(`Malformed percent-encoding in "${whole.slice(0, 80)}".`, whole.slice(0, 80));
  }
}

/** Splits `line_items[0][price_data]` into `["line_items", "0", "price_data"]`; `a[]` gives `["a", ""]`. */
export function splitFormKey(key: string): string[] {
  const open = key.indexOf("[");
  if (open <= 0) return [key];
  const segments = [key.slice(0, open)];
  const rest = key.slice(open);
  const pattern = /\[([^[\]]*)\]/gy;
  let consumed = 0;
  let match: RegExpExecArray | null;
  while ((match = pattern.exec(rest)) !== null) {
    segments.push(match[1]);
    consumed = pattern.lastIndex;
  }
  // Anything after the last well-formed bracket is kept as part of the final segment name.
  if (consumed !== rest.length) return [key];
  return segments;
}

/** Joins segments back into the bracketed name used in error messages: `line_items[0][quantity]`. */
export function formatFormKey(segments: readonly string[]): string {
  return (
    segments[0] +
    segments
      .slice(1)
      .map((s) => `[${s}]`)
      .join("")
  );
}

/** Parses an `application/x-www-form-urlencoded` body (or query string) into nested objects and arrays. */
export function parseFormBody(body: string): FormObject {
  const root = newBranch();
  if (body.length === 0) return {};
  for (const pair of body.split("&")) {
    if (pair === "") continue;
    const eq = pair.indexOf("=");
    const rawKey = eq === -1 ? pair : pair.slice(0, eq);
    const rawValue = eq === -1 ? "" : pair.slice(eq + 1);
    const key = decodeComponent(rawKey, pair);
    const value = decodeComponent(rawValue, pair);
    const segments = splitFormKey(key);
    let node = root;
    for (let i = 0; i < segments.length; i++) {
      let segment = segments[i];
      if (segment === "") segment = String(node.appended++);
      const isLast = i === segments.length - 1;
      const existing = node.children.get(segment);
      const path = formatFormKey(segments.slice(0, i + 1));
      if (isLast) {
        if (existing !== undefined && typeof existing !== "string") {
          throw new FormDecodeError(`Invalid value for ${path}: it is also given sub-keys.`, path);
        }
        node.children.set(segment, value);
      } else {
        if (typeof existing === "string") {
          throw new FormDecodeError(`Invalid value for ${path}: it is given both a value and sub-keys.`, path);
        }
        const next = existing ?? newBranch();
        node.children.set(segment, next);
        node = next;
      }
    }
  }
  return toObject(root);
}

function toValue(node: Branch | string): FormValue {
  if (typeof node === "string") return node;
  const keys = [...node.children.keys()];
  const isList = keys.length > 0 && keys.every((k) => /^(0|[1-9]\d{0,5})$/.test(k));
  if (isList) {
    return keys
      .map(Number)
      .sort((a, b) => a - b)
      .map((k) => toValue(node.children.get(String(k))!));
  }
  return toObject(node);
}

function toObject(node: Branch): FormObject {
  // Object.fromEntries defines own properties, so a key like "__proto__" stays plain data.
  return Object.fromEntries([...node.children].map(([k, v]) => [k, toValue(v)]));
}

/** Stable JSON of parsed parameters, used to tell whether two requests under one idempotency key match. */
export function fingerprintParams(value: FormValue | undefined): string {
  if (value === undefined) return "";
  if (typeof value === "string") return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(fingerprintParams).join(",")}]`;
  const keys = Object.keys(value).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${fingerprintParams(value[k])}`).join(",")}}`;
}
