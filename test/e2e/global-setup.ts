import type { TestProject } from "vitest/node";
import { buildIfStale, startProductionServer } from "../support/production-server";

declare module "vitest" {
  export interface ProvidedContext {
    /** Where the app under test is served, e.g. "http://127.0.0.1:41234". */
    baseURL: string;
  }
}

/** Build if stale, serve the production build on a free loopback port with a fresh seeded database. */
export default async function setup(project: TestProject) {
  buildIfStale("e2e");
  const server = await startProductionServer({ label: "e2e" });
  project.provide("baseURL", server.baseURL);
  return () => server.stop();
}
