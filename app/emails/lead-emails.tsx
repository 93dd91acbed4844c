import { Button, Text } from "@react-email/components";
import { EmailShell, emailButton, emailText } from "~/emails/email-shell";

/** To an estimator (or owner) given a request, or a crew member given a signed job: whose, where, and the link. */
export function StaffAssignedEmail(props: {
  companyName: string;
  recipientName: string;
  assignedBy: string;
  customerName: string;
  town: string;
  asCrew: boolean;
  stage: string;
  link: string;
}) {
  return (
    <EmailShell
      companyName={props.companyName}
      preview={
        props.asCrew
          ? `Job to build: ${props.customerName}, ${props.town}`
          : `Request assigned to you: ${props.customerName}, ${props.town}`
      }
    >
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>
        {props.asCrew
          ? `${props.assignedBy} gave you the fire-pit job for ${props.customerName} in ${props.town} to build.`
          : `${props.assignedBy} assigned you the fire-pit request from ${props.customerName} in ${props.town}.`}{" "}
        It is at this stage: {props.stage}.
      </Text>
      <Button href={props.link} style={emailButton}>
        {props.asCrew ? "Open the job" : "Open the request"}
      </Button>
    </EmailShell>
  );
}

/**
 * To the homeowner when staff send them a revised design: what changed in words, the new price, where to see the
 * drawing.
 */
export function RevisionSentEmail(props: {
  companyName: string;
  companyPhone: string;
  recipientName: string;
  authorName: string;
  summary: { label: string; value: string }[];
  price: string | null;
  link: string;
}) {
  return (
    <EmailShell
      companyName={props.companyName}
      companyPhone={props.companyPhone}
      preview={`${props.companyName} sent you a revised fire-pit design`}
    >
      <Text style={emailText}>Hello {props.recipientName},</Text>
      <Text style={emailText}>
        {props.authorName} at {props.companyName} revised your fire-pit design and sent it to you. Your own request
        stays as you sent it; both are on your page.
      </Text>
      {props.summary.map((line) => (
        <Text key={line.label} style={{ ...emailText, margin: "0 0 4px" }}>
          <strong>{line.label}:</strong> {line.value}
        </Text>
      ))}
      {props.price ? (
        <Text style={{ ...emailText, fontSize: "18px", fontWeight: 800, marginTop: "12px" }}>
          Estimated {props.price}
        </Text>
      ) : null}
      <Button href={props.link} style={emailButton}>
        See the plan drawing
      </Button>
    </EmailShell>
  );
}
