"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";

/** Send the report's link to a colleague (POST /api/runs/:id/share). */
export function EmailReportForm({ runId }: { runId: string }) {
  const [to, setTo] = useState("");
  const [note, setNote] = useState("");
  const [state, setState] = useState<
    | { kind: "idle" }
    | { kind: "sending" }
    | { kind: "sent"; to: string }
    | { kind: "error"; message: string; field?: string }
  >({ kind: "idle" });

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setState({ kind: "sending" });
    try {
      const response = await fetch(`/api/runs/${runId}/share`, {
        method: "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify({ to, note: note || undefined }),
      });
      const body = (await response.json()) as { error?: { message: string; field?: string } };
      if (!response.ok) {
        setState({
          kind: "error",
          message: body.error?.message ?? "could not send",
          field: body.error?.field,
        });
        return;
      }
      setState({ kind: "sent", to });
      setTo("");
      setNote("");
    } catch {
      setState({ kind: "error", message: "could not reach the server" });
    }
  }

  return (
    <form
      onSubmit={submit}
      className="flex flex-col gap-3 print:hidden"
      aria-label="E-mail this report"
    >
      <h2 className="text-sm font-semibold">E-mail this report</h2>
      <label className="flex flex-col gap-1 text-sm">
        Colleague&apos;s e-mail
        <input
          type="email"
          required
          value={to}
          onChange={(event) => setTo(event.target.value)}
          className="rounded-md border border-paper-line bg-white px-2 py-1.5"
          aria-invalid={state.kind === "error" && state.field === "to"}
        />
      </label>
      <label className="flex flex-col gap-1 text-sm">
        Note (optional)
        <textarea
          value={note}
          maxLength={1000}
          onChange={(event) => setNote(event.target.value)}
          className="rounded-md border border-paper-line bg-white px-2 py-1.5"
          rows={2}
        />
      </label>
      <div className="flex items-center gap-3">
        <Button type="submit" variant="secondary" disabled={state.kind === "sending"}>
          Send link
        </Button>
        {state.kind === "sent" ? (
          <span role="status" className="text-sm text-teal">
            Sent to {state.to}.
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
