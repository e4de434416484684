"use client";
// The forms of review and sign-off: submit (with an optional reviewer), amend, a mark on a call or one
// of its lines, return with comments, and the signature, which asks for the password again.
import { useActionState, useId } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

type Action = (state: FormState, formData: FormData) => Promise<FormState>;

const TEXTAREA =
  "rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5 text-sm aria-[invalid=true]:border-red-600";

function Errors({ id, errors }: { id: string; errors?: string[] }) {
  return (
    <div id={id} aria-live="polite" className="text-xs text-red-700 dark:text-red-300">
      {errors?.map((message) => (
        <p key={message}>{message}</p>
      ))}
    </div>
  );
}

export function SubmitForm({
  runId,
  reviewers,
  returned = false,
  action,
}: {
  runId: string;
  reviewers: { id: string; name: string }[];
  /** The run came back from review: the form asks for a reply to the comments. */
  returned?: boolean;
  action: Action;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  return (
    <form action={formAction} className="flex flex-col gap-2" noValidate>
      <input type="hidden" name="runId" value={runId} />
      <label htmlFor="reviewerId" className="text-sm font-medium">
        Reviewer
      </label>
      <select
        id="reviewerId"
        name="reviewerId"
        aria-describedby="reviewerId-error reviewerId-hint"
        aria-invalid={state.fieldErrors?.reviewerId ? true : undefined}
        className="max-w-sm rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5 text-sm"
        defaultValue=""
      >
        <option value="">Any supervisor of the team</option>
        {reviewers.map((r) => (
          <option key={r.id} value={r.id}>
            {r.name}
          </option>
        ))}
      </select>
      <p id="reviewerId-hint" className="muted text-xs">
        The named supervisor, or every supervisor of the team, is e-mailed a link. You cannot change
        the run while it waits.
      </p>
      <Errors id="reviewerId-error" errors={state.fieldErrors?.reviewerId} />
      {returned ? (
        <>
          <label htmlFor="reply" className="text-sm font-medium">
            Reply to the reviewer&apos;s comments
          </label>
          <textarea
            id="reply"
            name="reply"
            rows={3}
            aria-describedby="reply-hint reply-error"
            aria-invalid={state.fieldErrors?.reply ? true : undefined}
            className={TEXTAREA}
            data-testid="submit-reply"
          />
          <p id="reply-hint" className="muted text-xs">
            What you changed or why the run stands as it is. Needed when you resubmit the run
            unchanged; the reviewer reads it beside their comments.
          </p>
          <Errors id="reply-error" errors={state.fieldErrors?.reply} />
        </>
      ) : null}
      <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
      <div>
        <Button type="submit" pending={pending}>
          Submit for review
        </Button>
      </div>
    </form>
  );
}

export function AmendForm({
  runId,
  nextVersion,
  action,
}: {
  runId: string;
  nextVersion: number;
  action: Action;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  return (
    <form action={formAction} className="flex flex-col gap-2">
      <input type="hidden" name="runId" value={runId} />
      <p className="muted text-xs">
        An amendment is a new draft (version {nextVersion}) with the same analysis, notes and
        overridden calls, linked to this signed version, which stays as it was signed. It goes
        through review again.
      </p>
      <FormMessage message={state.message} />
      <div>
        <Button type="submit" variant="quiet" pending={pending}>
          Amend: start version {nextVersion}
        </Button>
      </div>
    </form>
  );
}

export function MarkForm({
  runId,
  species,
  lines,
  action,
}: {
  runId: string;
  species: string;
  lines: { lineNm: number; label: string }[];
  action: Action;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  const id = useId();
  return (
    <form
      action={formAction}
      className="mt-2 flex flex-col gap-2 border-t border-[var(--line)] pt-2"
      noValidate
      aria-label={`Mark on ${species}`}
    >
      <input type="hidden" name="runId" value={runId} />
      <input type="hidden" name="species" value={species} />
      <div className="flex flex-wrap items-end gap-4">
        <fieldset className="flex gap-3 text-sm">
          <legend className="mb-1 text-xs font-semibold">Your view of the {species} call</legend>
          <label className="flex items-center gap-1">
            <input type="radio" name="agreement" value="agree" /> Agree
          </label>
          <label className="flex items-center gap-1">
            <input type="radio" name="agreement" value="disagree" /> Disagree
          </label>
          <label className="flex items-center gap-1">
            <input type="radio" name="agreement" value="" defaultChecked /> Comment only
          </label>
        </fieldset>
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-line`} className="text-xs font-semibold">
            About
          </label>
          <select
            id={`${id}-line`}
            name="lineNm"
            className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1 text-sm"
            defaultValue=""
          >
            <option value="">the call as a whole</option>
            {lines.map((l) => (
              <option key={l.lineNm} value={String(l.lineNm)}>
                {l.label}
              </option>
            ))}
          </select>
        </div>
      </div>
      <label htmlFor={`${id}-comment`} className="text-xs font-semibold">
        Comment (optional with agree or disagree)
      </label>
      <textarea
        id={`${id}-comment`}
        name="comment"
        rows={2}
        defaultValue={state.ok ? "" : state.values?.comment}
        key={state.ok ? "sent" : "draft"}
        aria-describedby={`${id}-comment-error`}
        aria-invalid={state.fieldErrors?.comment ? true : undefined}
        className={TEXTAREA}
      />
      <Errors
        id={`${id}-comment-error`}
        errors={[...(state.fieldErrors?.comment ?? []), ...(state.fieldErrors?.lineNm ?? [])]}
      />
      <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
      <div>
        <Button type="submit" variant="quiet" pending={pending}>
          Add the mark
        </Button>
      </div>
    </form>
  );
}

export function ReturnForm({ runId, action }: { runId: string; action: Action }) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  return (
    <form action={formAction} className="panel flex flex-col gap-2 p-4" noValidate>
      <h3 className="font-semibold">Return for revision</h3>
      <input type="hidden" name="runId" value={runId} />
      <input type="hidden" name="decision" value="return" />
      <label htmlFor="return-comment" className="text-sm font-medium">
        What should the author look at again?
      </label>
      <textarea
        id="return-comment"
        name="comment"
        rows={4}
        defaultValue={state.values?.comment}
        aria-describedby="return-comment-error"
        aria-invalid={state.fieldErrors?.comment ? true : undefined}
        className={TEXTAREA}
      />
      <Errors id="return-comment-error" errors={state.fieldErrors?.comment} />
      <p className="muted text-xs">
        The author is e-mailed your comment, can revise the run and submit it again; this round is
        kept.
      </p>
      <FormMessage message={state.message} />
      <div>
        <Button type="submit" variant="quiet" pending={pending}>
          Return with comments
        </Button>
      </div>
    </form>
  );
}

export function SignForm({
  runId,
  meaning,
  signerName,
  action,
}: {
  runId: string;
  meaning: string;
  signerName: string;
  action: Action;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  return (
    <form action={formAction} className="panel flex flex-col gap-2 border-ember-600 p-4" noValidate>
      <h3 className="font-semibold">Sign off</h3>
      <input type="hidden" name="runId" value={runId} />
      <input type="hidden" name="decision" value="sign" />
      <p className="text-sm" data-testid="signature-meaning">
        By signing, you, <strong>{signerName}</strong>, state:{" "}
        <strong>&ldquo;{meaning}&rdquo;</strong>. The signature records your name, the time and a
        SHA-256 hash of the run&apos;s exact content, and the run is locked for good: later changes
        need an amendment.
      </p>
      <label htmlFor="sign-comment" className="text-sm font-medium">
        Comment (optional)
      </label>
      <textarea
        id="sign-comment"
        name="comment"
        rows={2}
        defaultValue={state.values?.comment}
        className={TEXTAREA}
      />
      <Field
        label="Your password, to confirm it is you"
        name="password"
        id="sign-password"
        type="password"
        autoComplete="current-password"
        errors={state.fieldErrors?.password}
      />
      <FormMessage message={state.message} />
      <div>
        <Button type="submit" pending={pending}>
          Sign: {meaning.toLowerCase()}
        </Button>
      </div>
    </form>
  );
}
