"use client";

import { useMutation } from "@tanstack/react-query";
import { useState } from "react";
import { useSimSend, useSimState, useSimStore } from "@/components/sim/sim-context";
import { Button } from "@/components/ui/button";
import { recordScenario, type RecordedAction } from "@/engine";

/**
 * The record switch: while on, the console's actions and the replies they drew
 * are captured; when switched off they become a scenario draft the user names
 * and saves to the bench's scenarios.
 */
export function RecordPanel({ benchId }: { benchId: string }) {
  const send = useSimSend();
  const store = useSimStore();
  const recording = useSimState((s) => s.recording);
  const draft = useSimState((s) => s.recordedDraft);
  const benchName = useSimState((s) => s.bench?.name ?? "");
  const [name, setName] = useState("");
  const save = useMutation({
    mutationFn: async (scenarioName: string) => {
      const document = recordScenario((draft?.actions ?? []) as RecordedAction[], {
        name: scenarioName,
        bench: { name: benchName },
        settleUs: draft?.settleUs,
      });
      const response = await fetch("/api/scenarios", {
        method: "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify({ benchId, name: scenarioName, document }),
      });
      const body = (await response.json().catch(() => null)) as {
        error?: { message?: string };
        scenario?: { id: string };
      } | null;
      if (!response.ok)
        throw new Error(body?.error?.message ?? `the server answered ${response.status}`);
      return body?.scenario?.id ?? "";
    },
    onSuccess: () => {
      store.getState().clearRecordedDraft();
      setName("");
    },
  });

  return (
    <div className="space-y-2 text-sm">
      <div className="flex items-center gap-3">
        <button
          type="button"
          role="switch"
          aria-checked={recording}
          aria-label="Record"
          onClick={() => send({ type: "record", on: !recording })}
          className={`relative h-6 w-11 rounded-full transition-colors ${recording ? "bg-fault" : "bg-paper-line"}`}
        >
          <span
            className={`absolute top-0.5 h-5 w-5 rounded-full bg-white transition-all ${recording ? "left-5" : "left-0.5"}`}
          />
        </button>
        <span>
          {recording ? "Recording your actions and the replies…" : "Record actions into a scenario"}
        </span>
      </div>
      {draft && !recording ? (
        <form
          className="flex flex-wrap items-center gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (name.trim() !== "") save.mutate(name.trim());
          }}
        >
          <span className="text-ink-soft">{draft.actions.length} actions recorded.</span>
          <input
            aria-label="Scenario name"
            placeholder="Scenario name"
            className="rounded-md border border-paper-line bg-white px-2 py-1"
            value={name}
            onChange={(e) => setName(e.target.value)}
          />
          <Button type="submit" disabled={name.trim() === "" || save.isPending}>
            Save scenario
          </Button>
          <Button variant="secondary" onClick={() => store.getState().clearRecordedDraft()}>
            Discard
          </Button>
        </form>
      ) : null}
      {save.isError ? <p className="text-fault">{save.error.message}</p> : null}
      {save.isSuccess ? (
        <p className="text-teal" role="status">
          Scenario saved.
        </p>
      ) : null}
    </div>
  );
}
