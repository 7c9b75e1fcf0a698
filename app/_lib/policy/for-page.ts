import { notFound } from "next/navigation";
import { AppError } from "../errors";

/**
 * For pages: run a policy loader and answer a refusal as Next's 404 page, so a
 * page never tells a row one may not open (or not act on) from a missing one.
 */
export function orNotFound<T>(load: () => T): T {
  try {
    return load();
  } catch (error) {
    if (error instanceof AppError && (error.code === "not_found" || error.code === "forbidden")) {
      notFound();
    }
    throw error;
  }
}
