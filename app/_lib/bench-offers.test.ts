import { describe, expect, it } from "vitest";
import type { Bench } from "@/db/queries/benches";
import type { Role } from "@/db/schema";
import { benchOffersFor } from "./bench-offers";

// Only the fields the bench policy reads; the rest of the row does not matter here.
const benchOwnedBy = (privateOwnerId: string | null) =>
  ({ workspaceId: "workspace-1", archivedAt: null, privateOwnerId }) as Bench;
const shared = benchOwnedBy(null);
const member = (role: Role) => ({ role, userId: "member-1", workspaceId: "workspace-1" });
const ownCopy = benchOwnedBy("member-1");
const someoneElsesCopy = benchOwnedBy("member-2");

// product.md, roles table: "create and edit benches and scenarios" — admin, trainer,
// engineer yes; qa scenarios only; apprentice own sandbox copies. "live console" —
// everyone, the apprentice on assigned labs and sandboxes.
describe("what a member is offered on a bench", () => {
  it("offers an apprentice only a practice copy of a shared bench: no Delete, no Duplicate, no editing", () => {
    expect(benchOffersFor(member("apprentice"), shared)).toEqual({
      edit: false,
      delete: false,
      duplicate: false,
      practiceCopy: true,
      live: false,
    });
  });

  it("lets an apprentice edit, run and delete their own copy", () => {
    expect(benchOffersFor(member("apprentice"), ownCopy)).toEqual({
      edit: true,
      delete: true,
      duplicate: false,
      practiceCopy: false,
      live: true,
    });
  });

  it("offers qa the live console and nothing that changes a bench", () => {
    expect(benchOffersFor(member("qa"), shared)).toEqual({
      edit: false,
      delete: false,
      duplicate: false,
      practiceCopy: false,
      live: true,
    });
  });

  it.each(["admin", "trainer", "engineer"] as const)(
    "offers a %s everything on a shared bench (and on copies it may see)",
    (role) => {
      // Engineers never see others' copies (the bench policy); admins and trainers do, to review labs.
      const visible = role === "engineer" ? [shared] : [shared, someoneElsesCopy];
      for (const bench of visible) {
        expect(benchOffersFor(member(role), bench)).toEqual({
          edit: true,
          delete: true,
          duplicate: true,
          practiceCopy: false,
          live: true,
        });
      }
    },
  );
});
