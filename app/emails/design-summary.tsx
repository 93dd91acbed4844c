import { Section, Text } from "@react-email/components";

export type DesignSummaryLine = { label: string; value: string };

/** The design as a short list of label/value lines, the same in every e-mail. */
export function DesignSummary({ lines }: { lines: DesignSummaryLine[] }) {
  return (
    <Section style={{ backgroundColor: "#fbf8f3", borderRadius: "8px", padding: "12px 16px", margin: "8px 0 16px" }}>
      {lines.map((line) => (
        <Text key={line.label} style={{ fontSize: "14px", lineHeight: "20px", margin: "2px 0" }}>
          <strong>{line.label}:</strong> {line.value}
        </Text>
      ))}
    </Section>
  );
}
