"use client";

import { useState } from "react";
import { type ApiErrorBody, sendJson } from "./post-json";

/** A form field's text, or "" when the field is absent. */
export function formText(form: FormData, name: string): string {
  return String(form.get(name) ?? "");
}

/**
 * The submit cycle every sign-in page form shares: read the form, POST it as
 * JSON, and hold the pending flag, the API's error (with the field it names)
 * and whether it succeeded. `onSuccess` replaces the "done" state, e.g. for a
 * form that navigates away and so stays pending.
 */
export function useJsonForm<T = unknown>(
  url: string,
  bodyOf: (form: FormData) => unknown,
  onSuccess?: (data: T) => void,
) {
  const [pending, setPending] = useState(false);
  const [done, setDone] = useState(false);
  const [error, setError] = useState<ApiErrorBody["error"] | null>(null);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const body = bodyOf(new FormData(event.currentTarget));
    setPending(true);
    setError(null);
    const result = await sendJson<T>(url, "POST", body);
    if (result.ok && onSuccess) {
      onSuccess(result.data);
      return;
    }
    setPending(false);
    if (result.ok) setDone(true);
    else setError(result.error);
  }

  const fieldError = (name: string) => (error?.field === name ? error.message : undefined);
  return { pending, done, error, fieldError, onSubmit };
}
