"use client";

import { useState } from "react";
import { useSimSend, useSimState } from "@/components/sim/sim-context";
import { Button } from "@/components/ui/button";
import { Mono } from "@/components/ui/mono";
import { formatVirtualTime } from "./format-time";

const fieldClass = "rounded-md border border-paper-line bg-white px-2 py-1 text-sm";

/** Recall a scene and see which devices changed to what, and which listeners did not respond. */
export function SceneDryRun() {
  const bench = useSimState((s) => s.bench);
  const result = useSimState((s) => s.sceneResult);
  const send = useSimSend();
  const [address, setAddress] = useState("");
  const [scene, setScene] = useState(1);
  const [settleS, setSettleS] = useState(5);
  if (bench === null) return null;
  const sceneAddresses = bench.groupAddresses.filter((ga) => ga.dpt === "17.001");
  const chosen = address || sceneAddresses[0]?.address || "";
  if (sceneAddresses.length === 0)
    return <p className="text-sm text-ink-soft">This bench has no scene address (DPT 17.001).</p>;
  return (
    <div className="space-y-3 text-sm">
      <div className="flex flex-wrap items-center gap-2">
        <select
          aria-label="Scene address"
          className={fieldClass}
          value={chosen}
          onChange={(e) => setAddress(e.target.value)}
        >
          {sceneAddresses.map((ga) => (
            <option key={ga.raw} value={ga.address}>
              {ga.address} {ga.name}
            </option>
          ))}
        </select>
        <label className="flex items-center gap-1">
          scene
          <input
            aria-label="Scene number"
            type="number"
            min={1}
            max={64}
            className={`${fieldClass} w-16 font-mono`}
            value={scene}
            onChange={(e) => setScene(Number(e.target.value))}
          />
        </label>
        <label className="flex items-center gap-1">
          settle
          <input
            aria-label="Settle time in seconds"
            type="number"
            min={1}
            max={600}
            className={`${fieldClass} w-16 font-mono`}
            value={settleS}
            onChange={(e) => setSettleS(Number(e.target.value))}
          />
          s
        </label>
        <Button
          disabled={
            !(scene >= 1 && scene <= 64 && Number.isInteger(scene)) ||
            !(settleS >= 1 && settleS <= 600)
          }
          onClick={() =>
            send({
              type: "scene-dry-run",
              groupAddress: chosen,
              scene,
              settleUs: Math.round(settleS * 1_000_000),
            })
          }
        >
          Recall scene
        </Button>
      </div>
      {result ? (
        <section
          aria-label="Scene summary"
          className="rounded-md border border-paper-line bg-white/70 p-3"
        >
          <p>
            Scene {result.scene} on <Mono>{result.groupAddress}</Mono> at{" "}
            {formatVirtualTime(result.atUs)}, after {result.settleUs / 1_000_000} s:
          </p>
          <ul className="mt-2 space-y-1">
            {result.changed.map((device) => (
              <li key={device.deviceId}>
                <span className="font-medium">{device.name}</span> changed:{" "}
                <span className="font-mono text-xs">{device.changes.join("; ")}</span>
              </li>
            ))}
            {result.changed.length === 0 ? (
              <li className="text-ink-soft">No device changed.</li>
            ) : null}
            {result.silent.map((device) => (
              <li key={device.deviceId} className="text-fault">
                <span aria-hidden="true">⚠ </span>
                {device.name} listens to the address but did not respond.
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}
