"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import type { Role } from "@/db/schema";
import { Button } from "@/components/ui/button";
import { Panel } from "@/components/ui/panel";
import { StatusBadge, type StatusTone } from "@/components/ui/status-badge";
import { errorText, getJson, sendJson } from "../_shell/api-client";
import { Timestamp } from "@/components/ui/timestamp";

interface InvitationRow {
  readonly id: string;
  readonly email: string;
  readonly role: Role;
  readonly state: "open" | "accepted" | "revoked" | "expired";
  readonly invitedByName: string;
  readonly expiresAt: string;
  readonly createdAt: string;
}

const invitationsKey = ["invitations"] as const;
const stateTone: Record<InvitationRow["state"], StatusTone> = {
  open: "accent",
  accepted: "healthy",
  revoked: "neutral",
  expired: "neutral",
};

/** Invite form and the invitation list with resend and revoke. */
export function InvitationsPanel({ roles }: { roles: readonly Role[] }) {
  const queryClient = useQueryClient();
  const [message, setMessage] = useState<{ tone: "fault" | "healthy"; text: string } | null>(null);
  const invitations = useQuery({
    queryKey: invitationsKey,
    queryFn: () =>
      getJson<{ invitations: InvitationRow[] }>("/api/invitations").then((b) => b.invitations),
  });
  const refresh = () => queryClient.invalidateQueries({ queryKey: invitationsKey });
  const invite = useMutation({
    mutationFn: (body: { email: string; role: Role }) => sendJson("/api/invitations", "POST", body),
    onSuccess: (_data, body) => {
      setMessage({ tone: "healthy", text: `Invitation sent to ${body.email}.` });
      return refresh();
    },
    onError: (error) => setMessage({ tone: "fault", text: errorText(error) }),
  });
  const resend = useMutation({
    mutationFn: (id: string) => sendJson(`/api/invitations/${id}/resend`, "POST"),
    onSuccess: () => {
      setMessage({ tone: "healthy", text: "Invitation sent again with a new link." });
      return refresh();
    },
    onError: (error) => setMessage({ tone: "fault", text: errorText(error) }),
  });
  const revoke = useMutation({
    mutationFn: (id: string) => sendJson(`/api/invitations/${id}`, "DELETE"),
    onSuccess: () => {
      setMessage({ tone: "healthy", text: "Invitation revoked." });
      return refresh();
    },
    onError: (error) => setMessage({ tone: "fault", text: errorText(error) }),
  });

  return (
    <div className="flex flex-col gap-6">
      <Panel title="Invite someone" className="max-w-xl">
        <form
          className="flex flex-wrap items-end gap-3"
          onSubmit={(event) => {
            event.preventDefault();
            const form = new FormData(event.currentTarget);
            setMessage(null);
            invite.mutate({
              email: String(form.get("email") ?? ""),
              role: String(form.get("role") ?? roles[0]) as Role,
            });
          }}
        >
          <label className="flex flex-col gap-1 text-sm">
            <span className="font-medium">E-mail</span>
            <input
              name="email"
              type="email"
              required
              className="rounded-md border border-paper-line bg-white/70 px-3 py-2"
            />
          </label>
          <label className="flex flex-col gap-1 text-sm">
            <span className="font-medium">Role</span>
            <select
              name="role"
              className="rounded-md border border-paper-line bg-white/70 px-3 py-2"
            >
              {roles.map((role) => (
                <option key={role} value={role}>
                  {role}
                </option>
              ))}
            </select>
          </label>
          <Button type="submit" disabled={invite.isPending}>
            {invite.isPending ? "Sending…" : "Send invitation"}
          </Button>
        </form>
      </Panel>

      {message ? (
        <p
          role={message.tone === "fault" ? "alert" : "status"}
          className={message.tone === "fault" ? "text-sm text-fault" : "text-sm text-teal"}
        >
          {message.text}
        </p>
      ) : null}

      {invitations.isPending ? (
        <p className="text-sm text-ink-soft">Loading invitations…</p>
      ) : invitations.isError ? (
        <p role="alert" className="text-sm text-fault">
          Could not load the invitations: {errorText(invitations.error)}
        </p>
      ) : invitations.data.length === 0 ? (
        <p className="text-sm text-ink-soft">No invitations yet.</p>
      ) : (
        <table className="w-full border-collapse rounded-lg border border-paper-line text-sm">
          <thead className="bg-paper-deep text-left">
            <tr>
              <th className="px-3 py-2 font-medium">E-mail</th>
              <th className="px-3 py-2 font-medium">Role</th>
              <th className="px-3 py-2 font-medium">State</th>
              <th className="px-3 py-2 font-medium">Invited by</th>
              <th className="px-3 py-2 font-medium">Expires</th>
              <th className="px-3 py-2" />
            </tr>
          </thead>
          <tbody>
            {invitations.data.map((invitation) => (
              <tr key={invitation.id} className="border-t border-paper-line">
                <td className="px-3 py-2">{invitation.email}</td>
                <td className="px-3 py-2">{invitation.role}</td>
                <td className="px-3 py-2">
                  <StatusBadge tone={stateTone[invitation.state]}>{invitation.state}</StatusBadge>
                </td>
                <td className="px-3 py-2">{invitation.invitedByName}</td>
                <td className="px-3 py-2">
                  <Timestamp value={invitation.expiresAt} relative />
                </td>
                <td className="flex gap-2 px-3 py-2">
                  {invitation.state === "open" || invitation.state === "expired" ? (
                    <Button
                      variant="secondary"
                      disabled={resend.isPending}
                      onClick={() => resend.mutate(invitation.id)}
                    >
                      Resend
                    </Button>
                  ) : null}
                  {invitation.state === "open" ? (
                    <Button
                      variant="secondary"
                      disabled={revoke.isPending}
                      onClick={() => revoke.mutate(invitation.id)}
                    >
                      Revoke
                    </Button>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
