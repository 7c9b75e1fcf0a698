"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";

/** Assign a lab to apprentices with a due date; they are e-mailed a link. */
export function AssignLabForm({
  labId,
  apprentices,
}: {
  labId: string;
  apprentices: readonly { id: string; name: string; email: string; assigned: boolean }[];
}) {
  const router = useRouter();
  const [chosen, setChosen] = useState<string[]>([]);
  const [dueAt, setDueAt] = useState("");
  const [state, setState] = useState<
    | { kind: "idle" | "sending" }
    | { kind: "done"; count: number }
    | { kind: "error"; message: string }
  >({
    kind: "idle",
  });

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setState({ kind: "sending" });
    try {
      const response = await fetch(`/api/labs/${labId}/assignments`, {
        method: "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify({ apprenticeIds: chosen, ...(dueAt ? { dueAt } : {}) }),
      });
      const body = (await response.json()) as { assigned?: unknown[]; error?: { message: string } };
      if (!response.ok) {
        setState({
          kind: "error",
          message: body.error?.message ?? `the server answered ${response.status}`,
        });
        return;
      }
      setState({ kind: "done", count: body.assigned?.length ?? 0 });
      setChosen([]);
      router.refresh();
    } catch {
      setState({ kind: "error", message: "could not reach the server" });
    }
  }

  const open = apprentices.filter((a) => !a.assigned);
  if (apprentices.length === 0)
    return <p className="text-sm text-ink-soft">No apprentices in this workspace yet.</p>;
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Assign the lab">
      {open.length === 0 ? (
        <p className="text-sm text-ink-soft">Every apprentice has this lab.</p>
      ) : (
        <fieldset className="flex flex-col gap-1">
          <legend className="mb-1 text-sm font-medium">Apprentices</legend>
          {open.map((a) => (
            <label key={a.id} className="flex items-center gap-2 text-sm">
              <input
                type="checkbox"
                checked={chosen.includes(a.id)}
                onChange={(e) =>
                  setChosen(
                    e.target.checked ? [...chosen, a.id] : chosen.filter((id) => id !== a.id),
                  )
                }
              />
              {a.name} <span className="text-ink-soft">{a.email}</span>
            </label>
          ))}
        </fieldset>
      )}
      <label className="flex w-48 flex-col gap-1 text-sm">
        Due date
        <input
          type="date"
          className="rounded-md border border-paper-line bg-white px-2 py-1.5"
          value={dueAt}
          onChange={(e) => setDueAt(e.target.value)}
        />
      </label>
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={chosen.length === 0 || state.kind === "sending"}>
          Assign
        </Button>
        {state.kind === "done" ? (
          <span role="status" className="text-sm text-teal">
            Assigned to {state.count}; they have been e-mailed.
          </span>
        ) : null}
        {state.kind === "error" ? (
          <span role="alert" className="text-sm text-fault">
            {state.message}
          </span>
        ) : null}
      </div>
    </form>
  );
}
