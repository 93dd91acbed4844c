import { useState, type FormEvent } from "react";
import { Form, useNavigate, useNavigation } from "react-router";
import { SelectField, TextField, FormAlert } from "~/components/ui/field";
import { BUILD_WINDOWS } from "~/db/enums";
import { BUILD_WINDOW_LABEL } from "~/lib/leads/lead-status";
import { shrinkPhoto } from "~/lib/format/photo-shrink";

export type RequestFormState = { errors?: Record<string, string>; values?: Record<string, string> };

type Sending =
  | { step: "idle" }
  | { step: "preparing"; done: number; of: number }
  | { step: "uploading"; sentBytes: number; totalBytes: number };

/**
 * The homeowner's request: contact details, yard photos and consent; the design rides along.
 *
 * Without JavaScript it is a plain multipart form post to the configurator. With it, photos are made
 * smaller in the browser first (a phone photo of several megabytes becomes a few hundred kilobytes,
 * upright, its EXIF location gone) and the form goes up through XMLHttpRequest, whose upload events
 * drive a progress bar; the server checks and re-encodes every photo either way.
 */
export function RequestForm({
  designQuery,
  state,
  companyName,
  companySlug,
}: {
  designQuery: string;
  state?: RequestFormState;
  companyName: string;
  companySlug: string;
}) {
  const [answer, setAnswer] = useState<RequestFormState | null>(null);
  const [attempt, setAttempt] = useState(0);
  const [sending, setSending] = useState<Sending>({ step: "idle" });
  const shown = answer ?? state;
  const errors = shown?.errors ?? {};
  const values = shown?.values ?? {};
  const navigation = useNavigation();
  const navigate = useNavigate();
  const isSending = sending.step !== "idle" || (navigation.state === "submitting" && navigation.formMethod === "POST");

  const refuse = (next: RequestFormState) => {
    setAnswer(next);
    setAttempt((n) => n + 1);
    setSending({ step: "idle" });
  };

  const send = async (event: FormEvent<HTMLFormElement>) => {
    if (typeof XMLHttpRequest === "undefined" || typeof FormData === "undefined") return; // the plain post goes ahead
    event.preventDefault();
    if (isSending) return;
    const body = new FormData(event.currentTarget);
    const photos = body.getAll("photos").filter((p): p is File => p instanceof File && p.size > 0);
    body.delete("photos");
    setSending({ step: "preparing", done: 0, of: photos.length });
    for (const [index, photo] of photos.entries()) {
      body.append("photos", await shrinkPhoto(photo));
      setSending({ step: "preparing", done: index + 1, of: photos.length });
    }
    const request = new XMLHttpRequest();
    request.open("POST", `/c/${companySlug}/request`);
    request.responseType = "json";
    request.upload.addEventListener("progress", (e) => {
      if (e.lengthComputable) setSending({ step: "uploading", sentBytes: e.loaded, totalBytes: e.total });
    });
    request.addEventListener("load", () => {
      const reply = request.response as {
        location?: string;
        errors?: Record<string, string>;
        values?: Record<string, string>;
      } | null;
      if (request.status === 200 && reply?.location) {
        navigate(reply.location);
        return;
      }
      refuse({
        errors: reply?.errors ?? {
          form: `Your request was not sent (the server answered ${request.status}). Please try again.`,
        },
        values: reply?.values ?? {},
      });
    });
    request.addEventListener("error", () =>
      refuse({
        errors: { form: "Your request was not sent: the connection dropped. Check it and send again." },
        values: {},
      }),
    );
    setSending({ step: "uploading", sentBytes: 0, totalBytes: 1 });
    request.send(body);
  };

  return (
    <Form
      method="post"
      encType="multipart/form-data"
      className="flex flex-col gap-5 card p-5 render-when-near sm:p-6"
      noValidate
      id="request"
      onSubmit={send}
    >
      <div>
        <h2 className="text-2xl font-extrabold">Send this design to {companyName}</h2>
        <p className="mt-1 text-char-600">
          They will look at it with your yard photos and get back to you with a visit or a firm price.
        </p>
      </div>
      {Object.keys(errors).length ? (
        <FormAlert key={attempt}>
          {errors.form ?? "Your request was not sent yet. Fix the fields marked below."}
        </FormAlert>
      ) : null}
      <input type="hidden" name="design" value={designQuery} />
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-1">
        <TextField
          label="Your name"
          name="customerName"
          autoComplete="name"
          defaultValue={values.customerName}
          error={errors.customerName}
        />
        <TextField
          label="E-mail"
          name="email"
          type="email"
          autoComplete="email"
          defaultValue={values.email}
          error={errors.email}
        />
        <TextField
          label="Phone"
          name="phone"
          type="tel"
          autoComplete="tel"
          defaultValue={values.phone}
          error={errors.phone}
        />
        <SelectField
          label="When do you hope to build?"
          name="buildWindow"
          defaultValue={values.buildWindow ?? "one-to-three-months"}
          error={errors.buildWindow}
        >
          {BUILD_WINDOWS.map((w) => (
            <option key={w} value={w}>
              {BUILD_WINDOW_LABEL[w]}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Street address"
          name="street"
          autoComplete="street-address"
          defaultValue={values.street}
          error={errors.street}
        />
        <TextField
          label="Town"
          name="town"
          autoComplete="address-level2"
          defaultValue={values.town}
          error={errors.town}
        />
      </div>
      <div>
        <label htmlFor="request-notes" className="field-label">
          Anything else? (optional)
        </label>
        <textarea
          id="request-notes"
          name="notes"
          rows={3}
          maxLength={2000}
          defaultValue={values.notes}
          className="field-input"
          aria-invalid={errors.notes ? true : undefined}
        />
        {errors.notes ? <p className="field-error">{errors.notes}</p> : null}
      </div>
      <div>
        <label htmlFor="request-photos" className="field-label">
          Photos of the spot (up to 6; JPEG, PNG or WebP, 10 MB each)
        </label>
        <input
          id="request-photos"
          name="photos"
          type="file"
          multiple
          accept="image/jpeg,image/png,image/webp"
          aria-invalid={errors.photos ? true : undefined}
          aria-describedby={errors.photos ? "request-photos-error" : undefined}
          className="mt-1 block w-full text-sm file:mr-3 file:rounded-lg file:border-0 file:bg-ash-200 file:px-3 file:py-2 file:font-bold file:text-char-800"
        />
        {errors.photos ? (
          <p id="request-photos-error" className="field-error">
            {errors.photos}
          </p>
        ) : null}
      </div>
      {/* Left empty by people; bots fill every field they find. */}
      <div aria-hidden="true" className="absolute -left-[9999px] h-px w-px overflow-hidden">
        <label htmlFor="request-website">Website</label>
        <input id="request-website" name="website" type="text" tabIndex={-1} autoComplete="off" />
      </div>
      <div>
        <label className="flex items-start gap-3 text-sm text-char-700">
          <input
            type="checkbox"
            name="consent"
            className="mt-0.5 h-5 w-5 shrink-0 accent-ember-500"
            aria-invalid={errors.consent ? true : undefined}
            aria-describedby={errors.consent ? "request-consent-error" : undefined}
          />
          <span>
            {companyName} may contact me by e-mail or phone about this request. My details are used for nothing else.
          </span>
        </label>
        {errors.consent ? (
          <p id="request-consent-error" className="field-error">
            {errors.consent}
          </p>
        ) : null}
      </div>
      <div>
        <button type="submit" className="btn-primary px-6 py-3 text-base" disabled={isSending}>
          {isSending ? "Sending…" : "Send my request"}
        </button>
        {sending.step === "preparing" && sending.of > 0 ? (
          <p role="status" className="mt-3 text-sm font-semibold text-char-700">
            Making your photos smaller for the upload: {sending.done} of {sending.of}…
          </p>
        ) : null}
        {sending.step === "uploading" ? (
          <div className="mt-3 max-w-md" data-testid="upload-progress">
            <label htmlFor="request-progress" className="text-sm font-semibold text-char-700">
              Sending your request: {Math.round((100 * sending.sentBytes) / Math.max(1, sending.totalBytes))}%
            </label>
            <progress
              id="request-progress"
              className="mt-1 block h-3 w-full overflow-hidden rounded-full [&::-moz-progress-bar]:bg-action [&::-webkit-progress-bar]:bg-ash-200 [&::-webkit-progress-value]:bg-action"
              max={sending.totalBytes}
              value={sending.sentBytes}
            />
          </div>
        ) : null}
      </div>
    </Form>
  );
}
