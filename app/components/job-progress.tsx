import { JOB_STEPS, type LeadStatus } from "~/db/enums";
import { STATUS_LABEL, STEP_SHORT_LABEL, stepOf } from "~/lib/leads/lead-status";

type Props = { stage: LeadStatus; pausedStage: LeadStatus | null };

const isStopped = (stage: LeadStatus) => stage === "on-hold" || stage === "not-going-ahead";

/** The job as one line of steps: done, this one, still to come. A stopped job shows where it stopped. */
export function JobProgress({ stage, pausedStage }: Props) {
  const at = JOB_STEPS.indexOf(stepOf(stage, pausedStage));
  const stopped = isStopped(stage);
  return (
    <div>
      <ol aria-label="Job progress" className="grid grid-cols-5 gap-x-1 gap-y-3 sm:grid-cols-10">
        {JOB_STEPS.map((step, i) => {
          const isDone = i < at || (i === at && step === "paid-in-full");
          const isHere = i === at;
          return (
            <li key={step} aria-current={isHere ? "step" : undefined} className="flex min-w-0 flex-col gap-1">
              <span
                aria-hidden="true"
                className={`h-1.5 rounded-full ${isDone ? "bg-char-700" : isHere ? (stopped ? "bg-ash-500" : "bg-ember-500") : "bg-ash-200"}`}
              />
              <span
                className={`truncate text-xs ${isHere ? "font-extrabold text-char-900" : isDone ? "font-semibold text-char-700" : "text-char-600"}`}
              >
                {STEP_SHORT_LABEL[step]}
                <span className="sr-only">
                  {isHere
                    ? stopped
                      ? `: ${STATUS_LABEL[stage]} here`
                      : ": here now"
                    : isDone
                      ? ": done"
                      : ": to come"}
                </span>
              </span>
            </li>
          );
        })}
      </ol>
    </div>
  );
}

/** A one-line version for lists: the stage in words over a thin bar of the steps. */
export function JobProgressCompact({ stage, pausedStage }: Props) {
  const at = JOB_STEPS.indexOf(stepOf(stage, pausedStage));
  const stopped = isStopped(stage);
  return (
    <span className="flex min-w-28 flex-col gap-1">
      <span className="text-xs font-bold text-char-800">
        {STATUS_LABEL[stage]}
        {stopped && pausedStage ? (
          <span className="font-semibold text-char-600">
            {" "}
            at {STATUS_LABEL[stepOf(stage, pausedStage)].toLowerCase()}
          </span>
        ) : null}
      </span>
      <span aria-hidden="true" className="flex gap-0.5">
        {JOB_STEPS.map((step, i) => (
          <span
            key={step}
            className={`h-1 flex-1 rounded-full ${i < at ? "bg-char-700" : i === at ? (stopped ? "bg-ash-500" : "bg-ember-500") : "bg-ash-200"}`}
          />
        ))}
      </span>
      <span className="sr-only">
        step {at + 1} of {JOB_STEPS.length}
      </span>
    </span>
  );
}
