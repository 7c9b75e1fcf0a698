"use client";

import { Button } from "@/components/ui/button";
import { Field, FormMessage } from "../../_components/field";
import { formText, useJsonForm } from "../../_components/use-json-form";

export function ResetForm({ token }: { token: string }) {
  const { pending, done, error, fieldError, onSubmit } = useJsonForm(
    "/api/session/password-reset/complete",
    (form) => ({ token, password: formText(form, "password") }),
  );

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
        error={fieldError("password")}
      />
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : "Set password"}
      </Button>
    </form>
  );
}
