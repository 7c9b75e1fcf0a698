/** One row of run history as the page hands it to the client (dates as ISO text). */
export interface RunHistoryItem {
  readonly id: string;
  readonly scenarioId: string | null;
  readonly scenarioName: string;
  readonly suiteRunId: string | null;
  readonly benchId: string;
  readonly benchName: string;
  readonly revisionNumber: number;
  readonly seed: number;
  readonly status: "queued" | "running" | "finished" | "errored";
  readonly verdict: "pass" | "fail" | "error" | null;
  readonly stepsPassed: number;
  readonly stepsTotal: number;
  readonly durationMs: number | null;
  readonly startedByName: string | null;
  readonly createdAt: string;
}
