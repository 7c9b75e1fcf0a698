"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import type { Role } from "@/db/schema";

export interface WorkspaceChoice {
  readonly id: string;
  readonly name: string;
  readonly role: Role;
}

/** The signed-in person, their role, the workspace switcher and sign-out, in the shell's rail. */
export function AccountMenu({
  name,
  role,
  activeWorkspaceId,
  workspaces,
}: {
  name: string;
  role: Role;
  activeWorkspaceId: string;
  workspaces: readonly WorkspaceChoice[];
}) {
  const router = useRouter();
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const active = workspaces.find((workspace) => workspace.id === activeWorkspaceId);

  async function switchWorkspace(workspaceId: string) {
    setPending(true);
    setError(null);
    const response = await fetch("/api/session", {
      method: "PATCH",
      headers: { "Content-Type": "application/json" },
      body: JSON.stringify({ workspaceId }),
    }).catch(() => null);
    setPending(false);
    if (!response?.ok) {
      setError("could not switch workspace");
      return;
    }
    // Lists on the current page belong to the old workspace: start from the benches.
    router.push("/benches");
    router.refresh();
  }

  async function signOut() {
    setPending(true);
    await fetch("/api/session", { method: "DELETE" }).catch(() => null);
    router.replace("/sign-in");
    router.refresh();
  }

  return (
    <div className="flex flex-col gap-2 border-t border-graphite-line pt-3" aria-label="Account">
      <div>
        <div className="font-medium text-graphite-text" data-testid="account-name">
          {name}
        </div>
        <div className="text-xs text-graphite-muted">
          <span data-testid="account-role">{role}</span>
          {active ? ` · ${active.name}` : null}
        </div>
      </div>
      {workspaces.length > 1 ? (
        <label className="flex flex-col gap-1 text-xs text-graphite-muted">
          Workspace
          <select
            aria-label="Workspace"
            className="rounded-md border border-graphite-line bg-graphite-raised px-2 py-1 text-sm text-graphite-text"
            value={activeWorkspaceId}
            disabled={pending}
            onChange={(event) => void switchWorkspace(event.target.value)}
          >
            {workspaces.map((workspace) => (
              <option key={workspace.id} value={workspace.id}>
                {workspace.name} ({workspace.role})
              </option>
            ))}
          </select>
        </label>
      ) : null}
      {error ? <p className="text-xs text-fault-soft">{error}</p> : null}
      <div className="flex gap-3 text-xs">
        <Link href="/account" className="text-graphite-muted hover:text-graphite-text">
          Account
        </Link>
        <button
          type="button"
          onClick={() => void signOut()}
          disabled={pending}
          className="text-graphite-muted hover:text-graphite-text"
        >
          Sign out
        </button>
      </div>
    </div>
  );
}
