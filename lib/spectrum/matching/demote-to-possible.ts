// Turns a present call into a possible one, saying why.

import type { ElementCall } from "./score-elements-types";

/** A present call becomes possible, with a note saying why and the reason added to its rationale. */
export function demoteToPossible(call: ElementCall, note: string, reason: string): void {
  call.verdict = "possible";
  call.notes.push(note);
  call.rationale = `${call.rationale.replace(/^Present:/, "Possible:")} ${reason}`;
}
