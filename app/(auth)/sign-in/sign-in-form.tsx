"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, FormMessage } from "../_components/field";
import { sendJson } from "../_components/post-json";

export function SignInForm({ next }: { next: string }) {
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<{ message: string; field?: string } | null>(null);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setPending(true);
    setError(null);
    const result = await sendJson("/api/session", "POST", {
      email: String(form.get("email") ?? ""),
      password: String(form.get("password") ?? ""),
    });
    if (result.ok) {
      // A full navigation, so the studio layout renders with the new cookie.
      window.location.assign(next);
      return;
    }
    setPending(false);
    setError(result.error);
  }

  return (
    <form onSubmit={onSubmit} className="flex flex-col gap-4" noValidate>
      {error && !error.field ? <FormMessage tone="fault">{error.message}</FormMessage> : null}
      <Field
        label="E-mail"
        name="email"
        type="email"
        autoComplete="username"
        required
        error={error?.field === "email" ? error.message : undefined}
      />
      <Field
        label="Password"
        name="password"
        type="password"
        autoComplete="current-password"
        required
        error={error?.field === "password" ? error.message : undefined}
      />
      <Button type="submit" disabled={pending}>
        {pending ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
