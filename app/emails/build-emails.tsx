import { Text } from "@react-email/components";
import { EmailShell, emailText } from "~/emails/email-shell";

type BuildEmailProps = {
  companyName: string;
  recipientName: string;
  /** The build days in words, e.g. "Friday 4 December, Monday 7 and Tuesday 8 December". */
  days: string;
  address: string;
};

const small = { ...emailText, fontSize: "13px", color: "#6f655d" };

/** What the homeowner should have ready before the crew comes (also in the day-before reminder). */
function GettingReady() {
  return (
    <>
      <Text style={emailText}>Before the crew arrives, please:</Text>
      <Text style={emailText}>
        • leave a clear way in for a wheelbarrow and pallets (gates unlocked, vehicles moved);
        <br />• keep pets indoors while the crew works and the saw runs;
        <br />• turn off sprinklers near the spot the day before;
        <br />• make sure the utility locate marks are done and still visible: nobody digs before buried lines are
        marked.
      </Text>
    </>
  );
}

/** Build booked or moved (the .ics rides along: the same event, updated). */
export function BuildBookedEmail(props: BuildEmailProps & { isMove: boolean }) {
  return (
    <EmailShell
      companyName={props.companyName}
      preview={`${props.isMove ? "New build dates" : "Build dates"}: ${props.days}`}
    >
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>
        {props.isMove
          ? `${props.companyName} moved the build of your fire pit. The new dates:`
          : `${props.companyName} has booked the build of your fire pit:`}
      </Text>
      <Text style={{ ...emailText, fontSize: "18px", fontWeight: 800 }}>{props.days}</Text>
      <Text style={emailText}>At {props.address}.</Text>
      <GettingReady />
      <Text style={small}>
        {props.isMove
          ? "The calendar file attached updates the event already in your calendar."
          : "The calendar file attached adds the build days to your calendar."}{" "}
        Weather can move a build; we will tell you if it does.
      </Text>
    </EmailShell>
  );
}

/** The crew member's copy: where and when, with the job's own calendar event. */
export function BuildCrewEmail(
  props: BuildEmailProps & { customerName: string; kind: "booked" | "moved" | "cancelled"; jobLink: string },
) {
  const what = {
    booked: "You are on a build",
    moved: "A build you are on has moved",
    cancelled: "A build you were on is cancelled",
  }[props.kind];
  return (
    <EmailShell companyName={props.companyName} preview={`${what}: ${props.days}`}>
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>
        {what}: {props.customerName}, {props.address}.
      </Text>
      <Text
        style={{
          ...emailText,
          fontSize: "18px",
          fontWeight: 800,
          textDecoration: props.kind === "cancelled" ? "line-through" : undefined,
        }}
      >
        {props.days}
      </Text>
      {props.kind === "cancelled" ? null : (
        <Text style={emailText}>The job page has the cut sheet, the site notes and the photos: {props.jobLink}</Text>
      )}
      <Text style={small}>
        The calendar file attached{" "}
        {props.kind === "cancelled"
          ? "removes the event from"
          : props.kind === "moved"
            ? "updates the event in"
            : "adds the days to"}{" "}
        your calendar.
      </Text>
    </EmailShell>
  );
}

/** The day before the first build day, to the homeowner. */
export function BuildReminderEmail(props: BuildEmailProps) {
  return (
    <EmailShell companyName={props.companyName} preview={`Tomorrow: ${props.companyName} starts your fire pit`}>
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>A reminder: the {props.companyName} crew starts building your fire pit tomorrow.</Text>
      <Text style={{ ...emailText, fontSize: "18px", fontWeight: 800 }}>{props.days}</Text>
      <GettingReady />
    </EmailShell>
  );
}

export function BuildCancelledEmail(props: BuildEmailProps & { reason: string }) {
  return (
    <EmailShell companyName={props.companyName} preview={`Build dates cancelled: ${props.days}`}>
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>
        The build dates of your fire pit ({props.days}) are cancelled. {props.reason}
      </Text>
      <Text style={emailText}>{props.companyName} will be in touch to set new dates.</Text>
      <Text style={small}>The calendar file attached removes the event from your calendar.</Text>
    </EmailShell>
  );
}
