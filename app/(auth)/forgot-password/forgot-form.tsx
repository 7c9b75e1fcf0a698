"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, FormMessage } from "../_components/field";
import { sendJson } from "../_components/post-json";

export function ForgotForm() {
  const [pending, setPending] = useState(false);
  const [sent, setSent] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setPending(true);
    setError(null);
    const result = await sendJson("/api/session/password-reset", "POST", {
      email: String(form.get("email") ?? ""),
    });
    setPending(false);
    if (result.ok) setSent(true);
    else setError(result.error.message);
  }

  if (sent) {
    return (
      <FormMessage tone="healthy">
        If that address has an account, a reset link is on its way.
      </FormMessage>
    );
  }
  return (
    <form onSubmit={onSubmit} className="flex flex-col gap-4" noValidate>
      <Field
        label="E-mail"
        name="email"
        type="email"
        autoComplete="username"
        error={error ?? undefined}
      />
      <Button type="submit" disabled={pending}>
        {pending ? "Sending…" : "Send reset link"}
      </Button>
    </form>
  );
}
