import { useState } from "react";

/**
 * The company's public page as the office hands it out: the full link to read out or paste, a copy
 * button, and a QR code (SVG, scales to any print size) to put on flyers and the truck.
 */
export function PublicLink({ url, qrSvg, fileName }: { url: string; qrSvg: string; fileName: string }) {
  const [copyState, setCopyState] = useState<"idle" | "copied" | "failed">("idle");
  const qrHref = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(qrSvg)}`;
  async function copy() {
    try {
      await navigator.clipboard.writeText(url);
      setCopyState("copied");
    } catch {
      setCopyState("failed");
    }
  }
  return (
    <section aria-labelledby="public-link-title" className="flex flex-col gap-4 card p-6 sm:flex-row sm:items-start">
      <div className="flex min-w-0 flex-1 flex-col gap-3">
        <h2 id="public-link-title" className="text-lg font-extrabold">
          Your public page
        </h2>
        <p className="text-sm text-char-600">
          Homeowners design their pit and send you a request here. Put the link on your website and in e-mails, and the
          QR code on flyers, yard signs and the truck.
        </p>
        <div>
          <label htmlFor="public-link" className="field-label">
            Link
          </label>
          <input
            id="public-link"
            readOnly
            value={url}
            onFocus={(e) => e.currentTarget.select()}
            className="field-input font-mono text-sm"
          />
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <button type="button" className="btn-quiet" onClick={copy}>
            Copy link
          </button>
          <a href={url} className="font-bold text-ember-700 underline" target="_blank" rel="noreferrer">
            Open the page<span className="sr-only"> (opens in a new tab)</span>
          </a>
          <p aria-live="polite" className="text-sm font-semibold text-moss-700">
            {copyState === "copied"
              ? "Link copied."
              : copyState === "failed"
                ? "Could not copy here: select the link above and copy it."
                : ""}
          </p>
        </div>
      </div>
      <div className="flex flex-col items-center gap-2">
        <img
          src={qrHref}
          alt={`QR code that opens ${url}`}
          width={160}
          height={160}
          className="rounded border border-ash-200 bg-white"
        />
        <a href={qrHref} download={fileName} className="text-sm font-bold text-ember-700 underline">
          Download the QR code (SVG)
        </a>
      </div>
    </section>
  );
}
