import { describe, expect, it } from "vitest";
import { AppError } from "./errors";
import { type Actor, assertCan, can, canOn } from "./permissions";

// The rules come from the product's design (api.md: drafts belong to their owner, an editor
// reviews someone else's guide), not from an outside standard: common practice for review workflows.

const reader: Actor = { id: 1, role: "reader" };
const author: Actor = { id: 2, role: "author" };
const otherAuthor: Actor = { id: 3, role: "author" };
const editor: Actor = { id: 4, role: "editor" };
const admin: Actor = { id: 5, role: "admin" };

const guideOf = (authorId: number) => ({ authorId });
const revisionOf = (authorId: number) => ({ guide: { authorId } });

function refusal(fn: () => void) {
  try {
    fn();
  } catch (error) {
    if (error instanceof AppError) return { status: error.status, message: error.message };
    throw error;
  }
  return null;
}

describe("canOn resolves :own against the object's owner", () => {
  it("lets an author change and submit only their own guide", () => {
    expect(canOn(author, "update:guide", guideOf(author.id))).toBe(true);
    expect(canOn(author, "submit:guide", guideOf(author.id))).toBe(true);
    expect(canOn(otherAuthor, "update:guide", guideOf(author.id))).toBe(false);
    expect(canOn(otherAuthor, "submit:guide", guideOf(author.id))).toBe(false);
    expect(canOn(reader, "update:guide", guideOf(reader.id))).toBe(false);
  });

  it("gives editors no way into someone else's draft", () => {
    expect(canOn(editor, "update:guide", guideOf(author.id))).toBe(false);
    expect(canOn(admin, "submit:guide", guideOf(author.id))).toBe(false);
  });

  it("lets a photo be attached only by the account that uploaded it", () => {
    expect(canOn(author, "attach:media", { ownerId: author.id })).toBe(true);
    expect(canOn(otherAuthor, "attach:media", { ownerId: author.id })).toBe(false);
    expect(canOn(editor, "attach:media", { ownerId: author.id })).toBe(false);
  });

  it("keeps checklists and saved vehicles to their owner", () => {
    expect(canOn(reader, "manage:checklist", { userId: reader.id })).toBe(true);
    expect(canOn(reader, "manage:checklist", { userId: author.id })).toBe(false);
    expect(canOn(admin, "manage:checklist", { userId: reader.id })).toBe(false);
    expect(canOn(reader, "save:vehicle", { userId: reader.id })).toBe(true);
    expect(canOn(author, "save:vehicle", { userId: reader.id })).toBe(false);
  });

  it("lets editors review, sign off and publish anyone's guide but their own", () => {
    for (const action of ["review:revision", "signoff:caution"] as const) {
      expect(canOn(editor, action, revisionOf(author.id))).toBe(true);
      expect(canOn(admin, action, revisionOf(author.id))).toBe(true);
      expect(canOn(editor, action, revisionOf(editor.id))).toBe(false);
      expect(canOn(admin, action, revisionOf(admin.id))).toBe(false);
      expect(canOn(author, action, revisionOf(otherAuthor.id))).toBe(false);
    }
    expect(canOn(editor, "publish:guide", guideOf(author.id))).toBe(true);
    expect(canOn(editor, "publish:guide", guideOf(editor.id))).toBe(false);
  });

  it("checks plain permissions without an object", () => {
    expect(canOn(author, "create:guide")).toBe(true);
    expect(canOn(reader, "create:guide")).toBe(false);
    expect(canOn(author, "upload:media")).toBe(true);
    expect(canOn(reader, "upload:media")).toBe(false);
    expect(canOn(null, "create:guide")).toBe(false);
  });

  it("agrees with the role table for the role-level check", () => {
    expect(can(author, "update:guide:own")).toBe(true);
    expect(can(reader, "update:guide:own")).toBe(false);
  });
});

describe("assertCan throws the AppError the API and pages show", () => {
  it("answers 403 with a reason, and says nothing when allowed", () => {
    expect(refusal(() => assertCan(author, "update:guide", guideOf(author.id)))).toBeNull();
    expect(refusal(() => assertCan(otherAuthor, "update:guide", guideOf(author.id)))).toEqual({
      status: 403,
      message: "Only the guide's author can change this draft.",
    });
    expect(refusal(() => assertCan(editor, "review:revision", revisionOf(editor.id)))).toEqual({
      status: 403,
      message: "Editors cannot review their own guides.",
    });
    expect(refusal(() => assertCan(reader, "review:revision", revisionOf(author.id)))?.status).toBe(403);
  });

  it("answers 401 when nobody is signed in", () => {
    expect(refusal(() => assertCan(null, "update:guide", guideOf(author.id)))?.status).toBe(401);
  });
});
