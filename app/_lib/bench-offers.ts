import type { Role } from "@/db/schema";
import { can, canOn } from "./capabilities";

/**
 * What a page offers a member on one bench: the buttons and links shown are
 * exactly the actions the API would allow, decided here once so every page
 * (bench list, console picker, editor) asks the same question and the rule
 * can move to the access policy as a whole. The API checks again on every
 * request; hiding a button is courtesy, not protection.
 */
export interface BenchOffers {
  /** Save revisions, rename (the editor's save, the list's create form). */
  readonly edit: boolean;
  /** Archive the bench. Same rule as editing: the DELETE route asks benches.edit on the bench. */
  readonly delete: boolean;
  /** Copy it as another shared bench of the workspace. */
  readonly duplicate: boolean;
  /**
   * Copy it as the member's own private bench (a practice copy), to edit and
   * run live; offered when the member may not do that on the bench itself.
   */
  readonly practiceCopy: boolean;
  /** Open it in the live console. */
  readonly live: boolean;
}

interface Member {
  readonly role: Role;
  readonly userId: string;
}

export function benchOffersFor(
  member: Member,
  bench: { readonly privateOwnerId: string | null },
): BenchOffers {
  const edit = canOn(member, "benches.edit", bench.privateOwnerId);
  const live = canOn(member, "console.use", bench.privateOwnerId);
  // The duplicate route makes a private copy for "own" scope and a shared one for workspace scope.
  const copiesShared = can(member.role, "benches.edit", { scope: "workspace" });
  const copiesPrivate = can(member.role, "benches.edit") && !copiesShared;
  return {
    edit,
    delete: edit,
    duplicate: copiesShared,
    practiceCopy: copiesPrivate && (!edit || !live),
    live,
  };
}

const practiceSuffix = " (practice copy)";

/** A practice copy's name, kept within the 120 characters a bench name may have. */
export function practiceCopyName(benchName: string): string {
  return `${benchName.slice(0, 120 - practiceSuffix.length)}${practiceSuffix}`;
}
