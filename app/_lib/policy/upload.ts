import { findFloorPlan, type Upload } from "@/db/queries/uploads";
import type { Bench } from "@/db/queries/benches";
import { benchCan, loadBench } from "./bench";
import { type Action, type Can, type Who } from "./policy";

/**
 * The upload policy. An upload belongs to a bench (a floor plan) and follows
 * it: read by whoever may read the bench, replaced or removed by whoever may
 * edit it.
 */

export function uploadCan(who: Who, bench: Bench): Can {
  const can = benchCan(who, bench);
  return { ...can, run: false, share: false };
}

/** The bench whose floor plan is asked for, loaded for the action. */
export function loadFloorPlanBench(who: Who, benchId: string, action: Action = "read"): Bench {
  return loadBench(who, benchId, action === "delete" ? "edit" : action);
}

/** The bench's floor plan, when there is one and the session may read the bench. */
export function findReadableFloorPlan(who: Who, bench: Bench): Upload | undefined {
  if (!uploadCan(who, bench).read) return undefined;
  return findFloorPlan({ workspaceId: who.workspaceId, benchId: bench.id });
}
