"use client";

import { useState } from "react";
import { useSimSend, useSimState } from "@/components/sim/sim-context";
import { Button } from "@/components/ui/button";
import { Mono } from "@/components/ui/mono";
import { StatusBadge } from "@/components/ui/status-badge";
import { BUS_FAULTS, UNIT_LINK_BROKEN } from "@/engine";
import { defaultDptValue } from "./dpt-value";
import { useFrameSimState } from "./use-frame-sim-state";

const SENSOR_OPEN = "unit.sensor-open";
const fieldClass = "rounded-md border border-paper-line bg-white px-2 py-1 text-sm";

/** Faults to provoke from the console, each through what the simulation offers, and the faults now active. */
export function FaultsPanel() {
  const bench = useSimState((s) => s.bench);
  const faults = useSimState((s) => s.faults);
  // Only which windows are open, as one string: the panel re-renders when one opens or closes,
  // not with every batch of device snapshots.
  const openContacts = useFrameSimState((s) =>
    Object.values(s.devices)
      .filter((d) => (d.state as { open?: boolean } | null)?.open === true)
      .map((d) => d.id)
      .join(" "),
  );
  const send = useSimSend();
  const [disconnect, setDisconnect] = useState("");
  const [floodAddress, setFloodAddress] = useState("");
  const [floodCount, setFloodCount] = useState(1000);
  if (bench === null) return null;

  const has = (target: string, fault: string) =>
    faults.some((f) => f.target === target && f.fault === fault);
  const toggle = (target: string, fault: string) =>
    send({ type: has(target, fault) ? "clear-fault" : "inject-fault", target, faultId: fault });
  const controllers = bench.devices.filter((d) => d.role !== null);
  const contacts = bench.devices.filter((d) => d.type === "binary-input");
  const units = bench.devices.filter((d) => d.type === "indoor-unit");
  const onLine = bench.devices.filter((d) => d.medium === "knx");
  const nameOf = (target: string) =>
    bench.devices.find((d) => d.id === target)?.name ??
    bench.unitLinks.find((l) => l.id === target)?.name ??
    target;
  const flood = bench.groupAddresses.find((ga) => ga.address === floodAddress);

  return (
    <div className="space-y-4 text-sm">
      <section aria-label="Active faults">
        <h3 className="text-xs font-medium text-ink-soft">Active faults</h3>
        {faults.length === 0 ? (
          <p className="mt-1 text-ink-soft">None</p>
        ) : (
          <ul className="mt-1 space-y-1">
            {faults.map((f) => (
              <li key={`${f.target}-${f.fault}`} className="flex items-center gap-2">
                <StatusBadge tone="fault">
                  <span aria-hidden="true">⚠&nbsp;</span>
                  {f.fault}
                </StatusBadge>
                <span>{nameOf(f.target)}</span>
                <span className="text-xs text-ink-soft">
                  {f.by === "user" ? "injected" : "raised by the device"}
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>

      {controllers.length > 0 ? (
        <section aria-label="Controller roles">
          <h3 className="text-xs font-medium text-ink-soft">Controller role on the unit link</h3>
          <ul className="mt-1 space-y-1">
            {controllers.map((device) => (
              <li key={device.id} className="flex items-center gap-2">
                <span className="flex-1">{device.name}</span>
                <select
                  aria-label={`Role of ${device.name}`}
                  className={fieldClass}
                  value={device.role ?? "primary"}
                  onChange={(e) =>
                    send({
                      type: "set-parameter",
                      deviceId: device.id,
                      key: "role",
                      value: e.target.value,
                    })
                  }
                >
                  <option value="primary">primary</option>
                  <option value="secondary">secondary</option>
                </select>
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      {bench.unitLinks.length > 0 ? (
        <section aria-label="Unit links">
          <h3 className="text-xs font-medium text-ink-soft">Unit links</h3>
          <ul className="mt-1 space-y-1">
            {bench.unitLinks.map((link) => (
              <li key={link.id} className="flex items-center gap-2">
                <span className="flex-1">{link.name}</span>
                <Button
                  variant={has(link.id, UNIT_LINK_BROKEN) ? "danger" : "secondary"}
                  onClick={() => toggle(link.id, UNIT_LINK_BROKEN)}
                >
                  {has(link.id, UNIT_LINK_BROKEN) ? "Restore link" : "Break link"}
                </Button>
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      {contacts.length > 0 || units.length > 0 ? (
        <section aria-label="Windows and sensors">
          <h3 className="text-xs font-medium text-ink-soft">Windows and sensors</h3>
          <ul className="mt-1 space-y-1">
            {contacts.map((device) => {
              const open = openContacts.split(" ").includes(device.id);
              return (
                <li key={device.id} className="flex items-center gap-2">
                  <span className="flex-1">{device.name}</span>
                  <Button
                    variant="secondary"
                    onClick={() =>
                      send({
                        type: "set-input",
                        deviceId: device.id,
                        input: "contact",
                        value: !open,
                      })
                    }
                  >
                    {open ? "Close window" : "Open window"}
                  </Button>
                </li>
              );
            })}
            {units.map((device) => (
              <li key={device.id} className="flex items-center gap-2">
                <span className="flex-1">{device.name} sensor</span>
                <Button
                  variant={has(device.id, SENSOR_OPEN) ? "danger" : "secondary"}
                  onClick={() => toggle(device.id, SENSOR_OPEN)}
                >
                  {has(device.id, SENSOR_OPEN) ? "Repair sensor" : "Open sensor circuit"}
                </Button>
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      <section aria-label="Disconnect a device" className="flex flex-wrap items-center gap-2">
        <select
          aria-label="Device to disconnect"
          className={fieldClass}
          value={disconnect}
          onChange={(e) => setDisconnect(e.target.value)}
        >
          <option value="">Device on the line…</option>
          {onLine.map((d) => (
            <option key={d.id} value={d.id}>
              {d.name} {d.individualAddress}
            </option>
          ))}
        </select>
        <Button
          variant="secondary"
          disabled={disconnect === ""}
          onClick={() => toggle(disconnect, BUS_FAULTS.silent)}
        >
          {disconnect !== "" && has(disconnect, BUS_FAULTS.silent) ? "Reconnect" : "Disconnect"}
        </Button>
      </section>

      <section aria-label="Flood an address" className="flex flex-wrap items-center gap-2">
        <select
          aria-label="Address to flood"
          className={fieldClass}
          value={floodAddress}
          onChange={(e) => setFloodAddress(e.target.value)}
        >
          <option value="">Address to flood…</option>
          {bench.groupAddresses.map((ga) => (
            <option key={ga.raw} value={ga.address}>
              {ga.address} {ga.name}
            </option>
          ))}
        </select>
        <select
          aria-label="Telegrams"
          className={fieldClass}
          value={floodCount}
          onChange={(e) => setFloodCount(Number(e.target.value))}
        >
          {[100, 1000, 10000].map((n) => (
            <option key={n} value={n}>
              {n} telegrams
            </option>
          ))}
        </select>
        <Button
          variant="secondary"
          disabled={flood === undefined}
          onClick={() =>
            flood &&
            send({
              type: "flood",
              groupAddress: flood.address,
              count: floodCount,
              value: defaultDptValue(flood.dpt),
            })
          }
        >
          Flood
        </Button>
        {flood ? (
          <span className="text-xs text-ink-soft">
            sends <Mono>{JSON.stringify(defaultDptValue(flood.dpt))}</Mono> back to back from the
            test tool
          </span>
        ) : null}
      </section>
    </div>
  );
}
