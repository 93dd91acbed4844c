import { Form, useNavigation } from "react-router";
import { SelectField, TextField, FormAlert } from "~/components/ui/field";
import { BUILD_WINDOWS } from "~/db/enums";
import { BUILD_WINDOW_LABEL } from "~/lib/leads/lead-status";

export type RequestFormState = { errors?: Record<string, string>; values?: Record<string, string> };

/** The homeowner's request: contact details, yard photos and consent; the design rides along. */
export function RequestForm({ designQuery, state, companyName }: { designQuery: string; state?: RequestFormState; companyName: string }) {
  const errors = state?.errors ?? {};
  const values = state?.values ?? {};
  const navigation = useNavigation();
  const isSending = navigation.state === "submitting" && navigation.formMethod === "POST";
  return (
    <Form method="post" encType="multipart/form-data" className="card flex flex-col gap-5 p-5 sm:p-6" noValidate id="request">
      <div>
        <h2 className="text-2xl font-extrabold">Send this design to {companyName}</h2>
        <p className="mt-1 text-char-600">They will look at it with your yard photos and get back to you with a visit or a firm price.</p>
      </div>
      {Object.keys(errors).length ? (
        <FormAlert>
          {errors.form ?? "Your request was not sent yet. Fix the fields marked below."}
        </FormAlert>
      ) : null}
      <input type="hidden" name="design" value={designQuery} />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Your name" name="customerName" autoComplete="name" defaultValue={values.customerName} error={errors.customerName} />
        <TextField label="E-mail" name="email" type="email" autoComplete="email" defaultValue={values.email} error={errors.email} />
        <TextField label="Phone" name="phone" type="tel" autoComplete="tel" defaultValue={values.phone} error={errors.phone} />
        <SelectField label="When do you hope to build?" name="buildWindow" defaultValue={values.buildWindow ?? "one-to-three-months"} error={errors.buildWindow}>
          {BUILD_WINDOWS.map((w) => (
            <option key={w} value={w}>{BUILD_WINDOW_LABEL[w]}</option>
          ))}
        </SelectField>
        <TextField label="Street address" name="street" autoComplete="street-address" defaultValue={values.street} error={errors.street} />
        <TextField label="Town" name="town" autoComplete="address-level2" defaultValue={values.town} error={errors.town} />
      </div>
      <div>
        <label htmlFor="request-notes" className="field-label">Anything else? (optional)</label>
        <textarea id="request-notes" name="notes" rows={3} maxLength={2000} defaultValue={values.notes} className="field-input" aria-invalid={errors.notes ? true : undefined} />
        {errors.notes ? <p className="field-error">{errors.notes}</p> : null}
      </div>
      <div>
        <label htmlFor="request-photos" className="field-label">Photos of the spot (up to 6; JPEG, PNG or WebP, 10 MB each)</label>
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
        {errors.photos ? <p id="request-photos-error" className="field-error">{errors.photos}</p> : null}
      </div>
      {/* Left empty by people; bots fill every field they find. */}
      <div aria-hidden="true" className="absolute -left-[9999px] h-px w-px overflow-hidden">
        <label htmlFor="request-website">Website</label>
        <input id="request-website" name="website" type="text" tabIndex={-1} autoComplete="off" />
      </div>
      <div>
        <label className="flex items-start gap-3 text-sm text-char-700">
          <input type="checkbox" name="consent" className="mt-0.5 h-5 w-5 shrink-0 accent-ember-500" aria-invalid={errors.consent ? true : undefined} />
          <span>{companyName} may contact me by e-mail or phone about this request. My details are used for nothing else.</span>
        </label>
        {errors.consent ? <p className="field-error">{errors.consent}</p> : null}
      </div>
      <div>
        <button type="submit" className="btn-primary px-6 py-3 text-base" disabled={isSending}>
          {isSending ? "Sending…" : "Send my request"}
        </button>
      </div>
    </Form>
  );
}
