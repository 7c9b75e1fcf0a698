"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, FormMessage } from "../../_components/field";
import { sendJson } from "../../_components/post-json";

export function JoinForm({ token, accountExists }: { token: string; accountExists: boolean }) {
  const [pending, setPending] = useState(false);
  const [done, setDone] = useState(false);
  const [error, setError] = useState<{ message: string; field?: string } | null>(null);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setPending(true);
    setError(null);
    const result = await sendJson("/api/invitations/accept", "POST", {
      token,
      ...(accountExists ? {} : { name: String(form.get("name") ?? "") }),
      password: String(form.get("password") ?? ""),
    });
    setPending(false);
    if (result.ok) setDone(true);
    else setError(result.error);
  }

  if (done) {
    return (
      <FormMessage tone="healthy">
        You have joined.{" "}
        <a href="/sign-in" className="underline">
          Sign in
        </a>{" "}
        to start.
      </FormMessage>
    );
  }
  const fieldError = (name: string) => (error?.field === name ? error.message : undefined);
  return (
    <form onSubmit={onSubmit} className="flex flex-col gap-4" noValidate>
      {error && !["name", "password"].includes(error.field ?? "") ? (
        <FormMessage tone="fault">{error.message}</FormMessage>
      ) : null}
      {accountExists ? null : (
        <Field label="Your name" name="name" autoComplete="name" error={fieldError("name")} />
      )}
      <Field
        label={accountExists ? "Your current password" : "Choose a password"}
        name="password"
        type="password"
        autoComplete={accountExists ? "current-password" : "new-password"}
        hint={accountExists ? undefined : "At least 10 characters."}
        error={fieldError("password")}
      />
      <Button type="submit" disabled={pending}>
        {pending ? "Joining…" : "Join"}
      </Button>
    </form>
  );
}
