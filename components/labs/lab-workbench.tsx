"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useEffect, useMemo, useState } from "react";
import { RunProgressBar } from "@/components/runs/run-progress-bar";
import { useRunProgress } from "@/components/runs/use-run-progress";
import { Button } from "@/components/ui/button";
import { Mono } from "@/components/ui/mono";

interface BenchLink {
  device: string;
  object: number;
  groupAddress: string;
}

export interface WorkbenchCopy {
  readonly benchId: string;
  readonly revisionNumber: number;
  /** The copy's latest bench document. */
  readonly document: {
    links?: BenchLink[];
    devices?: { id: string; name: string }[];
    groupAddresses?: { address: string; name: string; dpt: string }[];
  } & Record<string, unknown>;
}

const selectClass = "rounded-md border border-paper-line bg-white px-2 py-1 text-sm";

/**
 * The apprentice's side of a lab: start working (a private copy is made), open
 * it in the live console, change its wiring, and submit it for grading with the
 * grading run's progress.
 */
export function LabWorkbench({
  assignmentId,
  copy,
  canWork,
}: {
  assignmentId: string;
  copy: WorkbenchCopy | null;
  canWork: boolean;
}) {
  const router = useRouter();
  const [links, setLinks] = useState<BenchLink[]>(() => copy?.document.links ?? []);
  const [dirty, setDirty] = useState(false);
  const [message, setMessage] = useState<{ kind: "ok" | "error"; text: string } | null>(null);
  const [pending, setPending] = useState(false);
  const [grading, setGrading] = useState<string | null>(null);
  const progress = useRunProgress(grading);
  const graded = progress.status === "finished" || progress.status === "errored";
  useEffect(() => {
    if (graded) router.refresh();
  }, [graded, router]);

  const deviceName = useMemo(
    () => new Map((copy?.document.devices ?? []).map((d) => [d.id, d.name])),
    [copy],
  );
  const dptOf = useMemo(
    () => new Map((copy?.document.groupAddresses ?? []).map((ga) => [ga.address, ga.dpt])),
    [copy],
  );

  async function post(url: string, body?: unknown, method = "POST") {
    const response = await fetch(url, {
      method,
      headers: body === undefined ? {} : { "Content-Type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const data = (await response.json().catch(() => ({}))) as Record<string, unknown> & {
      error?: { message: string };
    };
    if (!response.ok)
      throw new Error(data.error?.message ?? `the server answered ${response.status}`);
    return data;
  }

  async function act(action: () => Promise<void>) {
    setPending(true);
    setMessage(null);
    try {
      await action();
    } catch (error) {
      setMessage({ kind: "error", text: (error as Error).message });
    } finally {
      setPending(false);
    }
  }

  if (!copy) {
    return (
      <div className="flex flex-col gap-3">
        <p className="text-sm text-ink-soft">
          You work on a private copy of the lab bench that only you (and your trainer) can see.
        </p>
        {canWork ? (
          <div>
            <Button
              disabled={pending}
              onClick={() =>
                act(async () => {
                  await post(`/api/labs/assignments/${assignmentId}/open`);
                  router.refresh();
                })
              }
            >
              Start working
            </Button>
          </div>
        ) : (
          <p className="text-sm text-ink-soft">The apprentice has not started yet.</p>
        )}
        {message ? (
          <p role="alert" className="text-sm text-fault">
            {message.text}
          </p>
        ) : null}
      </div>
    );
  }

  const saveWiring = () =>
    act(async () => {
      await post(
        `/api/benches/${copy.benchId}`,
        {
          document: { ...copy.document, links },
          summary: "Wiring changed in the lab",
          baseRevision: copy.revisionNumber,
        },
        "PATCH",
      );
      setDirty(false);
      setMessage({ kind: "ok", text: "Wiring saved." });
      router.refresh();
    });

  const submit = () =>
    act(async () => {
      const data = await post(`/api/labs/assignments/${assignmentId}/submit`);
      setGrading(String(data.eventsUrl));
      // The new attempt shows at once; the attempts list follows it until it is graded.
      router.refresh();
    });

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <span>
          Your copy, revision <Mono>{copy.revisionNumber}</Mono>.
        </span>
        <Link href={`/benches/${copy.benchId}/live`} className="text-copper-deep underline">
          Open in the live console
        </Link>
        <Link href={`/benches/${copy.benchId}`} className="text-copper-deep underline">
          Open in the bench editor
        </Link>
      </div>

      <section aria-label="Wiring" className="flex flex-col gap-2">
        <h3 className="text-sm font-semibold">Wiring</h3>
        <p className="text-xs text-ink-soft">
          Each group object&apos;s links; the first link of an object is the address it sends to.
        </p>
        <div className="max-h-96 overflow-y-auto rounded-md border border-paper-line">
          <table className="w-full text-left text-sm">
            <thead className="sticky top-0 bg-paper">
              <tr className="border-b border-paper-line text-ink-soft">
                <th className="px-2 py-1 font-medium">Device</th>
                <th className="px-2 py-1 font-medium">Object</th>
                <th className="px-2 py-1 font-medium">Group address</th>
              </tr>
            </thead>
            <tbody>
              {links.map((link, index) => {
                const ordinal = links
                  .slice(0, index + 1)
                  .filter((l) => l.device === link.device && l.object === link.object).length;
                const dpt = dptOf.get(link.groupAddress);
                return (
                  <tr key={index} className="border-b border-paper-line/60">
                    <td className="px-2 py-1">{deviceName.get(link.device) ?? link.device}</td>
                    <td className="px-2 py-1">
                      <Mono>{link.object}</Mono>
                      {ordinal === 1 ? (
                        <span className="ml-1 text-xs text-ink-soft">sends</span>
                      ) : null}
                    </td>
                    <td className="px-2 py-1">
                      <select
                        aria-label={`Group address of ${deviceName.get(link.device) ?? link.device} object ${link.object} link ${ordinal}`}
                        className={selectClass}
                        value={link.groupAddress}
                        disabled={!canWork}
                        onChange={(e) => {
                          setLinks(
                            links.map((l, i) =>
                              i === index ? { ...l, groupAddress: e.target.value } : l,
                            ),
                          );
                          setDirty(true);
                        }}
                      >
                        {(copy.document.groupAddresses ?? [])
                          .filter(
                            (ga) => dpt === undefined || ga.dpt.split(".")[0] === dpt.split(".")[0],
                          )
                          .map((ga) => (
                            <option key={ga.address} value={ga.address}>
                              {ga.address} {ga.name}
                            </option>
                          ))}
                      </select>
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      </section>

      {canWork ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button variant="secondary" onClick={saveWiring} disabled={!dirty || pending}>
            Save wiring
          </Button>
          <Button onClick={submit} disabled={dirty || pending || (grading !== null && !graded)}>
            Submit for grading
          </Button>
          {grading ? <RunProgressBar progress={progress} label="Grading progress" /> : null}
          {message ? (
            <span
              role={message.kind === "error" ? "alert" : "status"}
              className={message.kind === "error" ? "text-sm text-fault" : "text-sm text-teal"}
            >
              {message.text}
            </span>
          ) : null}
          {dirty ? (
            <span className="text-xs text-ink-soft">Save the wiring before submitting.</span>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
