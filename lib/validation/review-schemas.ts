// Schemas of submission, review marks, review decisions and the review queue's filters, shared by
// the route handlers and the review pages' server actions. The services check what depends on data.
import { z } from "zod";
import { blank, numberOrUndefined } from "./form-data";
import { text } from "./text";

export const MAX_REVIEW_COMMENT = 4000;

export const submitRunSchema = z.object({
  reviewerId: z.uuid("Choose a reviewer from the list.").nullable().optional(),
  /** The author's answer to the comments of the round that returned the run. */
  reply: text()
    .trim()
    .max(MAX_REVIEW_COMMENT, `Use at most ${MAX_REVIEW_COMMENT} characters.`)
    .default(""),
});
/** The parsed body, or a service caller's own (the seed) with `reply` left out. */
export type SubmitRunInput = z.input<typeof submitRunSchema>;

export const reviewMarkSchema = z
  .object({
    species: text({ error: "Say which call the mark is about." })
      .trim()
      .min(1, "Say which call the mark is about.")
      .max(40),
    lineNm: z
      .number({ error: "The line is its wavelength in nm." })
      .finite()
      .positive("The line is its wavelength in nm.")
      .nullable()
      .optional(),
    agreement: z
      .enum(["agree", "disagree"], { error: "Choose agree or disagree." })
      .nullable()
      .optional(),
    comment: text()
      .trim()
      .max(MAX_REVIEW_COMMENT, `Use at most ${MAX_REVIEW_COMMENT} characters.`)
      .default(""),
  })
  .refine((m) => m.agreement != null || m.comment !== "", {
    path: ["comment"],
    message: "Agree, disagree or write a comment.",
  });
export type ReviewMarkInput = z.infer<typeof reviewMarkSchema>;

export const reviewDecisionSchema = z
  .object({
    decision: z.enum(["return", "sign"], { error: "The decision is return or sign." }),
    comment: text()
      .trim()
      .max(MAX_REVIEW_COMMENT, `Use at most ${MAX_REVIEW_COMMENT} characters.`)
      .default(""),
    /** Asked again for a signature; not needed to return a run. */
    password: z.string().max(256).optional(),
  })
  .refine((d) => d.decision !== "return" || d.comment !== "", {
    path: ["comment"],
    message: "Say what the author should look at again.",
  })
  .refine((d) => d.decision !== "sign" || (d.password ?? "") !== "", {
    path: ["password"],
    message: "Enter your password to sign.",
  });
export type ReviewDecisionInput = z.infer<typeof reviewDecisionSchema>;

export const reviewQueueQuerySchema = z.object({
  teamId: z.uuid("Choose a team."),
  author: z.uuid("Choose an author from the list.").optional(),
  instrumentId: z.uuid("Choose an instrument from the list.").optional(),
  species: text().trim().min(1).max(40).optional(),
});
export type ReviewQueueQuery = z.infer<typeof reviewQueueQuerySchema>;

/** The query string of GET /api/review-queue or the queue page's search params; empty = not given. */
export function reviewQueueQueryFrom(get: (name: string) => string | null | undefined) {
  const value = (name: string) => {
    const text = (get(name) ?? "").trim();
    return text === "" ? undefined : text;
  };
  return reviewQueueQuerySchema.safeParse({
    teamId: value("teamId"),
    author: value("author"),
    instrumentId: value("instrumentId"),
    species: value("species"),
  });
}

export function submitInputFromForm(formData: FormData) {
  return submitRunSchema.safeParse({
    reviewerId: blank(formData.get("reviewerId")) || null,
    reply: blank(formData.get("reply")),
  });
}

export function markInputFromForm(formData: FormData) {
  return reviewMarkSchema.safeParse({
    species: blank(formData.get("species")),
    lineNm: numberOrUndefined(formData.get("lineNm")) ?? null,
    agreement: blank(formData.get("agreement")) || null,
    comment: blank(formData.get("comment")),
  });
}

export function decisionInputFromForm(formData: FormData) {
  const password = formData.get("password");
  return reviewDecisionSchema.safeParse({
    decision: blank(formData.get("decision")),
    comment: blank(formData.get("comment")),
    password: typeof password === "string" ? password : undefined,
  });
}
