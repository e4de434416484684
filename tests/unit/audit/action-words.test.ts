// The trail in words: every action the services write has a label and a sentence, and field paths of
// the before/after comparison read as words.
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import {
  ACTIONS_IN_WORDS,
  actionLabel,
  activitySentence,
  fieldLabel,
} from "@/lib/audit/action-words";

/** Every `action: "x.y"` literal written in the services (and the one chosen at run time). */
function actionsWritten(): string[] {
  const dir = path.resolve(__dirname, "../../../lib/services");
  const found = new Set<string>();
  const policy = fs.readFileSync(path.resolve(__dirname, "../../../lib/auth/policy.ts"), "utf8");
  const permissions = new Set([...policy.matchAll(/"([a-z_]+\.[a-z_]+)": \[/g)].map((m) => m[1]));
  for (const file of fs.readdirSync(dir)) {
    const text = fs.readFileSync(path.join(dir, file), "utf8");
    for (const m of text.matchAll(
      /action: (?:[^"\n]*\? )?"([a-z_]+\.[a-z_]+)"(?: : "([a-z_]+\.[a-z_]+)")?/g,
    )) {
      found.add(m[1]);
      if (m[2]) found.add(m[2]);
    }
    // An action chosen at run time from a union type: `action: "line.retire" | "line.verify"`; a
    // union of the policy's permissions (`"lines.edit" | "lines.publish"`) is no audit action.
    for (const m of text.matchAll(/action: ("[a-z_]+\.[a-z_]+"(?:\s*\|\s*"[a-z_]+\.[a-z_]+")+)/g)) {
      for (const name of m[1].matchAll(/"([a-z_]+\.[a-z_]+)"/g)) {
        if (!permissions.has(name[1])) found.add(name[1]);
      }
    }
  }
  return [...found].sort();
}

describe("the trail's words", () => {
  it("has words for every action the services write", () => {
    const written = actionsWritten();
    expect(written).toContain("run.create");
    expect(written).toContain("run.rerun");
    expect(written).toContain("line.verify");
    expect(written.filter((a) => !ACTIONS_IN_WORDS.includes(a))).toEqual([]);
  });

  it("says an event as a sentence, with the record's name where there is one", () => {
    expect(
      activitySentence({
        actorName: "Mara Quist",
        action: "run.create",
        subject: "Flame sample A",
      }),
    ).toBe("Mara Quist started run Flame sample A.");
    expect(activitySentence({ actorName: "Mara Quist", action: "run.create", subject: null })).toBe(
      "Mara Quist started a run.",
    );
    expect(
      activitySentence({ actorName: "Ilse Varga", action: "session.create", subject: "x@y.z" }),
    ).toBe("Ilse Varga signed in.");
    expect(activitySentence({ actorName: null, action: "run.sign", subject: "Sample B" })).toBe(
      "The system signed run Sample B.",
    );
    expect(activitySentence({ actorName: "A B", action: "widget.spin", subject: null })).toBe(
      "A B: widget spin.",
    );
  });

  it("labels actions and fields in words", () => {
    expect(actionLabel("run.review_mark")).toBe("Review mark");
    expect(actionLabel("widget.spin_up")).toBe("Widget spin up");
    expect(fieldLabel("rerunOfId")).toBe("Re-run of");
    expect(fieldLabel("present[0]")).toBe("Present, 1st");
    expect(fieldLabel("present[1]")).toBe("Present, 2nd");
    expect(fieldLabel("present[10]")).toBe("Present, 11th");
    expect(fieldLabel("settings.windowPx")).toBe("Settings › Window px");
    expect(fieldLabel("instrumentId")).toBe("Instrument");
    expect(fieldLabel("upperEv")).toBe("Upper eV");
    expect(fieldLabel("")).toBe("Value");
  });
});
