import { useCallback, useEffect, useMemo, useRef, useState, useSyncExternalStore } from "react";
import { useHydrated } from "~/components/use-browser-value";

/*
 * The build's checklist on a phone on site. A tick is kept on the phone first (localStorage, with its
 * own id and the phone's time) and sent when there is signal: at once, when the browser says it is
 * back online, when the page opens and every 20 seconds. The server keeps each change once and,
 * per step, the one the phone made last, so a change that waited in a pocket cannot undo a later one.
 */

export type ChecklistStep = { key: string; title: string; detail: string };
export type SavedTick = { done: boolean; changedAt: string; byName: string | null };
type QueuedChange = { clientId: string; stepKey: string; done: boolean; changedAt: string };
type SyncAnswer = {
  applied: string[];
  superseded: string[];
  refused: { clientId: string; message: string }[];
  ticks: Record<string, SavedTick>;
};

const RETRY_MS = 20_000;
const storageKey = (leadId: number) => `emberwright:job-ticks:${leadId}`;

// The queue lives in localStorage; if the browser refuses storage it lives in memory while the page is open.
const memory = new Map<string, string>();
const listeners = new Set<() => void>();

function readRaw(leadId: number): string {
  try {
    return window.localStorage.getItem(storageKey(leadId)) ?? memory.get(storageKey(leadId)) ?? "[]";
  } catch {
    return memory.get(storageKey(leadId)) ?? "[]";
  }
}

function parseQueue(raw: string): QueuedChange[] {
  try {
    const value: unknown = JSON.parse(raw);
    return Array.isArray(value)
      ? value.filter(
          (c): c is QueuedChange =>
            c !== null &&
            typeof c === "object" &&
            typeof c.clientId === "string" &&
            typeof c.stepKey === "string" &&
            typeof c.done === "boolean" &&
            typeof c.changedAt === "string",
        )
      : [];
  } catch {
    return [];
  }
}

const readQueue = (leadId: number) => parseQueue(readRaw(leadId));

function writeQueue(leadId: number, queue: QueuedChange[]) {
  const key = storageKey(leadId);
  try {
    if (queue.length) window.localStorage.setItem(key, JSON.stringify(queue));
    else window.localStorage.removeItem(key);
    memory.delete(key);
  } catch {
    if (queue.length) memory.set(key, JSON.stringify(queue));
    else memory.delete(key);
  }
  for (const listener of listeners) listener();
}

function subscribe(listener: () => void) {
  listeners.add(listener);
  // Another tab of the same job changes the queue too.
  window.addEventListener("storage", listener);
  return () => {
    listeners.delete(listener);
    window.removeEventListener("storage", listener);
  };
}

/** Per step, the later of two records (the server keeps the latest change by the phone's time too). */
function mergeTicks(a: Record<string, SavedTick>, b: Record<string, SavedTick>): Record<string, SavedTick> {
  const merged = { ...a };
  for (const [key, tick] of Object.entries(b)) {
    const held = merged[key];
    if (!held || held.changedAt <= tick.changedAt) merged[key] = tick;
  }
  return merged;
}

/** A v4 UUID; randomUUID needs a secure page, so a plain-http address on a LAN gets the same from random bytes. */
function newClientId(): string {
  if (typeof crypto.randomUUID === "function") return crypto.randomUUID();
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (b[6]! & 0x0f) | 0x40;
  b[8] = (b[8]! & 0x3f) | 0x80;
  const hex = [...b].map((x) => x.toString(16).padStart(2, "0")).join("");
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;
}

export function JobChecklist({
  leadId,
  steps,
  ticks,
  canRecord,
}: {
  leadId: number;
  steps: ChecklistStep[];
  ticks: Record<string, SavedTick>;
  canRecord: boolean;
}) {
  // What the last sync answered; the loader's ticks are newer after a reload or another post.
  const [synced, setSynced] = useState<Record<string, SavedTick>>({});
  const saved = useMemo(() => mergeTicks(ticks, synced), [ticks, synced]);
  const raw = useSyncExternalStore(
    subscribe,
    () => readRaw(leadId),
    () => "[]",
  );
  const queue = useMemo(() => parseQueue(raw), [raw]);
  const isReady = useHydrated();
  const [problem, setProblem] = useState<string | null>(null);
  const sending = useRef(false);

  const flush = useCallback(async () => {
    if (sending.current) return;
    const pending = readQueue(leadId);
    if (pending.length === 0) return;
    sending.current = true;
    try {
      const response = await fetch(`/app/jobs/${leadId}/ticks`, {
        method: "POST",
        headers: { "Content-Type": "application/json", Accept: "application/json" },
        body: JSON.stringify({ changes: pending }),
        credentials: "same-origin",
      });
      const body = (await response.json().catch(() => null)) as
        (SyncAnswer & { errors?: { message: string }[] }) | null;
      if (response.ok && body) {
        const answered = new Set([...body.applied, ...body.superseded, ...body.refused.map((r) => r.clientId)]);
        const left = readQueue(leadId).filter((c) => !answered.has(c.clientId));
        writeQueue(leadId, left);
        setSynced(body.ticks);
        setProblem(body.refused[0]?.message ?? null);
      } else if (response.status === 400 || response.status === 413) {
        // The server cannot read these changes and never will: drop them rather than resend forever.
        const sent = new Set(pending.map((c) => c.clientId));
        const left = readQueue(leadId).filter((c) => !sent.has(c.clientId));
        writeQueue(leadId, left);
        setProblem(`Some ticks could not be saved: ${body?.errors?.[0]?.message ?? "the server refused them"}.`);
      } else if (response.status === 401) {
        setProblem("Sign in again to send the ticks kept on this phone.");
      } else if (response.status === 403 || response.status === 404) {
        setProblem("This job is no longer open to you, so the ticks kept on this phone cannot be sent.");
      } else {
        setProblem("The server could not take the ticks just now. They stay on this phone and will be sent again.");
      }
    } catch {
      // No signal: the changes stay queued for the next try.
    } finally {
      sending.current = false;
    }
  }, [leadId]);

  useEffect(() => {
    // Changes left from an earlier visit go as soon as the page is up, then on signal and on a timer.
    const first = window.setTimeout(() => void flush(), 0);
    const onOnline = () => void flush();
    window.addEventListener("online", onOnline);
    const timer = window.setInterval(() => void flush(), RETRY_MS);
    return () => {
      window.clearTimeout(first);
      window.removeEventListener("online", onOnline);
      window.clearInterval(timer);
    };
  }, [leadId, flush]);

  const toggle = (stepKey: string, done: boolean) => {
    const change = { clientId: newClientId(), stepKey, done, changedAt: new Date().toISOString() };
    const next = [...readQueue(leadId), change];
    writeQueue(leadId, next);
    void flush();
  };

  const latestQueued = (stepKey: string) =>
    queue
      .filter((c) => c.stepKey === stepKey)
      .sort((a, b) => (a.changedAt < b.changedAt ? -1 : 1))
      .at(-1);
  const doneCount = steps.filter((s) => latestQueued(s.key)?.done ?? saved[s.key]?.done ?? false).length;

  return (
    <div>
      <p className="text-base font-bold text-char-900">
        {doneCount} of {steps.length} done.{" "}
        <span role="status" className="font-semibold text-char-700">
          {queue.length
            ? `${queue.length === 1 ? "1 change is" : `${queue.length} changes are`} saved on this phone and will be sent when there is signal.`
            : ""}
        </span>
      </p>
      {problem ? (
        <p role="alert" className="mt-2 rounded-lg border-2 border-alert-600 bg-alert-100 p-3 font-bold text-alert-700">
          {problem}
        </p>
      ) : null}
      <ol className="mt-3 flex flex-col gap-2">
        {steps.map((step, i) => {
          const queued = latestQueued(step.key);
          const held = saved[step.key];
          const done = queued?.done ?? held?.done ?? false;
          const state = queued ? "Saved on this phone, will send" : held ? "Saved" : "";
          const id = `step-${step.key}`;
          return (
            <li
              key={step.key}
              className={`rounded-xl border-2 ${done ? "border-moss-600 bg-moss-100" : "border-char-800 bg-white"}`}
            >
              <label htmlFor={id} className="flex min-h-14 cursor-pointer items-start gap-3 p-3">
                <input
                  id={id}
                  type="checkbox"
                  checked={done}
                  disabled={!canRecord || !isReady}
                  onChange={(e) => toggle(step.key, e.target.checked)}
                  aria-describedby={`${id}-detail ${id}-state`}
                  className="mt-0.5 size-8 shrink-0 accent-moss-700"
                />
                <span className="min-w-0 flex-1">
                  <span className="block text-lg leading-snug font-extrabold text-char-900">
                    {i + 1}. {step.title}
                  </span>
                  <span id={`${id}-detail`} className="mt-0.5 block text-base text-char-800">
                    {step.detail}
                  </span>
                  <span
                    id={`${id}-state`}
                    data-testid={`state-${step.key}`}
                    className={`mt-1 block text-sm font-bold ${queued ? "text-ember-700" : "text-moss-700"}`}
                  >
                    {state}
                    {!queued && held?.byName ? ` · ${held.done ? "ticked" : "unticked"} by ${held.byName}` : ""}
                  </span>
                </span>
              </label>
            </li>
          );
        })}
      </ol>
    </div>
  );
}
