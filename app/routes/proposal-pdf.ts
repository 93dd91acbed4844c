import type { Route } from "./+types/proposal-pdf";
import { proposalFigures, renderProposalPdf } from "~/lib/proposals/proposal-pdf.server";
import { findProposalByToken } from "~/lib/proposals/proposals.server";

/**
 * GET /p/:token.pdf: the proposal as a PDF, for whoever holds the link. Before signing it shows the
 * add-ons chosen on the page (?addOns=a1,a2); once signed it is the stored signed copy, byte for
 * byte, and ?copy=accepted gives the exact PDF that was accepted (the one its SHA-256 names).
 */
export async function loader({ params, request }: Route.LoaderArgs) {
  const found = await findProposalByToken(params.token);
  if (!found) return new Response("Not found", { status: 404 });
  const { proposal, document } = found;
  const url = new URL(request.url);
  let pdf: Buffer;
  if (proposal.signedPdf && proposal.acceptedPdf) {
    pdf = url.searchParams.get("copy") === "accepted" ? proposal.acceptedPdf : proposal.signedPdf;
  } else {
    const chosenKeys = (url.searchParams.get("addOns") ?? "").split(",").filter(Boolean);
    try {
      proposalFigures(document, chosenKeys);
    } catch {
      return new Response("addOns: choose add-ons offered in this proposal (a1, a2, …).", { status: 400 });
    }
    pdf = await renderProposalPdf(document, { chosenKeys, createdAt: proposal.sentAt });
  }
  const name = `${document.number.toLowerCase().replace(/[^a-z0-9]+/g, "-")}${proposal.signedPdf ? "-signed" : ""}.pdf`;
  return new Response(new Uint8Array(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Length": String(pdf.byteLength),
      "Content-Disposition": `attachment; filename="${name}"`,
      "Cache-Control": "private, no-store",
      "X-Content-Type-Options": "nosniff",
    },
  });
}
