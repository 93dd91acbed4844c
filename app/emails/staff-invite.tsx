import { Button, Text } from "@react-email/components";
import { EmailShell, emailButton, emailText } from "~/emails/email-shell";
import { possessive } from "~/lib/format/wording";

const ROLE_WORDS = { owner: "an owner", estimator: "an estimator", crew: "a member of the crew" } as const;

/** To a new team member: set a password and start in the workspace. */
export function StaffInviteEmail(props: {
  companyName: string;
  name: string;
  invitedBy: string;
  role: keyof typeof ROLE_WORDS;
  link: string;
  days: number;
}) {
  return (
    <EmailShell
      companyName={props.companyName}
      preview={`${props.invitedBy} invited you to ${possessive(props.companyName)} workspace`}
    >
      <Text style={emailText}>Hello {props.name},</Text>
      <Text style={emailText}>
        {props.invitedBy} added you to {possessive(props.companyName)} Emberwright workspace as {ROLE_WORDS[props.role]}
        . Set a password to start; the link works once and for {props.days} days.
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

/**
 * To an address that already has an account elsewhere: the inviting owner is told the invitation
 * went out (so the team page reveals nothing about other accounts); the person learns why no link
 * came and what to do.
 */
export function StaffInviteAddressInUseEmail(props: { companyName: string; name: string; invitedBy: string }) {
  return (
    <EmailShell
      companyName={props.companyName}
      preview={`${props.invitedBy} tried to add you to ${possessive(props.companyName)} workspace`}
    >
      <Text style={emailText}>Hello {props.name},</Text>
      <Text style={emailText}>
        {props.invitedBy} tried to add this address to {possessive(props.companyName)} Emberwright workspace, but it
        already belongs to another Emberwright account, and one address can hold only one account. Ask {props.invitedBy}{" "}
        to invite you at another address.
      </Text>
      <Text style={{ ...emailText, fontSize: "13px", color: "#6f655d", marginTop: "16px" }}>
        Not expecting this? Ignore it: nothing has changed on your account.
      </Text>
    </EmailShell>
  );
}
