"use client";

import { useActionState } from "react";
import { Field, FormMessage } from "@/app/(auth)/_components/field";
import { idleActionState } from "@/app/_lib/action-state";
import { Button } from "@/components/ui/button";
import { changePasswordAction } from "./actions";

export function PasswordForm() {
  const [state, action, pending] = useActionState(changePasswordAction, idleActionState);
  const fieldError = (name: string) =>
    state.status === "error" && state.error.field === name ? state.error.message : undefined;
  return (
    <form action={action} className="flex flex-col gap-4">
      {state.status === "ok" ? <FormMessage tone="healthy">Password changed.</FormMessage> : null}
      {state.status === "error" && !state.error.field ? (
        <FormMessage tone="fault">{state.error.message}</FormMessage>
      ) : null}
      <Field
        label="Current password"
        name="currentPassword"
        type="password"
        autoComplete="current-password"
        error={fieldError("currentPassword")}
      />
      <Field
        label="New password"
        name="newPassword"
        type="password"
        autoComplete="new-password"
        hint="At least 10 characters."
        error={fieldError("newPassword")}
      />
      <Field
        label="New password again"
        name="confirmPassword"
        type="password"
        autoComplete="new-password"
        error={fieldError("confirmPassword")}
      />
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : "Change password"}
      </Button>
    </form>
  );
}
