"use client";

import { useMemo, useState } from "react";
import type { Bench } from "@/engine";
import type { NodeRef } from "@/components/bench-editor/model/move-nodes";

interface SearchHit {
  readonly key: string;
  readonly node: NodeRef;
  readonly primary: string;
  readonly secondary: string;
}

const MAX_HITS = 12;

/** Finds group addresses and devices by address, name or id; "/" or Ctrl+F on the canvas focuses it. */
export function searchBench(bench: Bench, query: string): SearchHit[] {
  const q = query.trim().toLowerCase();
  if (q === "") return [];
  const hits: SearchHit[] = [];
  for (const g of bench.groupAddresses) {
    if (g.address.startsWith(q) || g.name.toLowerCase().includes(q)) {
      hits.push({
        key: `g:${g.address}`,
        node: { kind: "group-address", address: g.address },
        primary: g.address,
        secondary: g.name,
      });
      if (hits.length >= MAX_HITS) return hits;
    }
  }
  for (const d of bench.devices) {
    if (
      d.name.toLowerCase().includes(q) ||
      d.id.includes(q) ||
      (d.individualAddress ?? "").startsWith(q)
    ) {
      hits.push({
        key: `d:${d.id}`,
        node: { kind: "device", id: d.id },
        primary: d.individualAddress ?? "unit link",
        secondary: d.name,
      });
      if (hits.length >= MAX_HITS) return hits;
    }
  }
  return hits;
}

export function CanvasSearch({
  bench,
  inputRef,
  onReveal,
}: {
  bench: Bench;
  inputRef: React.RefObject<HTMLInputElement | null>;
  onReveal: (node: NodeRef) => void;
}) {
  const [query, setQuery] = useState("");
  const hits = useMemo(() => searchBench(bench, query), [bench, query]);
  const choose = (hit: SearchHit) => {
    onReveal(hit.node);
    setQuery("");
    inputRef.current?.blur();
  };
  return (
    <div className="absolute top-3 left-3 z-10 w-72">
      <input
        ref={inputRef}
        type="search"
        value={query}
        onChange={(e) => setQuery(e.target.value)}
        onKeyDown={(e) => {
          if (e.key === "Enter" && hits[0]) choose(hits[0]);
          if (e.key === "Escape") {
            setQuery("");
            e.currentTarget.blur();
          }
        }}
        placeholder="Find address or device  ( / )"
        aria-label="Find a group address or device"
        className="w-full rounded-md border border-graphite-line bg-graphite-raised px-3 py-1.5 text-sm text-graphite-text placeholder:text-graphite-muted"
      />
      {hits.length > 0 ? (
        <ul
          role="listbox"
          aria-label="Search results"
          className="mt-1 overflow-hidden rounded-md border border-graphite-line bg-graphite-raised text-sm text-graphite-text shadow-lg"
        >
          {hits.map((hit) => (
            <li key={hit.key} role="option" aria-selected={false}>
              <button
                type="button"
                onClick={() => choose(hit)}
                className="flex w-full gap-3 px-3 py-1.5 text-left hover:bg-graphite-line"
              >
                <span className="w-20 shrink-0 font-mono text-copper-bright">{hit.primary}</span>
                <span className="truncate">{hit.secondary}</span>
              </button>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
