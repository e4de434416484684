// Checking a draft against a reference file, through HTTP against the real PostgreSQL, in a team of the
// test's own: only its lab lead may; bad files are refused with a sentence and nothing written; rows
// agree within the combined uncertainty; disagreements wait for decisions; the apply is one transaction
// with one audit event; a published release is never touched.
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ApiClient, type ErrorBody } from "./support/http-client";
import { createAccountThroughInvitation, signInDemo, signedIn } from "./support/accounts";
import { auditEventsSince, auditMark, closeDb, db } from "./support/database";
import { joinWithExistingAccount, scratchTeam, type ScratchTeam } from "./support/scratch-team";

interface Pair {
  lineId: string;
  lineKey: string;
  species: string;
  medium: "air" | "vacuum";
  draftNm: number;
  referenceNm: number;
  differenceNm: number;
  combinedUncertaintyNm: number;
  toleranceNm: number;
  citation: string;
}
interface Preview {
  fileSha256: string;
  fingerprint: string;
  referenceLineCount: number;
  agreeing: Pair[];
  alreadyVerified: Pair[];
  disagreeing: Pair[];
  referenceOnly: { species: string; wavelengthNm: number; csvLine: number }[];
  draftOnly: { species: string; airNm: number | null }[];
  otherSpeciesCount: number;
  citations: string[];
}
interface Line {
  id: string;
  lineKey: string;
  species: string;
  airNm: number | null;
  vacuumNm: number;
  uncertaintyNm: number | null;
  verified: boolean;
  verifiedByName: string | null;
  verifiedCitation: string | null;
}

const REFERENCE = fs.readFileSync(
  path.resolve(__dirname, "../fixtures/lines/reference-check-example.csv"),
  "utf8",
);
const SOURCE = "Test draft row for the reference check";
// The draft rows are the test's own. Hg I 546.084 and 404.666 are deliberately 0.010 nm away from the
// reference (test values, not data) so that the check has disagreements to decide.
const DRAFT_CSV = [
  "species,air_nm,uncertainty_nm,source",
  `Na I,588.995,0.001,${SOURCE}`,
  `Na I,589.592,0.001,${SOURCE}`,
  `Hg I,435.833,0.001,${SOURCE}`,
  `Hg I,253.652,0.001,${SOURCE}`,
  `Hg I,546.084,0.001,${SOURCE} (deliberately 0.010 nm off)`,
  `Hg I,404.666,0.001,${SOURCE} (deliberately 0.010 nm off)`,
  `Hg I,365.015,0.001,${SOURCE}`,
  `K I,766.49,0.002,${SOURCE}`,
].join("\n");

let team: ScratchTeam;
let lead: ApiClient;
let chemist: ApiClient;
let outsiderLead: ApiClient;
let draftId: string;

async function draftLines(query = ""): Promise<Line[]> {
  const reply = await lead.get<{ lines: Line[] }>(
    `/api/lines?teamId=${team.teamId}&release=${draftId}&pageSize=500${query}`,
  );
  expect(reply.status, JSON.stringify(reply.body)).toBe(200);
  return reply.body.lines;
}

/** Every row of the draft in one hash, and the newest audit event: "nothing written" compares these. */
async function snapshot(): Promise<{ rows: string; audit: number }> {
  const { rows } = await db().query<{ digest: string }>(
    `SELECT md5(coalesce(string_agg(l::text, '|' ORDER BY l.id), '')) AS digest FROM lines l WHERE l.release_id = $1`,
    [draftId],
  );
  return { rows: rows[0].digest, audit: await auditMark() };
}

const preview = (client: ApiClient, body: unknown, releaseId = draftId) =>
  client.post<Preview & ErrorBody>(`/api/releases/${releaseId}/reference-check/preview`, body);
const apply = (client: ApiClient, body: unknown, releaseId = draftId) =>
  client.post<ErrorBody & Record<string, number>>(
    `/api/releases/${releaseId}/reference-check/apply`,
    body,
  );

beforeAll(async () => {
  const demoLead = await signInDemo("labLead");
  outsiderLead = demoLead;
  team = await scratchTeam(demoLead);
  lead = await signedIn(team.founder.email, team.founder.password);
  const person = await createAccountThroughInvitation(demoLead, { label: "refcheck-chemist" });
  await joinWithExistingAccount(lead, team.teamId, team.name, person, "chemist");
  chemist = await signedIn(person.email, person.password);

  const opened = await lead.post<{ id: string }>("/api/releases/draft", { teamId: team.teamId });
  expect(opened.status, JSON.stringify(opened.body)).toBe(200);
  draftId = opened.body.id;
  const planned = await lead.post<{ fingerprint: string; errors: unknown[] }>(
    `/api/releases/${draftId}/import/preview`,
    { csv: DRAFT_CSV },
  );
  expect(planned.body.errors).toEqual([]);
  const imported = await lead.post(`/api/releases/${draftId}/import/apply`, {
    csv: DRAFT_CSV,
    fingerprint: planned.body.fingerprint,
  });
  expect(imported.status, JSON.stringify(imported.body)).toBe(200);
});

afterAll(closeDb);

describe("who may check", () => {
  it("refuses a chemist (403) and another team's lab lead (404), and writes nothing", async () => {
    const before = await snapshot();
    expect((await preview(chemist, { csv: REFERENCE })).status).toBe(403);
    expect((await apply(chemist, { csv: REFERENCE, fingerprint: "x".repeat(64) })).status).toBe(
      403,
    );
    expect((await preview(outsiderLead, { csv: REFERENCE })).status).toBe(404);
    expect((await preview(new ApiClient(), { csv: REFERENCE })).status).toBe(401);
    expect(await snapshot()).toEqual(before);
  });
});

describe("bad reference files", () => {
  it("refuses each with a sentence that names the problem, and writes nothing", async () => {
    const before = await snapshot();
    const missing = await preview(lead, {
      csv: "species,wavelength_nm,citation\nNa I,588.995,x\n",
      medium: "air",
    });
    expect(missing.status).toBe(400);
    expect(missing.body.error.message).toMatch(/nothing was compared or written/);
    expect(missing.body.error.message).toMatch(/"uncertainty_nm" is missing/);

    const noMedium = await preview(lead, {
      csv: "species,wavelength_nm,uncertainty_nm,citation\nNa I,588.995,0.001,x\n",
    });
    expect(noMedium.status).toBe(400);
    expect(noMedium.body.error.fieldErrors?.csv?.[0]).toMatch(
      /^Line 2 \(medium\): .*air or in vacuum/,
    );

    const badRow = await preview(lead, {
      csv: "species,wavelength_nm,uncertainty_nm,citation,medium\nNa I,588.995,0.001,x,air\nNa I,589.592,-1,x,air\n",
    });
    expect(badRow.status).toBe(400);
    expect(badRow.body.error.message).toMatch(/Line 3, column 3 \(uncertainty_nm\)/);

    const badMedium = await preview(lead, { csv: REFERENCE, medium: "water" });
    expect(badMedium.status).toBe(400);
    expect(badMedium.body.error.fieldErrors?.medium?.[0]).toMatch(/"air" or in "vacuum"/);

    const rows = ["species,wavelength_nm,uncertainty_nm,citation,medium"];
    for (let i = 0; i < 20_001; i++) rows.push(`Na I,${(500 + i * 0.01).toFixed(2)},0.001,x,air`);
    const tooMany = await preview(lead, { csv: rows.join("\n") });
    expect(tooMany.status).toBe(413);
    expect(tooMany.body.error.message).toMatch(/20,001 rows; one check takes at most 20,000/);

    const tooLarge = await preview(lead, { csv: "#".repeat(5 * 1024 * 1024) });
    expect(tooLarge.status).toBe(413);
    expect(tooLarge.body.error.message).toMatch(/larger than the 2 MB/);

    expect(await snapshot()).toEqual(before);
  });
});

describe("the check", () => {
  let checked: Preview;

  it("previews agreement within the combined uncertainty, in each reference line's medium, writing nothing", async () => {
    const before = await snapshot();
    const reply = await preview(lead, { csv: REFERENCE });
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    checked = reply.body;
    expect(await snapshot()).toEqual(before);

    expect(checked.fileSha256).toBe(createHash("sha256").update(REFERENCE, "utf8").digest("hex"));
    expect(checked.referenceLineCount).toBe(7);
    const agree = checked.agreeing.map((p) => `${p.species} ${p.draftNm.toFixed(3)} ${p.medium}`);
    // Hg I 253.652 nm (air) is compared with the reference's vacuum 253.728 nm through Morton (2000).
    expect(agree.sort()).toEqual(
      ["Hg I 253.728 vacuum", "Hg I 435.833 air", "Na I 588.995 air", "Na I 589.592 air"].sort(),
    );
    const d2 = checked.agreeing.find((p) => p.referenceNm === 588.995)!;
    // √(0.001² + 0.0005²) nm: the draft's and the reference's uncertainties combined.
    expect(d2.combinedUncertaintyNm).toBeCloseTo(Math.hypot(0.001, 0.0005), 12);
    expect(d2.toleranceNm).toBe(0.002);
    expect(d2.citation).toMatch(/NIST ASD/);

    expect(checked.disagreeing.map((p) => [p.species, p.draftNm, p.referenceNm]).sort()).toEqual([
      ["Hg I", 404.666, 404.656],
      ["Hg I", 546.084, 546.074],
    ]);
    for (const p of checked.disagreeing) expect(p.differenceNm).toBeCloseTo(0.01, 9);
    expect(checked.referenceOnly.map((r) => `${r.species} ${r.wavelengthNm}`)).toEqual([
      "Na I 285.281",
    ]);
    expect(checked.draftOnly.map((r) => `${r.species} ${r.airNm}`)).toEqual(["Hg I 365.015"]);
    expect(checked.otherSpeciesCount).toBe(1);
  });

  it("refuses a stale preview and decisions on rows that do not disagree, writing nothing", async () => {
    const before = await snapshot();
    const stale = await apply(lead, { csv: REFERENCE, fingerprint: "0".repeat(64) });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/Check the file again/);
    const agreeingLine = checked.agreeing[0].lineId;
    const wrong = await apply(lead, {
      csv: REFERENCE,
      fingerprint: checked.fingerprint,
      decisions: [{ lineId: agreeingLine, decision: "take" }],
    });
    expect(wrong.status).toBe(422);
    expect(wrong.body.error.message).toMatch(/not among the disagreements/);
    // The same file with a different medium for the whole file is another check.
    const otherMedium = await apply(lead, {
      csv: REFERENCE,
      medium: "vacuum",
      fingerprint: checked.fingerprint,
    });
    expect(otherMedium.status).toBe(409);
    expect(await snapshot()).toEqual(before);
  });

  it("marks agreeing rows verified with their citation, takes or keeps as decided, with one audit event", async () => {
    const mark = await auditMark();
    const take = checked.disagreeing.find((p) => p.draftNm === 546.084)!;
    const keep = checked.disagreeing.find((p) => p.draftNm === 404.666)!;
    const reply = await apply(lead, {
      csv: REFERENCE,
      fingerprint: checked.fingerprint,
      decisions: [
        { lineId: take.lineId, decision: "take" },
        { lineId: keep.lineId, decision: "keep" },
      ],
      reason: "Checked against NIST ASD for the test.",
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    expect(reply.body).toMatchObject({ verified: 5, taken: 1, kept: 1, left: 0 });

    const lines = await draftLines();
    const byAir = new Map(lines.map((l) => [l.airNm, l]));
    for (const nm of [588.995, 589.592, 435.833, 253.652]) {
      const line = byAir.get(nm)!;
      expect(line.verified, `${nm}`).toBe(true);
      expect(line.verifiedCitation).toMatch(/^NIST ASD ver\. 5\.x/);
      expect(line.verifiedByName).toBe(team.founder.name);
    }
    // Taken: the reference's air wavelength and uncertainty, verified with its citation.
    const taken = lines.find((l) => l.id === take.lineId)!;
    expect(taken.airNm).toBe(546.074);
    expect(taken.uncertaintyNm).toBe(0.0005);
    expect(taken.verified).toBe(true);
    // Kept: our value, still unverified.
    const kept = lines.find((l) => l.id === keep.lineId)!;
    expect(kept.airNm).toBe(404.666);
    expect(kept.verified).toBe(false);
    expect(byAir.get(365.015)!.verified).toBe(false);
    expect(byAir.get(766.49)!.verified).toBe(false);
    expect((await draftLines("&verified=true")).length).toBe(5);
    expect((await draftLines("&verified=false")).length).toBe(3);

    const events = await auditEventsSince(mark);
    expect(events.map((e) => e.action)).toEqual(["line_release.reference_check"]);
    const after = events[0].after as Record<string, unknown> & {
      lines: Record<string, { decision: string }>;
    };
    expect(events[0].entity_id).toBe(draftId);
    expect(events[0].reason).toBe("Checked against NIST ASD for the test.");
    expect(after).toMatchObject({
      fileSha256: checked.fileSha256,
      verified: 5,
      taken: 1,
      kept: 1,
      left: 0,
      referenceOnly: 1,
      draftOnly: 1,
    });
    expect((after.citations as string[]).length).toBeGreaterThan(1);
    expect(after.lines[take.lineKey].decision).toBe("take");
    expect(after.lines[keep.lineKey].decision).toBe("keep");

    // The taken line's own history shows the step with its values before and after.
    const history = await lead.get<{ action: string; before: unknown; after: unknown }[]>(
      `/api/lines/${take.lineId}/history`,
    );
    expect(history.status).toBe(200);
    const step = history.body.find((h) => h.action === "line_release.reference_check")!;
    expect(step.before).toMatchObject({ airNm: 546.084, verified: false });
    expect(step.after).toMatchObject({ airNm: 546.074, verified: true, decision: "take" });
  });

  it("leaves verified rows alone the next time and still lists the kept disagreement", async () => {
    const reply = await preview(lead, { csv: REFERENCE });
    expect(reply.status).toBe(200);
    expect(reply.body.agreeing).toEqual([]);
    expect(reply.body.alreadyVerified).toHaveLength(5);
    expect(reply.body.disagreeing.map((p) => p.draftNm)).toEqual([404.666]);
    const nothing = await apply(lead, { csv: REFERENCE, fingerprint: reply.body.fingerprint });
    expect(nothing.status).toBe(422);
    expect(nothing.body.error.message).toMatch(/Nothing to record/);
  });

  it("never changes a published release", async () => {
    const published = await lead.post(`/api/releases/${draftId}/publish`, {
      notes: "Reference check test release.",
    });
    expect(published.status, JSON.stringify(published.body)).toBe(200);
    const before = await snapshot();
    const reply = await preview(lead, { csv: REFERENCE });
    expect(reply.status).toBe(409);
    expect(reply.body.error.message).toMatch(/published and never changes/);
    const applied = await apply(lead, { csv: REFERENCE, fingerprint: "0".repeat(64) });
    expect(applied.status).toBe(409);
    expect(await snapshot()).toEqual(before);
  });
});
