"use client";

import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { Button } from "@/components/ui/button";

export interface LabBenchChoice {
  readonly id: string;
  readonly name: string;
  readonly scenarios: readonly { id: string; name: string }[];
  readonly groupAddresses: readonly { address: string; name: string; dpt: string }[];
  readonly links: readonly {
    device: string;
    deviceName: string;
    object: number;
    groupAddress: string;
  }[];
  /** Couplers of the bench, for a stale filter table. */
  readonly couplers: readonly { id: string; name: string; address: string }[];
}

/** One hidden fault being written: a moved link, or an address missing from a coupler's filter table. */
interface FaultRow {
  kind: "relink" | "stale-filter-table";
  link: string;
  to: string;
  coupler: string;
  groupAddress: string;
}

const emptyRow: FaultRow = { kind: "relink", link: "", to: "", coupler: "", groupAddress: "" };

const inputClass = "w-full rounded-md border border-paper-line bg-white px-2 py-1.5 text-sm";

/** A choice of one of the bench's group addresses, empty (showing `prompt`) until one is chosen. */
function GroupAddressSelect({
  label,
  prompt,
  groupAddresses = [],
  value,
  onChange,
}: {
  label: string;
  prompt: string;
  groupAddresses?: LabBenchChoice["groupAddresses"];
  value: string;
  onChange: (address: string) => void;
}) {
  return (
    <select
      aria-label={label}
      className={inputClass}
      value={value}
      onChange={(e) => onChange(e.target.value)}
    >
      <option value="">{prompt}</option>
      {groupAddresses.map((ga) => (
        <option key={ga.address} value={ga.address}>
          {ga.address} {ga.name}
        </option>
      ))}
    </select>
  );
}

/** A trainer's form for a new lab: bench, grading scenario, brief and faults to hide in the copies. */
export function NewLabForm({ benches }: { benches: readonly LabBenchChoice[] }) {
  const router = useRouter();
  const [benchId, setBenchId] = useState(benches[0]?.id ?? "");
  const [title, setTitle] = useState("");
  const [brief, setBrief] = useState("");
  const [scenarioId, setScenarioId] = useState("");
  const [faults, setFaults] = useState<FaultRow[]>([]);
  const [error, setError] = useState<{ message: string; field?: string } | null>(null);
  const [pending, setPending] = useState(false);
  const bench = useMemo(() => benches.find((b) => b.id === benchId), [benches, benchId]);
  const linkKey = (l: { device: string; object: number; groupAddress: string }) =>
    `${l.device}|${l.object}|${l.groupAddress}`;

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    if (!bench) return;
    setPending(true);
    setError(null);
    const hiddenFaults = faults.map((row) => {
      if (row.kind === "stale-filter-table")
        return { kind: row.kind, coupler: row.coupler, groupAddress: row.groupAddress };
      const [device, object, from] = row.link.split("|");
      return { kind: "relink", device, object: Number(object), from, to: row.to };
    });
    try {
      const response = await fetch("/api/labs", {
        method: "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify({
          title,
          brief,
          benchId,
          gradingScenarioId: scenarioId,
          hiddenFaults,
        }),
      });
      const body = (await response.json()) as {
        lab?: { id: string };
        error?: { message: string; field?: string };
      };
      if (!response.ok || !body.lab) {
        setError({
          message: body.error?.message ?? `the server answered ${response.status}`,
          field: body.error?.field,
        });
        return;
      }
      router.push(`/labs/${body.lab.id}`);
    } catch {
      setError({ message: "could not reach the server" });
    } finally {
      setPending(false);
    }
  }

  return (
    <form onSubmit={submit} className="flex flex-col gap-4" aria-label="New lab">
      <div className="grid gap-3 sm:grid-cols-2">
        <label className="flex flex-col gap-1 text-sm">
          Title
          <input
            className={inputClass}
            required
            value={title}
            onChange={(e) => setTitle(e.target.value)}
          />
        </label>
        <label className="flex flex-col gap-1 text-sm">
          Bench
          <select
            aria-label="Bench"
            className={inputClass}
            value={benchId}
            onChange={(e) => {
              setBenchId(e.target.value);
              setScenarioId("");
              setFaults([]);
            }}
          >
            {benches.map((b) => (
              <option key={b.id} value={b.id}>
                {b.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-sm sm:col-span-2">
          Brief for the apprentices
          <textarea
            className={inputClass}
            rows={3}
            value={brief}
            onChange={(e) => setBrief(e.target.value)}
          />
        </label>
        <label className="flex flex-col gap-1 text-sm sm:col-span-2">
          Grading scenario
          <select
            aria-label="Grading scenario"
            className={inputClass}
            required
            value={scenarioId}
            onChange={(e) => setScenarioId(e.target.value)}
          >
            <option value="">choose the scenario that grades the lab</option>
            {bench?.scenarios.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </label>
      </div>

      <fieldset className="flex flex-col gap-2 rounded-md border border-paper-line p-3">
        <legend className="px-1 text-sm font-medium">Hidden faults (optional)</legend>
        <p className="text-xs text-ink-soft">
          Each moves one link to another group address, or leaves a group address out of a
          coupler&apos;s stored filter table (a table not regenerated after a late change), in every
          apprentice&apos;s copy. Apprentices do not see this list.
        </p>
        {faults.map((row, index) => {
          const update = (change: Partial<FaultRow>) =>
            setFaults(faults.map((f, i) => (i === index ? { ...f, ...change } : f)));
          return (
            <div key={index} className="grid gap-2 sm:grid-cols-[1fr_2fr_1fr_auto]">
              <select
                aria-label={`Hidden fault ${index + 1}: kind`}
                className={inputClass}
                value={row.kind}
                onChange={(e) => update({ kind: e.target.value as FaultRow["kind"] })}
              >
                <option value="relink">move a link</option>
                <option value="stale-filter-table" disabled={(bench?.couplers.length ?? 0) === 0}>
                  stale filter table
                </option>
              </select>
              {row.kind === "relink" ? (
                <>
                  <select
                    aria-label={`Hidden fault ${index + 1}: link`}
                    className={inputClass}
                    value={row.link}
                    onChange={(e) => update({ link: e.target.value })}
                  >
                    <option value="">choose a link</option>
                    {bench?.links.map((l) => (
                      <option key={linkKey(l)} value={linkKey(l)}>
                        {l.deviceName} object {l.object} → {l.groupAddress}
                      </option>
                    ))}
                  </select>
                  <GroupAddressSelect
                    label={`Hidden fault ${index + 1}: move to`}
                    prompt="move to"
                    groupAddresses={bench?.groupAddresses}
                    value={row.to}
                    onChange={(to) => update({ to })}
                  />
                </>
              ) : (
                <>
                  <select
                    aria-label={`Hidden fault ${index + 1}: coupler`}
                    className={inputClass}
                    value={row.coupler}
                    onChange={(e) => update({ coupler: e.target.value })}
                  >
                    <option value="">choose a coupler</option>
                    {bench?.couplers.map((c) => (
                      <option key={c.id} value={c.id}>
                        {c.address} {c.name}
                      </option>
                    ))}
                  </select>
                  <GroupAddressSelect
                    label={`Hidden fault ${index + 1}: address left out`}
                    prompt="address left out of the table"
                    groupAddresses={bench?.groupAddresses}
                    value={row.groupAddress}
                    onChange={(groupAddress) => update({ groupAddress })}
                  />
                </>
              )}
              <Button
                variant="secondary"
                onClick={() => setFaults(faults.filter((_, i) => i !== index))}
              >
                Remove
              </Button>
            </div>
          );
        })}
        <div>
          <Button variant="secondary" onClick={() => setFaults([...faults, { ...emptyRow }])}>
            Add hidden fault
          </Button>
        </div>
      </fieldset>

      <div className="flex items-center gap-3">
        <Button type="submit" disabled={pending || !bench}>
          Create lab
        </Button>
        {error ? (
          <span role="alert" className="text-sm text-fault">
            {error.message}
          </span>
        ) : null}
      </div>
    </form>
  );
}
