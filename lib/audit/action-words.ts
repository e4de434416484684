// What the audit trail's events and fields mean in words: "Mara Quist started run Flame sample A"
// rather than "run.create", "Re-run of" rather than "rerunOfId". The home page's activity, the audit
// table and the before/after comparison read them from here; the raw names stay for filters and exports.

interface ActionWords {
  /** A short name for tables: "Run started". */
  label: string;
  /** The verb phrase after the person's name, before the subject: "started run". */
  verb: string;
  /** The phrase when the record has no name to give: "started a run". */
  alone: string;
}

const ACTIONS: Record<string, ActionWords> = {
  "calibration.create": {
    label: "Calibration saved",
    verb: "saved a calibration of",
    alone: "saved a calibration",
  },
  "instrument.create": {
    label: "Instrument added",
    verb: "added instrument",
    alone: "added an instrument",
  },
  "instrument.export_profile": {
    label: "Export profile set",
    verb: "set the export profile of",
    alone: "set an instrument's export profile",
  },
  "instrument.update": {
    label: "Instrument changed",
    verb: "changed instrument",
    alone: "changed an instrument",
  },
  "invitation.create": { label: "Invitation sent", verb: "invited", alone: "sent an invitation" },
  "invitation.resend": {
    label: "Invitation sent again",
    verb: "sent the invitation again to",
    alone: "sent an invitation again",
  },
  "invitation.revoke": {
    label: "Invitation withdrawn",
    verb: "withdrew the invitation of",
    alone: "withdrew an invitation",
  },
  "line.add": { label: "Line added", verb: "added line", alone: "added a line" },
  "line.restore": { label: "Line restored", verb: "restored line", alone: "restored a line" },
  "line.retire": { label: "Line retired", verb: "retired line", alone: "retired a line" },
  "line.update": { label: "Line changed", verb: "changed line", alone: "changed a line" },
  "line.verify": { label: "Line verified", verb: "verified line", alone: "verified a line" },
  "line_release.import": {
    label: "Lines imported",
    verb: "imported lines into",
    alone: "imported lines",
  },
  "line_release.reference_check": {
    label: "Checked against a reference",
    verb: "checked lines against a reference in",
    alone: "checked lines against a reference",
  },
  "line_release.open_draft": {
    label: "Draft release opened",
    verb: "opened",
    alone: "opened a draft release",
  },
  "line_release.publish": {
    label: "Release published",
    verb: "published",
    alone: "published a release",
  },
  "lines.edit": { label: "Lines edited", verb: "edited lines of", alone: "edited lines" },
  "membership.create": { label: "Member joined", verb: "joined as", alone: "joined the team" },
  "membership.delete": { label: "Member removed", verb: "removed", alone: "removed a member" },
  "membership.update": {
    label: "Role changed",
    verb: "changed the role of",
    alone: "changed a member's role",
  },
  "notebook.create": {
    label: "Notebook created",
    verb: "created notebook",
    alone: "created a notebook",
  },
  "notebook.rename": {
    label: "Notebook renamed",
    verb: "renamed notebook",
    alone: "renamed a notebook",
  },
  "password.change": {
    label: "Password changed",
    verb: "changed their password",
    alone: "changed their password",
  },
  "password.reset": {
    label: "Password reset",
    verb: "reset their password",
    alone: "reset their password",
  },
  "run.amend": { label: "Run amended", verb: "amended run", alone: "amended a run" },
  "run.create": { label: "Run started", verb: "started run", alone: "started a run" },
  "run.notes": {
    label: "Run notes saved",
    verb: "wrote notes on run",
    alone: "wrote notes on a run",
  },
  "run.override": {
    label: "Call overridden",
    verb: "overrode a call of run",
    alone: "overrode a call",
  },
  "run.rerun": { label: "Run repeated", verb: "re-ran run", alone: "re-ran a run" },
  "run.return": { label: "Run returned", verb: "returned run", alone: "returned a run" },
  "run.review_mark": { label: "Review mark", verb: "marked a call of run", alone: "marked a call" },
  "run.sign": { label: "Run signed", verb: "signed run", alone: "signed a run" },
  "run.submit": { label: "Run submitted", verb: "submitted run", alone: "submitted a run" },
  "session.create": { label: "Signed in", verb: "signed in", alone: "signed in" },
  "spectrum.upload": { label: "Spectrum uploaded", verb: "uploaded", alone: "uploaded a spectrum" },
  "token.create": {
    label: "Access token made",
    verb: "made access token",
    alone: "made an access token",
  },
  "token.revoke": {
    label: "Access token revoked",
    verb: "revoked access token",
    alone: "revoked an access token",
  },
  "user.create": {
    label: "Account created",
    verb: "created the account of",
    alone: "created an account",
  },
};

/** Every action the trail names in words (a test checks that the services write no other). */
export const ACTIONS_IN_WORDS: readonly string[] = Object.keys(ACTIONS);

/** "run.review_mark" → "Run review mark": the fallback for an action without words of its own. */
function spelledOut(action: string): string {
  const text = action.replace(/[._]/g, " ").trim();
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** A short name of the action for tables and lists. */
export function actionLabel(action: string): string {
  return ACTIONS[action]?.label ?? spelledOut(action);
}

/**
 * One event as a sentence: "Mara Quist started run Flame sample A". `subject` names the record (a
 * run's sample, a notebook's title); without it the sentence ends at the verb's object word.
 */
export function activitySentence(event: {
  actorName: string | null;
  action: string;
  subject: string | null;
}): string {
  const who = event.actorName ?? "The system";
  const words = ACTIONS[event.action];
  const subject = event.subject?.trim();
  if (!words)
    return `${who}: ${spelledOut(event.action).toLowerCase()}${subject ? ` (${subject})` : ""}.`;
  // An action on oneself ("signed in") takes no subject: its verb and its lone form are one.
  return subject && words.verb !== words.alone
    ? `${who} ${words.verb} ${subject}.`
    : `${who} ${words.alone}.`;
}

/** Units and id suffixes as a field name's last word: "energyEv" → "Energy eV", "runId" → "Run". */
const UNIT_WORDS: Record<string, string> = { nm: "nm", px: "px", ev: "eV", id: "" };

const FIELDS: Record<string, string> = {
  amendsRunId: "Amends run",
  calibrationId: "Calibration",
  createdById: "Made by",
  email: "E-mail",
  fileName: "File name",
  lineReleaseId: "Line-table release",
  lockVersion: "Edit count",
  notebookId: "Notebook",
  present: "Present",
  possible: "Possible",
  absent: "Absent",
  requestedReviewerId: "Reviewer asked",
  rerunOfId: "Re-run of",
  reviewRound: "Review round",
  sha256: "SHA-256",
  spectrumId: "Spectrum",
  teamId: "Team",
  userId: "Person",
  versionNumber: "Version",
};

/** "rerunOfId" → "Re-run of"; "present[0]" → "Present, 1st"; "settings.windowPx" → "Settings › Window px". */
export function fieldLabel(path: string): string {
  if (path === "") return "Value";
  return path
    .split(".")
    .map((part) => {
      const match = /^([^[]*)((?:\[\d+\])*)$/.exec(part);
      const name = match ? match[1] : part;
      const positions = match ? [...match[2].matchAll(/\[(\d+)\]/g)].map((m) => Number(m[1])) : [];
      const words =
        FIELDS[name] ??
        (name
          .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
          .replace(/_/g, " ")
          .replace(/\b(nm|px|ev|id)\b/gi, (unit) => UNIT_WORDS[unit.toLowerCase()])
          .trim()
          .replace(/^./, (c) => c.toUpperCase()) ||
          name);
      return [words, ...positions.map((p) => ordinal(p + 1))].join(", ");
    })
    .join(" › ");
}

function ordinal(n: number): string {
  const tens = n % 100;
  const suffix = tens >= 11 && tens <= 13 ? "th" : (["th", "st", "nd", "rd"][n % 10] ?? "th");
  return `${n}${suffix}`;
}
