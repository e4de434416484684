// The GET form above the audit table: person, entity, action, first and last day (UTC). Everything
// lands in the URL, so a filtered trail can be shared as a link; errors sit beside their field.
import Link from "next/link";
import type { FieldErrors } from "@/lib/errors";
import type { AuditFilter } from "@/lib/services/audit";
import type { TeamMember } from "@/lib/services/team-members";
import { entityLabel, shortId } from "./audit-labels";

const inputClass =
  "rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1 text-sm aria-[invalid=true]:border-red-600";

function Labelled({
  id,
  label,
  errors,
  children,
}: {
  id: string;
  label: string;
  errors?: string[];
  children: React.ReactNode;
}) {
  return (
    <div className="flex flex-col gap-0.5">
      <label htmlFor={id} className="text-xs font-medium">
        {label}
      </label>
      {children}
      <div
        id={`${id}-error`}
        aria-live="polite"
        className="max-w-56 text-xs text-red-700 dark:text-red-300"
      >
        {errors?.map((message) => (
          <p key={message}>{message}</p>
        ))}
      </div>
    </div>
  );
}

/** Actions with their families ("run." for every run action), for the action field's suggestions. */
function actionSuggestions(actions: string[]): string[] {
  const families = new Set(
    actions.filter((a) => a.includes(".")).map((a) => `${a.slice(0, a.indexOf("."))}.`),
  );
  return [...families, ...actions].sort();
}

export function AuditFilters({
  values,
  members,
  entities,
  actions,
  errors = {},
}: {
  values: AuditFilter;
  members: TeamMember[];
  entities: string[];
  actions: string[];
  errors?: FieldErrors;
}) {
  const entityChoices =
    values.entity && !entities.includes(values.entity) ? [...entities, values.entity] : entities;
  const invalid = (field: string) => (errors[field]?.length ? true : undefined);
  return (
    <form
      method="get"
      action="/audit"
      role="search"
      aria-label="Filter the audit trail"
      className="panel mb-3 flex flex-wrap items-start gap-3 p-3"
    >
      <input type="hidden" name="teamId" value={values.teamId} />
      <Labelled id="actorId" label="Person" errors={errors.actorId}>
        <select
          id="actorId"
          name="actorId"
          defaultValue={values.actorId ?? ""}
          aria-invalid={invalid("actorId")}
          aria-describedby="actorId-error"
          className={inputClass}
        >
          <option value="">Anyone</option>
          {members.map((m) => (
            <option key={m.userId} value={m.userId}>
              {m.name}
            </option>
          ))}
        </select>
      </Labelled>
      <Labelled id="entity" label="Entity" errors={errors.entity}>
        <select
          id="entity"
          name="entity"
          defaultValue={values.entity ?? ""}
          aria-invalid={invalid("entity")}
          aria-describedby="entity-error"
          className={inputClass}
        >
          <option value="">Any</option>
          {entityChoices.map((entity) => (
            <option key={entity} value={entity}>
              {entityLabel(entity)}
            </option>
          ))}
        </select>
      </Labelled>
      {values.entityId ? (
        <div className="flex flex-col gap-0.5">
          <span className="text-xs font-medium">Record</span>
          <span className="flex items-center gap-2 py-1 text-sm">
            <input type="hidden" name="entityId" value={values.entityId} />
            <span className="font-mono text-xs" title={values.entityId}>
              {shortId(values.entityId)}
            </span>
            <Link
              href={`/audit?${new URLSearchParams({ teamId: values.teamId, ...(values.entity ? { entity: values.entity } : {}) })}`}
              className="text-xs underline"
            >
              Any {values.entity ? entityLabel(values.entity).toLowerCase() : "record"}
            </Link>
          </span>
        </div>
      ) : null}
      <Labelled id="action" label="Action" errors={errors.action}>
        <input
          id="action"
          name="action"
          list="audit-actions"
          defaultValue={values.action ?? ""}
          placeholder="run. or run.create"
          aria-invalid={invalid("action")}
          aria-describedby="action-hint action-error"
          className={`${inputClass} w-48`}
        />
        <span id="action-hint" className="muted max-w-56 text-xs">
          Exact, or end with a dot for all of a kind.
        </span>
        <datalist id="audit-actions">
          {actionSuggestions(actions).map((a) => (
            <option key={a} value={a} />
          ))}
        </datalist>
      </Labelled>
      <Labelled id="from" label="From (UTC day)" errors={errors.from}>
        <input
          id="from"
          name="from"
          type="date"
          defaultValue={values.from ?? ""}
          aria-invalid={invalid("from")}
          aria-describedby="from-error"
          className={inputClass}
        />
      </Labelled>
      <Labelled id="to" label="To (UTC day, included)" errors={errors.to}>
        <input
          id="to"
          name="to"
          type="date"
          defaultValue={values.to ?? ""}
          aria-invalid={invalid("to")}
          aria-describedby="to-error"
          className={inputClass}
        />
      </Labelled>
      <div className="flex items-center gap-2 self-center pt-1">
        <button
          type="submit"
          className="rounded bg-ember-600 px-3 py-1 text-sm font-medium text-white hover:bg-ember-700"
        >
          Show events
        </button>
        <Link href={`/audit?teamId=${values.teamId}`} className="text-sm underline">
          Clear
        </Link>
      </div>
    </form>
  );
}
