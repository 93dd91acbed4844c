/**
 * What a visitor does before the page is interactive. The page is drawn from the server's HTML and
 * its code starts after the first paint; until React takes the page over, a ticked box or a typed
 * field changes only the HTML control, and a plain button does nothing. Without help React would
 * then keep its own state (the total without the ticked add-on, the design without the typed
 * distance) while the control shows the visitor's choice.
 *
 * A few lines at the top of the body note every control that changes and every plain button that is
 * pressed, until the entry script takes the notes just before hydrating. Once the page has hydrated,
 * each noted control whose value differs from what React rendered is handed to React as a change,
 * and each noted button is pressed again, in order.
 */

/** The recorder, inline at the top of <body> (it needs no other code and runs before the first paint). */
export const EARLY_INPUT_RECORDER =
  "(function(){var d=document,r=[],t=['input','change','click'];" +
  "function k(e){r.push({type:e.type,target:e.target})}" +
  "t.forEach(function(n){d.addEventListener(n,k,true)});" +
  "window.__earlyInput={stop:function(){t.forEach(function(n){d.removeEventListener(n,k,true)});" +
  "window.__earlyInput=undefined;return r}}})()";

export type EarlyEvent = { type: string; target: EventTarget | null };
type Recorder = { stop(): EarlyEvent[] };

let pending: EarlyEvent[] = [];

/** Ends the recording (call right before hydrateRoot: from then on React sees events itself). */
export function stopEarlyInput(win: Window & { __earlyInput?: Recorder } = window): void {
  pending = win.__earlyInput?.stop() ?? [];
}

const NOT_TYPED = new Set(["hidden", "file", "submit", "button", "reset", "image"]);

/**
 * Hands what was recorded to React; call once, after hydration (an effect in the root). What the
 * visitor chose is read from every noted control first, before React renders anything again (a
 * controlled field re-rendered with React's value would lose the visitor's). Then each change goes
 * in a task of its own, after the one before has been rendered, as the visitor's own events would
 * have: handlers that build on the state they were rendered with see each other's changes.
 */
export async function replayEarlyInput(events: EarlyEvent[] = takePending()): Promise<void> {
  const controls = new Set<Element>();
  const presses: HTMLButtonElement[] = [];
  for (const { type, target } of events) {
    if (!(target instanceof Element)) continue;
    if (type === "click") {
      const button = target.closest("button");
      if (button?.type === "button") presses.push(button);
    } else if (target.matches("input, select, textarea")) {
      controls.add(target);
    }
  }
  const steps: (() => void)[] = [];
  for (const control of controls) {
    const step = handOverStep(control);
    if (step) steps.push(step);
  }
  for (const button of presses) steps.push(() => button.isConnected && !button.disabled && button.click());
  for (const step of steps) {
    await nextTask();
    step();
  }
}

const nextTask = () => new Promise<void>((resolve) => setTimeout(resolve, 0));

function takePending(): EarlyEvent[] {
  const events = pending;
  pending = [];
  return events;
}

/**
 * The visitor's value of one control, taken now, and the step that gives it to React, or null when
 * it is what React rendered. React listens for the events a browser sends and compares the control's
 * value with the one it last saw (its value tracker, which watches the value and checked setters):
 * so the step first sets a different value through those setters, then the visitor's the way a
 * browser sets it, with the event the browser would have sent.
 */
function handOverStep(control: Element): (() => void) | null {
  if (control instanceof HTMLSelectElement) {
    if (control.disabled || [...control.options].every((option) => option.selected === option.defaultSelected))
      return null;
    const chosen = [...control.options].map((option) => option.selected);
    return () => {
      if (!control.isConnected) return;
      if (control.options.length === chosen.length)
        chosen.forEach((selected, i) => (control.options[i]!.selected = selected));
      control.dispatchEvent(new Event("change", { bubbles: true }));
    };
  }
  if (!(control instanceof HTMLInputElement || control instanceof HTMLTextAreaElement) || control.disabled) return null;
  if (control instanceof HTMLInputElement && (control.type === "checkbox" || control.type === "radio")) {
    const chosen = control.checked;
    // Of a radio group only the one now chosen is handed over; the others follow it.
    if (chosen === control.defaultChecked || (control.type === "radio" && !chosen)) return null;
    return () => {
      if (!control.isConnected) return;
      control.checked = !chosen;
      control.click();
    };
  }
  if (control instanceof HTMLInputElement && NOT_TYPED.has(control.type)) return null;
  if (control.value === control.defaultValue) return null;
  const typed = control.value;
  const prototype = control instanceof HTMLInputElement ? HTMLInputElement.prototype : HTMLTextAreaElement.prototype;
  return () => {
    if (!control.isConnected) return;
    control.value = typed === "" ? "0" : "";
    Object.getOwnPropertyDescriptor(prototype, "value")?.set?.call(control, typed);
    control.dispatchEvent(new Event("input", { bubbles: true }));
  };
}
