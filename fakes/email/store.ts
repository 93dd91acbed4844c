import { mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { dirname } from "node:path";
import { bareAddress, type ParsedEmail } from "./validate";

export interface EmailTag {
  name: string;
  value: string;
}

export interface StoredAttachment {
  filename: string;
  contentType: string;
  /** Decoded size in bytes. */
  size: number;
  contentId: string | null;
  /** Remote URL given instead of content; never fetched by the fake. */
  path: string | null;
  contentBase64: string;
}

/** A message as kept: what the request carried, plus what the service adds on acceptance. */
export interface StoredMessage extends ParsedEmail {
  id: string;
  /** ISO 8601, UTC. */
  created_at: string;
  idempotency_key: string | null;
  /** "emails" or "emails/batch": which endpoint accepted it. */
  endpoint: string;
}

/** What a send with an idempotency key answered, so a retry gets the same answer. */
export interface IdempotencyRecord {
  key: string;
  endpoint: string;
  /** sha256 of the canonical JSON body: a retry must match it exactly. */
  bodyHash: string;
  /** Epoch milliseconds. */
  createdAtMs: number;
  response: unknown;
}

interface PersistedState {
  version: 1;
  messages: StoredMessage[];
  idempotency: IdempotencyRecord[];
}

// The service remembers idempotency keys for 24 hours.
export const IDEMPOTENCY_TTL_MS = 24 * 60 * 60 * 1000;

/**
 * Messages and idempotency records, in memory and, when a data file is given, mirrored to it after
 * every change. Writes are synchronous and atomic (temp file + rename) so a crash or restart right
 * after a send still has the message.
 */
export class MessageStore {
  private messages: StoredMessage[] = [];
  private idempotency = new Map<string, IdempotencyRecord>();

  constructor(private readonly dataFile?: string) {
    if (dataFile) this.load(dataFile);
  }

  private load(dataFile: string): void {
    let raw: string;
    try {
      raw = readFileSync(dataFile, "utf8");
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === "ENOENT") return;
      throw error;
    }
    let state: PersistedState;
    try {
      state = JSON.parse(raw) as PersistedState;
    } catch (error) {
      // Refuse to start rather than overwrite a file someone may want to inspect.
      throw new Error(
        `email fake: ${dataFile} is not valid JSON (${(error as Error).message}); move it away to start empty`,
      );
    }
    if (state?.version !== 1 || !Array.isArray(state.messages) || !Array.isArray(state.idempotency)) {
      throw new Error(
        `email fake: ${dataFile} is not an e-mail fake data file (version 1); move it away to start empty`,
      );
    }
    this.messages = state.messages;
    for (const record of state.idempotency) this.idempotency.set(record.key, record);
  }

  private persist(): void {
    if (!this.dataFile) return;
    const state: PersistedState = { version: 1, messages: this.messages, idempotency: [...this.idempotency.values()] };
    mkdirSync(dirname(this.dataFile), { recursive: true });
    const temporary = `${this.dataFile}.${process.pid}.tmp`;
    writeFileSync(temporary, JSON.stringify(state));
    renameSync(temporary, this.dataFile);
  }

  /** Stores the messages of one accepted request and, if it carried a key, its answer; one write. */
  add(messages: StoredMessage[], record?: IdempotencyRecord): void {
    this.messages.push(...messages);
    if (record) {
      this.pruneIdempotency(record.createdAtMs);
      this.idempotency.set(record.key, record);
    }
    this.persist();
  }

  /** The live record for `key`, or undefined when unknown or older than 24 hours. */
  findIdempotency(key: string, nowMs: number): IdempotencyRecord | undefined {
    const record = this.idempotency.get(key);
    if (!record || nowMs - record.createdAtMs >= IDEMPOTENCY_TTL_MS) return undefined;
    return record;
  }

  private pruneIdempotency(nowMs: number): void {
    for (const [key, record] of this.idempotency) {
      if (nowMs - record.createdAtMs >= IDEMPOTENCY_TTL_MS) this.idempotency.delete(key);
    }
  }

  /** Newest first; `to` matches the bare address in to, cc or bcc, ignoring case and display names. */
  list(filter: { to?: string } = {}): StoredMessage[] {
    const wanted = filter.to ? bareAddress(filter.to) : null;
    const matching = wanted
      ? this.messages.filter((message) =>
          [...message.to, ...message.cc, ...message.bcc].some((recipient) => bareAddress(recipient) === wanted),
        )
      : this.messages;
    // Stored in arrival order, so reversing gives newest first even when two share a millisecond.
    return [...matching].reverse();
  }

  get(id: string): StoredMessage | undefined {
    return this.messages.find((message) => message.id === id);
  }

  get size(): number {
    return this.messages.length;
  }

  /** Forgets every message and idempotency key (a key must not point at a deleted message). */
  clear(): number {
    const count = this.messages.length;
    this.messages = [];
    this.idempotency.clear();
    this.persist();
    return count;
  }
}
