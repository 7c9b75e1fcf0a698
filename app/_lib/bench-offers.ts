import type { Bench } from "@/db/queries/benches";
import { can } from "./capabilities";
import { benchCan } from "./policy/bench";
import type { Who } from "./policy/policy";

/**
 * What a page offers a member on one bench: the buttons and links shown are
 * exactly the actions the bench policy allows, so every page (bench list,
 * console picker, editor) asks the same question. The API checks again on
 * every request; hiding a button is courtesy, not protection.
 */
export interface BenchOffers {
  /** Save revisions, rename (the editor's save, the list's create form). */
  readonly edit: boolean;
  /** Archive the bench. */
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

export function benchOffersFor(who: Who, bench: Bench): BenchOffers {
  const allowed = benchCan(who, bench);
  // The duplicate route makes a private copy for "own" scope and a shared one for workspace scope.
  const copiesShared = can(who.role, "benches.edit", { scope: "workspace" });
  const copiesPrivate = allowed.share && !copiesShared;
  return {
    edit: allowed.edit,
    delete: allowed.delete,
    duplicate: allowed.share && copiesShared,
    practiceCopy: copiesPrivate && (!allowed.edit || !allowed.run),
    live: allowed.run,
  };
}

export { practiceCopyName } from "./practice-copy-name";
