"use client";

import { Button } from "@/components/ui/button";
import { Field, FormMessage } from "../_components/field";
import { formText, useJsonForm } from "../_components/use-json-form";

export function ForgotForm() {
  const {
    pending,
    done: sent,
    error,
    onSubmit,
  } = useJsonForm("/api/session/password-reset", (form) => ({ email: formText(form, "email") }));

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
        // Every refusal (bad address, too many requests) is shown at the one field.
        error={error?.message}
      />
      <Button type="submit" disabled={pending}>
        {pending ? "Sending…" : "Send reset link"}
      </Button>
    </form>
  );
}
