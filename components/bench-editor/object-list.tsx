"use client";

import type { Bench, BenchDevice } from "@/engine";
import { FLAG_ORDER } from "@/components/canvas/flag-letters";
import { dptFamily } from "@/components/canvas/dpt-family";
import { deviceObjects } from "./model/device-objects";
import { setObjectFlags } from "./model/devices";
import { disconnectObject, setSendingAddress } from "./model/links";
import { sameGroupAddress } from "./model/group-address-key";
import { useEditor, useEditorStoreApi } from "./store/editor-context";

/**
 * The selected device's group objects: DPT, the six flags as checkboxes, and
 * the linked addresses with the sending one first and marked. A listening
 * address can be made the sending one, and any link removed; with `readOnly`
 * all of it is shown and nothing can be changed.
 */
export function ObjectList({
  device,
  bench,
  readOnly = false,
}: {
  device: BenchDevice;
  bench: Bench;
  readOnly?: boolean;
}) {
  const store = useEditorStoreApi();
  const focus = useEditor((s) => s.selection.object);
  const objects = deviceObjects(device);
  if (objects.length === 0)
    return <p className="text-sm text-ink-soft">No group objects with these parameters.</p>;
  return (
    <table className="w-full text-xs" aria-label={`Group objects of ${device.name}`}>
      <thead>
        <tr className="text-left text-ink-soft">
          <th className="py-1 pr-1 font-medium">#</th>
          <th className="pr-1 font-medium">Object</th>
          {FLAG_ORDER.map((f) => (
            <th key={f.key} className="w-5 text-center font-mono font-medium" title={f.label}>
              {f.letter}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {objects.map((object) => {
          const links = bench.links.filter(
            (l) => l.device === device.id && l.object === object.number,
          );
          return (
            <tr
              key={object.number}
              className={`border-t border-paper-line align-top ${focus === object.number ? "bg-copper/10" : ""}`}
            >
              <td className="py-1 pr-1 font-mono">{object.number}</td>
              <td className="py-1 pr-1">
                <div className="flex items-center gap-1">
                  <span
                    className="inline-block size-2 rounded-full"
                    style={{ background: dptFamily(object.dpt).color }}
                    aria-hidden="true"
                  />
                  <span>{object.name}</span>
                  <span className="font-mono text-ink-soft">{object.dpt}</span>
                </div>
                <ul className="mt-0.5 flex flex-wrap gap-1">
                  {links.map((link, index) => {
                    const name =
                      bench.groupAddresses.find((g) =>
                        sameGroupAddress(g.address, link.groupAddress),
                      )?.name ?? "";
                    const target = {
                      device: device.id,
                      object: object.number,
                      groupAddress: link.groupAddress,
                    };
                    return (
                      <li
                        key={link.groupAddress}
                        className="flex items-center gap-1 rounded bg-paper-deep px-1"
                      >
                        {readOnly ? (
                          <span
                            className={`font-mono ${index === 0 ? "font-semibold text-copper-deep" : ""}`}
                            title={index === 0 ? `Sending address: ${name}` : `Listens to ${name}`}
                          >
                            {index === 0 ? "▸" : ""}
                            {link.groupAddress}
                          </span>
                        ) : (
                          <>
                            <button
                              type="button"
                              className={`font-mono ${index === 0 ? "font-semibold text-copper-deep" : ""}`}
                              title={
                                index === 0
                                  ? `Sending address: ${name}`
                                  : `Listens to ${name}; click to make it the sending address`
                              }
                              onClick={() =>
                                index > 0 &&
                                store
                                  .getState()
                                  .apply(
                                    (b) => setSendingAddress(b, target),
                                    `${link.groupAddress} is now the sending address`,
                                  )
                              }
                            >
                              {index === 0 ? "▸" : ""}
                              {link.groupAddress}
                            </button>
                            <button
                              type="button"
                              aria-label={`Unlink ${link.groupAddress}`}
                              className="inline-flex size-6 items-center justify-center rounded text-ink-soft hover:text-fault"
                              onClick={() =>
                                store
                                  .getState()
                                  .apply(
                                    (b) => disconnectObject(b, target),
                                    `Unlinked ${link.groupAddress}`,
                                  )
                              }
                            >
                              ×
                            </button>
                          </>
                        )}
                      </li>
                    );
                  })}
                </ul>
              </td>
              {FLAG_ORDER.map((f) => (
                <td key={f.key} className="py-1 text-center">
                  <input
                    type="checkbox"
                    className="size-6 accent-copper"
                    checked={object.flags[f.key]}
                    disabled={readOnly}
                    aria-label={`${f.label} flag of object ${object.number}`}
                    onChange={(e) =>
                      !readOnly &&
                      store.getState().apply((b) =>
                        setObjectFlags(b, device.id, object.number, {
                          [f.key]: e.target.checked,
                        }),
                      )
                    }
                  />
                </td>
              ))}
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}
