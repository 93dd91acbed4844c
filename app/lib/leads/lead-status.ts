import { isOneOf, JOB_STEPS, SIGNED_STAGES, type BuildWindow, type JobStep, type LeadStatus } from "~/db/enums";

/*
 * The job's stages in words, for the office, the homeowner and the crew, and the moves the office
 * may make by hand. Stages that follow a real event (a paid consult, a recorded site visit, a sent
 * proposal, a paid deposit) are never set by hand: the event sets them, and undoing the event
 * (a cancelled consult, a withdrawn or expired proposal) sets the job back to what is still true.
 */

/** Stage names in the workspace. */
export const STATUS_LABEL: Record<LeadStatus, string> = {
  request: "Request in",
  "called-back": "Called back",
  "consult-booked": "Consult booked",
  measured: "Yard measured",
  "proposal-out": "Proposal out",
  signed: "Signed, deposit in",
  "stone-ordered": "Stone ordered",
  "build-booked": "Build booked",
  built: "Built",
  "paid-in-full": "Paid in full",
  "on-hold": "On hold",
  "not-going-ahead": "Not going ahead",
};

/** Short step names for the progress line. */
export const STEP_SHORT_LABEL: Record<JobStep, string> = {
  request: "Request",
  "called-back": "Called",
  "consult-booked": "Consult",
  measured: "Measured",
  "proposal-out": "Proposal",
  signed: "Signed",
  "stone-ordered": "Stone",
  "build-booked": "Booked",
  built: "Built",
  "paid-in-full": "Paid",
};

/** The same stages as a homeowner reads them. */
export const HOMEOWNER_STATUS_LABEL: Record<LeadStatus, string> = {
  request: "Received",
  "called-back": "The contractor is in touch",
  "consult-booked": "Design consult booked",
  measured: "Your yard is measured",
  "proposal-out": "Proposal ready for you",
  signed: "Signed: your pit is on the way",
  "stone-ordered": "Stone ordered",
  "build-booked": "Build dates set",
  built: "Built",
  "paid-in-full": "Paid in full",
  "on-hold": "On hold",
  "not-going-ahead": "Not going ahead",
};

export const BUILD_WINDOW_LABEL: Record<BuildWindow, string> = {
  "within-a-month": "Within a month",
  "one-to-three-months": "In one to three months",
  "this-season": "Later this season",
  "next-year": "Next year",
  "not-sure": "Not sure yet",
};

export function isSignedStage(stage: LeadStatus): boolean {
  return (SIGNED_STAGES as readonly LeadStatus[]).includes(stage);
}

/**
 * A job marked built (or paid in full), also while on hold from there: its balance was fixed from the
 * papers signed before, so it takes no more change orders.
 */
export function isFinishedJob(lead: { status: LeadStatus; pausedStage: LeadStatus | null }): boolean {
  const stage = lead.status === "on-hold" ? lead.pausedStage : lead.status;
  return stage === "built" || stage === "paid-in-full";
}

/** Where a job stands on the line of steps: a stopped job shows the step it stopped at. */
export function stepOf(stage: LeadStatus, pausedStage: LeadStatus | null): JobStep {
  if (stage === "on-hold" || stage === "not-going-ahead") {
    return isOneOf(JOB_STEPS, pausedStage) ? pausedStage : "request";
  }
  return stage;
}

// The build's steps are moved by hand for now, one at a time and forward only.
const BUILD_NEXT: Partial<Record<LeadStatus, JobStep>> = {
  signed: "stone-ordered",
  "stone-ordered": "build-booked",
  "build-booked": "built",
  built: "paid-in-full",
};

export type StageMove = { to: LeadStatus; label: string; needsReason: boolean };

/**
 * The moves the office may make by hand from a stage. A job can be put on hold from any open step
 * and marked "not going ahead" until it is signed (after that, the owner refunds the deposit);
 * a stopped job picks up again where it stopped.
 */
export function allowedMoves(stage: LeadStatus, pausedStage: LeadStatus | null): StageMove[] {
  if (stage === "on-hold" || stage === "not-going-ahead") {
    const back = stepOf(stage, pausedStage);
    const moves: StageMove[] = [{ to: back, label: `Pick it up again (${STATUS_LABEL[back]})`, needsReason: false }];
    if (stage === "on-hold" && !isSignedStage(back))
      moves.push({ to: "not-going-ahead", label: "Not going ahead", needsReason: true });
    return moves;
  }
  const moves: StageMove[] = [];
  if (stage === "request") moves.push({ to: "called-back", label: "Called back", needsReason: false });
  const next = BUILD_NEXT[stage];
  if (next) moves.push({ to: next, label: STATUS_LABEL[next], needsReason: false });
  if (stage !== "paid-in-full") moves.push({ to: "on-hold", label: "On hold", needsReason: true });
  if (!isSignedStage(stage)) moves.push({ to: "not-going-ahead", label: "Not going ahead", needsReason: true });
  return moves;
}

export type NextStepFacts = {
  firstName: string;
  consultLabel: string | null;
  proposal: { state: "sent" | "accepted" | "signed"; opened: boolean } | null;
  openChangeOrder: boolean;
  stopReason: string | null;
};

export type NextStep = { title: string; detail: string };

/** The one thing that moves this job on, said to the person looking at it. */
export function describeNextStep(
  stage: LeadStatus,
  pausedStage: LeadStatus | null,
  isOffice: boolean,
  facts: NextStepFacts,
): NextStep {
  if (!isOffice) {
    if (stage === "built" || stage === "paid-in-full")
      return { title: "Built", detail: "This job is finished. Thank you." };
    return {
      title: "Build it",
      detail: "The cut sheet and the cap template are ready; the cautions are at the foot of the page.",
    };
  }
  const who = facts.firstName;
  switch (stage) {
    case "request":
      return {
        title: `Call ${who} back`,
        detail: `Talk through the design, then mark it called back. ${who} can book a paid design consult from the request link.`,
      };
    case "called-back":
      return {
        title: "Get the design consult booked",
        detail: `${who} books and pays for the consult from the request link or “My requests”; it shows here once paid.`,
      };
    case "consult-booked":
      return {
        title: "Measure the yard at the consult",
        detail: `${facts.consultLabel ? `Consult ${facts.consultLabel}. ` : ""}Record the site visit below: setbacks, slope, soil, access and photos.`,
      };
    case "measured":
      return {
        title: "Send the proposal",
        detail: "Write the fixed price, add-ons and terms from the current design, then send it for signature.",
      };
    case "proposal-out":
      if (facts.proposal?.state === "accepted")
        return {
          title: "Waiting for the deposit",
          detail: `${who} signed; the job is signed once the deposit is paid.`,
        };
      if (!facts.proposal)
        return {
          title: "Waiting for the signature",
          detail:
            "This proposal went out before Emberwright kept proposals. Send one from here to have it signed online.",
        };
      return {
        title: "Waiting for the signature",
        detail: facts.proposal.opened ? `${who} has opened the proposal.` : `${who} has not opened the proposal yet.`,
      };
    case "signed":
      return facts.openChangeOrder
        ? { title: "Waiting for the change order's signature", detail: `${who} has a change order to sign.` }
        : {
            title: "Order the stone",
            detail: "Signed and deposit paid. Give the job to a crew and order the material.",
          };
    case "stone-ordered":
      return { title: "Book the build", detail: "Put the build days on the calendar with the crew." };
    case "build-booked":
      return { title: "Build it", detail: "The crew has the cut sheet and the cap template." };
    case "built":
      return { title: "Collect the balance", detail: "Built. The balance is due on completion." };
    case "paid-in-full":
      return { title: "Job done", detail: "Built and paid in full." };
    case "on-hold":
      return {
        title: "On hold",
        detail:
          `${facts.stopReason ?? ""} Stopped at “${STATUS_LABEL[stepOf(stage, pausedStage)]}”; pick it up again when ${who} is ready.`.trim(),
      };
    case "not-going-ahead":
      return { title: "Not going ahead", detail: facts.stopReason ?? "" };
  }
}
