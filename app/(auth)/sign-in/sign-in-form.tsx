"use client";

import { Button } from "@/components/ui/button";
import { Field, FormMessage } from "../_components/field";
import { formText, useJsonForm } from "../_components/use-json-form";

export function SignInForm({ next }: { next: string }) {
  const { pending, error, fieldError, onSubmit } = useJsonForm(
    "/api/session",
    (form) => ({ email: formText(form, "email"), password: formText(form, "password") }),
    // A full navigation, so the studio layout renders with the new cookie; the form stays pending.
    () => window.location.assign(next),
  );

  return (
    <form onSubmit={onSubmit} className="flex flex-col gap-4" noValidate>
      {error && !error.field ? <FormMessage tone="fault">{error.message}</FormMessage> : null}
      <Field
        label="E-mail"
        name="email"
        type="email"
        autoComplete="username"
        required
        error={fieldError("email")}
      />
      <Field
        label="Password"
        name="password"
        type="password"
        autoComplete="current-password"
        required
        error={fieldError("password")}
      />
      <Button type="submit" disabled={pending}>
        {pending ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
