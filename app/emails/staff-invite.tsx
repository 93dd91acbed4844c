import { Button, Text } from "@react-email/components";
import { EmailShell, emailButton, emailText } from "~/emails/email-shell";

const ROLE_WORDS = { owner: "an owner", estimator: "an estimator", crew: "a member of the crew" } as const;

/** To a new team member: set a password and start in the workspace. */
export function StaffInviteEmail(props: { companyName: string; name: string; invitedBy: string; role: keyof typeof ROLE_WORDS; link: string; days: number }) {
  return (
    <EmailShell companyName={props.companyName} preview={`${props.invitedBy} invited you to ${props.companyName}'s workspace`}>
      <Text style={emailText}>Hello {props.name},</Text>
      <Text style={emailText}>
        {props.invitedBy} added you to {props.companyName}'s Emberwright workspace as {ROLE_WORDS[props.role]}. Set a password to
        start; the link works once and for {props.days} days.
      </Text>
      <Button href={props.link} style={emailButton}>
        Set my password
      </Button>
      <Text style={{ ...emailText, fontSize: "13px", color: "#6f655d", marginTop: "16px" }}>
        Not expecting this? Ignore it: nothing happens until the link is used.
      </Text>
    </EmailShell>
  );
}
