import { Body, Container, Head, Hr, Html, Preview, Section, Text } from "@react-email/components";
import type { ReactNode } from "react";
import { formatPhone, phoneHref } from "~/lib/format/phone";

const page = {
  backgroundColor: "#f4eee5",
  fontFamily: "Nunito, Helvetica, Arial, sans-serif",
  color: "#2d2825",
  margin: 0,
  padding: "24px 0",
};
const card = {
  backgroundColor: "#ffffff",
  borderRadius: "12px",
  border: "1px solid #e8dfd2",
  padding: "28px",
  maxWidth: "560px",
};
const brand = { fontSize: "18px", fontWeight: 800, color: "#1f1b19", margin: "0 0 16px" };
const foot = { fontSize: "12px", color: "#6f655d", lineHeight: "18px" };

/**
 * The frame every Emberwright e-mail shares: the company's name on top, a short footer. Mail to a
 * homeowner passes the company's phone, so the footer says how to reach the contractor (replies go
 * to the company's address: the outbox worker sets Reply-To).
 */
export function EmailShell({
  preview,
  companyName,
  companyPhone,
  children,
}: {
  preview: string;
  companyName: string;
  companyPhone?: string;
  children: ReactNode;
}) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{preview}</Preview>
      <Body style={page}>
        <Container style={card}>
          <Text style={brand}>
            {companyName} <span style={{ color: "#d4611a" }}>·</span> fire pits
          </Text>
          {children}
          <Hr style={{ borderColor: "#e8dfd2", margin: "24px 0 12px" }} />
          <Section>
            {companyPhone ? (
              <Text style={{ ...foot, fontSize: "14px", color: "#2d2825" }}>
                Questions? Reply to this e-mail or call {companyName} at{" "}
                <a href={phoneHref(companyPhone)} style={{ color: "#b14c12", fontWeight: 700 }}>
                  {formatPhone(companyPhone)}
                </a>
                .
              </Text>
            ) : null}
            <Text style={foot}>
              Sent by Emberwright for {companyName}. Fire rules differ from town to town: check with your local fire
              authority and codes before you build.
            </Text>
          </Section>
        </Container>
      </Body>
    </Html>
  );
}

export const emailText = { fontSize: "15px", lineHeight: "22px", margin: "0 0 12px" };
export const emailButton = {
  backgroundColor: "#b14c12",
  color: "#ffffff",
  borderRadius: "8px",
  padding: "12px 18px",
  fontWeight: 700,
  fontSize: "15px",
  textDecoration: "none",
  display: "inline-block",
};
