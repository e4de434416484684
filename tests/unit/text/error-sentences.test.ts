// Every message a user can read from a service or a route is a sentence: it starts with a capital
// letter (or a number, a quoted name or a unit symbol) and ends with a full stop, a question mark or an
// exclamation mark. Read from the source with the TypeScript parser: the message of every
// `new AppError(code, message)`, `notFound(message)`, `forbidden(message)`, `unprocessable(…)` and
// `parseFields(schema, value, message)` (and its default), and
// every zod message (`message:`, `error:`, a string passed to `.min`/`.max`/`.refine`…) in
// `lib/validation/`, `lib/services/`, `lib/http/`, `lib/auth/`, `lib/errors.ts` and `app/`.
import fs from "node:fs";
import path from "node:path";
import ts from "typescript";
import { describe, expect, it } from "vitest";

const ROOT = path.resolve(__dirname, "../../..");
const FOLDERS = ["lib/validation", "lib/services", "lib/http", "lib/auth", "app"];
const FILES = ["lib/errors.ts"];
const MESSAGE_CALLS = new Set(["notFound", "forbidden", "AppError"]);
const ZOD_MESSAGE_METHODS = new Set([
  "min",
  "max",
  "length",
  "refine",
  "regex",
  "positive",
  "nonnegative",
  "int",
  "email",
  "uuid",
  "url",
  "gte",
  "lte",
  "gt",
  "lt",
  "superRefine",
]);

function sourceFiles(): string[] {
  const out = FILES.map((f) => path.join(ROOT, f));
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (/\.tsx?$/.test(entry.name) && !entry.name.endsWith(".d.ts")) out.push(full);
    }
  };
  for (const folder of FOLDERS) walk(path.join(ROOT, folder));
  return out;
}

interface Message {
  where: string;
  /** The literal text; a template's `${…}` parts are written as `{}`. */
  text: string;
}

function literalText(node: ts.Node): string | null {
  if (ts.isStringLiteral(node) || ts.isNoSubstitutionTemplateLiteral(node)) return node.text;
  if (ts.isTemplateExpression(node)) {
    return node.head.text + node.templateSpans.map((s) => `{}${s.literal.text}`).join("");
  }
  // "A " + "sentence." across lines.
  if (ts.isBinaryExpression(node) && node.operatorToken.kind === ts.SyntaxKind.PlusToken) {
    const left = literalText(node.left);
    const right = literalText(node.right);
    return left !== null && right !== null ? left + right : null;
  }
  if (ts.isParenthesizedExpression(node)) return literalText(node.expression);
  return null;
}

/** The literal branches of a message expression (`a ? "x." : "y."` gives both). */
function branches(node: ts.Node): ts.Node[] {
  if (ts.isConditionalExpression(node))
    return [...branches(node.whenTrue), ...branches(node.whenFalse)];
  return [node];
}

function calleeName(expression: ts.Expression): string | null {
  if (ts.isIdentifier(expression)) return expression.text;
  if (ts.isPropertyAccessExpression(expression)) return expression.name.text;
  return null;
}

function messagesOf(file: string): Message[] {
  const text = fs.readFileSync(file, "utf8");
  const source = ts.createSourceFile(file, text, ts.ScriptTarget.Latest, true);
  const relative = path.relative(ROOT, file);
  const found: Message[] = [];
  const add = (node: ts.Node) => {
    for (const branch of branches(node)) {
      const literal = literalText(branch);
      if (literal === null) continue;
      const { line } = source.getLineAndCharacterOfPosition(branch.getStart());
      found.push({ where: `${relative}:${line + 1}`, text: literal });
    }
  };
  const visit = (node: ts.Node) => {
    if (ts.isNewExpression(node) || ts.isCallExpression(node)) {
      const name = calleeName(node.expression);
      const args = node.arguments ?? ts.factory.createNodeArray();
      if (name === "AppError" && args.length >= 2) add(args[1]);
      else if (name === "parseFields" && args.length >= 3) add(args[2]);
      else if (name && MESSAGE_CALLS.has(name) && args.length >= 1) add(args[0]);
      else if (
        name &&
        ZOD_MESSAGE_METHODS.has(name) &&
        ts.isPropertyAccessExpression(node.expression) &&
        relative.startsWith("lib/validation")
      ) {
        for (const arg of args) {
          if (literalText(arg) !== null) add(arg);
        }
      }
    }
    // `notFound = (what = "Not found") => …`: a default message.
    if (
      ts.isParameter(node) &&
      node.initializer &&
      ts.isArrowFunction(node.parent) &&
      ts.isVariableDeclaration(node.parent.parent) &&
      ts.isIdentifier(node.parent.parent.name) &&
      MESSAGE_CALLS.has(node.parent.parent.name.text)
    ) {
      add(node.initializer);
    }
    // `function parseFields(schema, value, message = "…")`: the 400's default sentence.
    if (
      ts.isParameter(node) &&
      node.initializer &&
      ts.isFunctionDeclaration(node.parent) &&
      node.parent.name?.text === "parseFields" &&
      ts.isIdentifier(node.name) &&
      node.name.text === "message"
    ) {
      add(node.initializer);
    }
    if (
      ts.isPropertyAssignment(node) &&
      ts.isIdentifier(node.name) &&
      (node.name.text === "message" || node.name.text === "error") &&
      relative.startsWith("lib/validation")
    ) {
      add(node.initializer);
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  return found;
}

/** A capital letter, a digit, a quote, a placeholder, or a symbol a sentence may open with (λ, Δ, σ). */
const OPENS = /^(?:[A-Z0-9"“'‘`(]|\{\}|[ΔλσÅ])/;
// A message that ends in a placeholder carries another layer's sentence (a core error's), which is
// checked where it is written.
const CLOSES = /(?:[.?!]["”)]?|\{\})$/;

export function isSentence(message: string): boolean {
  const trimmed = message.trim();
  return OPENS.test(trimmed) && CLOSES.test(trimmed);
}

describe("user-facing messages are sentences", () => {
  const messages = sourceFiles().flatMap(messagesOf);

  it("finds the messages it checks (the scan itself works)", () => {
    // Known sentences from three layers, so a broken scan cannot pass by finding nothing.
    const texts = messages.map((m) => m.text);
    expect(messages.length).toBeGreaterThan(150);
    expect(texts).toContain("This review round is already decided.");
    expect(texts).toContain("Say what the author should look at again.");
    expect(texts).toContain("You are not allowed to do that.");
  });

  it("every message starts with a capital and ends with a full stop", () => {
    const bad = messages.filter((m) => !isSentence(m.text)).map((m) => `${m.where}: ${m.text}`);
    expect(bad).toEqual([]);
  });

  it("the check itself refuses fragments", () => {
    expect(isSentence("Not found")).toBe(false);
    expect(isSentence("no such run.")).toBe(false);
    expect(isSentence("No such run.")).toBe(true);
    expect(isSentence("{} rows were read.")).toBe(true);
  });
});
