"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, FormMessage } from "../../_components/field";
import { sendJson } from "../../_components/post-json";

export function ResetForm({ token }: { token: string }) {
  const [pending, setPending] = useState(false);
  const [done, setDone] = useState(false);
  const [error, setError] = useState<{ message: string; field?: string } | null>(null);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setPending(true);
    setError(null);
    const result = await sendJson("/api/session/password-reset/complete", "POST", {
      token,
      password: String(form.get("password") ?? ""),
    });
    setPending(false);
    if (result.ok) setDone(true);
    else setError(result.error);
  }

  if (done) {
    return (
      <FormMessage tone="healthy">
        Password changed.{" "}
        <a href="/sign-in" className="underline">
          Sign in
        </a>{" "}
        with it.
      </FormMessage>
    );
  }
  return (
    <form onSubmit={onSubmit} className="flex flex-col gap-4" noValidate>
      {error && error.field !== "password" ? (
        <FormMessage tone="fault">{error.message}</FormMessage>
      ) : null}
      <Field
        label="New password"
        name="password"
        type="password"
        autoComplete="new-password"
        hint="At least 10 characters."
        error={error?.field === "password" ? error.message : undefined}
      />
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : "Set password"}
      </Button>
    </form>
  );
}
