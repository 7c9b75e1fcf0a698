"use client";

import { Button } from "@/components/ui/button";
import { Field, FormMessage } from "../../_components/field";
import { formText, useJsonForm } from "../../_components/use-json-form";

export function JoinForm({ token, accountExists }: { token: string; accountExists: boolean }) {
  const { pending, done, error, fieldError, onSubmit } = useJsonForm(
    "/api/invitations/accept",
    (form) => ({
      token,
      ...(accountExists ? {} : { name: formText(form, "name") }),
      password: formText(form, "password"),
    }),
  );

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
